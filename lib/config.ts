// Environment configuration in one place, validated with zod. Every variable is listed in the
// README. Getters read process.env on each call (tests change it between cases); start-up calls
// assertValidConfig() so a bad value stops the app with one clear message instead of failing later.
import { randomBytes } from "node:crypto";
import { availableParallelism } from "node:os";
import { z } from "zod";

const port = z.coerce
  .number({ error: "must be a port number" })
  .int("must be a whole number")
  .min(1, "must be 1–65535")
  .max(65535, "must be 1–65535");
const httpUrl = z.string().regex(/^https?:\/\/[^\s/]+/, "must be an http(s):// address");
const wholeNumber = (min: number, max: number) =>
  z.coerce
    .number({ error: "must be a number" })
    .int("must be a whole number")
    .min(min, `must be ${min}–${max}`)
    .max(max, `must be ${min}–${max}`);
const flag = z.enum(["0", "1"], { error: "must be 0 or 1" });

/** Each variable's rule; `secret` ones are never echoed in error messages. */
const variables = {
  DATABASE_URL: { schema: z.string().regex(/^postgres(ql)?:\/\/\S+$/, "must be a postgres:// or postgresql:// URL"), secret: true },
  MIGRATION_DATABASE_URL: {
    schema: z.string().regex(/^postgres(ql)?:\/\/\S+$/, "must be a postgres:// or postgresql:// URL"),
    secret: true,
  },
  APP_URL: { schema: httpUrl },
  NEXTAUTH_URL: { schema: httpUrl },
  NEXTAUTH_SECRET: {
    schema: z.string().min(16, "must be at least 16 characters (npm start generates one into .data/auth-secret)"),
    secret: true,
  },
  PORT: { schema: port },
  HOST: { schema: z.string().regex(/^[\w.:-]+$/, "must be a host name or an IP address") },
  INNER_PORT: { schema: port },
  RENDER_CONCURRENCY: { schema: wholeNumber(1, 256) },
  RENDER_AHEAD: { schema: flag },
  NEXT_DIST_DIR: { schema: z.string().regex(/^[\w.\/-]+$/, "must be a folder name such as .next") },
  SMTP_URL: { schema: z.string().regex(/^smtps?:\/\/\S+$/, "must be an smtp:// or smtps:// URL"), secret: true },
  MAIL_CAPTURE_PORT: { schema: port },
  MAIL_FROM: { schema: z.string().min(3, "must be a sender such as Arrhenia <no-reply@example.org>") },
  DOI_PREFIX: { schema: z.string().regex(/^10\.\d{4,9}$/, "must be a DOI prefix such as 10.5072") },
  DOI_API_URL: { schema: httpUrl },
  DOI_API_USER: { schema: z.string() },
  DOI_API_PASSWORD: { schema: z.string(), secret: true, keepEmpty: true },
  DOI_FAKE_PORT: { schema: port },
  DOI_FAKE_DATA_DIR: { schema: z.string(), keepEmpty: true },
  BCRYPT_ROUNDS: {
    schema: z.coerce
      .number({ error: "must be a number" })
      .int("must be a whole number")
      .min(4, "must be 4–15")
      .max(15, "must be 4–15 (each step doubles the time of a sign-in)"),
  },
  DB_POOL_SIZE: {
    schema: z.coerce.number({ error: "must be a number" }).int("must be a whole number").min(1, "must be 1–100").max(100, "must be 1–100"),
  },
  JOB_RETRY_DELAY_SECONDS: {
    schema: z.coerce
      .number({ error: "must be a number" })
      .int("must be a whole number")
      .min(0, "must be 0–86400")
      .max(86400, "must be 0–86400"),
  },
  STORAGE_DIR: { schema: z.string().min(1) },
  SEED_DATASETS: { schema: flag },
  SERVE_QUIET: { schema: flag },
  ANALYSIS_THREADS: { schema: wholeNumber(1, 64) },
  ANALYSIS_QUEUE_LIMIT: { schema: wholeNumber(1, 10_000) },
  ANALYSIS_TIMEOUT_MS: { schema: wholeNumber(1, 3_600_000) },
  ANALYSIS_MEMORY_MB: { schema: wholeNumber(64, 65_536) },
  FRONT_HEAP_MB: { schema: wholeNumber(128, 65_536) },
  NEXT_HEAP_MB: { schema: wholeNumber(128, 65_536) },
  API_RATE_LIMIT: { schema: wholeNumber(1, 10_000_000) },
  TRUST_PROXY: {
    schema: z
      .string()
      .regex(/^[\w.:/,\s-]*$/, "must be a hop count or a comma-separated list of addresses, CIDR ranges, loopback or uniquelocal"),
  },
  SEARCH_ENGINE: { schema: z.enum(["postgres", "meilisearch"], { error: "must be postgres or meilisearch" }) },
  MEILISEARCH_URL: { schema: httpUrl },
  MEILISEARCH_API_KEY: { schema: z.string(), secret: true },
  SEARCH_CURSOR_SECRET: { schema: z.string().min(16, "must be at least 16 characters"), secret: true },
  MEILISEARCH_INDEX: { schema: z.string().regex(/^[A-Za-z0-9_-]{1,400}$/, "must be letters, digits, - or _") },
  OAI_PAGE_SIZE: { schema: wholeNumber(1, 10_000) },
  OAI_ADMIN_EMAIL: { schema: z.email("must be an e-mail address") },
  ORCID_ISSUER: { schema: httpUrl },
  ORCID_CLIENT_ID: { schema: z.string().min(1) },
  ORCID_CLIENT_SECRET: { schema: z.string().min(1), secret: true },
  ORCID_STAND_IN_PORT: { schema: port },
  ARRHENIA_EDGE_KEY: { schema: z.string().min(16, "is set by scripts/serve.ts; do not set it by hand"), secret: true },
} satisfies Record<string, { schema: z.ZodType; secret?: boolean; keepEmpty?: boolean }>;

type Name = keyof typeof variables;
type Env = Record<string, string | undefined>;
type Value<N extends Name> = z.output<(typeof variables)[N]["schema"]>;

export class ConfigError extends Error {
  constructor(readonly problems: string[]) {
    super(`Invalid configuration (see README, Configuration):\n${problems.map((p) => `  - ${p}`).join("\n")}`);
    this.name = "ConfigError";
  }
}

function rawValue(name: Name, env: Env): string | undefined {
  const v = env[name];
  // An empty variable means "unset", except where the README gives empty a meaning.
  return v === "" && !("keepEmpty" in variables[name]) ? undefined : v;
}

function problemOf(name: Name, env: Env): string | null {
  const raw = rawValue(name, env);
  if (raw === undefined) return null;
  const parsed = variables[name].schema.safeParse(raw);
  if (parsed.success) return null;
  const shown = "secret" in variables[name] ? "" : ` (got "${raw}")`;
  return `${name} ${parsed.error.issues[0].message}${shown}`;
}

function read<N extends Name>(name: N): Value<N> | undefined {
  const raw = rawValue(name, process.env);
  if (raw === undefined) return undefined;
  const parsed = variables[name].schema.safeParse(raw);
  if (!parsed.success) throw new ConfigError([problemOf(name, process.env)!]);
  return parsed.data as Value<N>;
}

/** Every problem with the configuration in `env`, one line each; empty when it is valid. */
export function configProblems(env: Env = process.env): string[] {
  const problems = (Object.keys(variables) as Name[]).map((name) => problemOf(name, env)).filter((p): p is string => p !== null);
  if (
    rawValue("ORCID_ISSUER", env) !== undefined &&
    (rawValue("ORCID_CLIENT_ID", env) === undefined || rawValue("ORCID_CLIENT_SECRET", env) === undefined)
  )
    problems.push("ORCID_ISSUER is set but ORCID_CLIENT_ID or ORCID_CLIENT_SECRET is not");
  if (rawValue("SEARCH_ENGINE", env) === "meilisearch" && rawValue("MEILISEARCH_URL", env) === undefined)
    problems.push("SEARCH_ENGINE is meilisearch but MEILISEARCH_URL is not set");
  return problems;
}

/** Start-up check: throws one ConfigError listing every bad variable. */
export function assertValidConfig(env: Env = process.env): void {
  const problems = configProblems(env);
  if (problems.length) throw new ConfigError(problems);
}

function required<N extends Name>(name: N): Value<N> {
  const value = read(name);
  if (value === undefined) throw new ConfigError([`${name} is not set; start the app with \`npm start\` or set it`]);
  return value;
}

export function databaseUrl(): string {
  return required("DATABASE_URL");
}

/** Port of the web server. */
export function serverPort(): number {
  return read("PORT") ?? 3000;
}

/** Address the web server listens on; loopback unless HOST says otherwise. */
export function serverHost(): string {
  return read("HOST") ?? "127.0.0.1";
}

/** Loopback port of the Next.js server behind the front server; a free one when unset. */
export function innerPort(): number | undefined {
  return read("INNER_PORT");
}

/** Page renders the Next.js server runs at once (lib/http/render-gate.ts); the rest wait their turn. */
export function renderConcurrency(): number {
  return read("RENDER_CONCURRENCY") ?? 4;
}

/** Folder of the production build (next.config.mjs reads the same variable). */
export function nextDistDir(): string {
  return read("NEXT_DIST_DIR") ?? ".next";
}

/** The schema owner's URL, for migrations only; the app itself connects as DATABASE_URL's role. */
export function migrationDatabaseUrl(): string {
  return read("MIGRATION_DATABASE_URL") ?? databaseUrl();
}

/** The public base URL used in links inside e-mails. */
export function appUrl(): string {
  return (read("APP_URL") ?? read("NEXTAUTH_URL") ?? `http://127.0.0.1:${serverPort()}`).replace(/\/$/, "");
}

/** Key that signs session tokens; undefined lets next-auth refuse to run in production. */
export function nextAuthSecret(): string | undefined {
  return read("NEXTAUTH_SECRET");
}

/** SMTP relay; when unset, mail goes to the local capture server. */
export function smtpUrl(): string {
  return read("SMTP_URL") ?? `smtp://127.0.0.1:${captureSmtpPort()}`;
}

export function captureSmtpPort(): number {
  return read("MAIL_CAPTURE_PORT") ?? 2525;
}

export function usesMailCapture(): boolean {
  return read("SMTP_URL") === undefined;
}

export function mailFrom(): string {
  return read("MAIL_FROM") ?? "Arrhenia <no-reply@arrhenia.invalid>";
}

/** DOI prefix of minted identifiers, or undefined for the test prefix (lib/identifiers/mint.ts). */
export function configuredDoiPrefix(): string | undefined {
  return read("DOI_PREFIX");
}

/** Port of the local fake DOI registration service, started on 127.0.0.1 when DOI_API_URL is unset. */
export function doiFakePort(): number {
  return read("DOI_FAKE_PORT") ?? 5100;
}

/** Base URL of the DOI registration agency's REST API (no trailing slash); the local fake by default. */
export function doiApiUrl(): string {
  return (read("DOI_API_URL") ?? `http://127.0.0.1:${doiFakePort()}`).replace(/\/$/, "");
}

export function usesFakeDoiService(): boolean {
  return read("DOI_API_URL") === undefined;
}

/** Basic-auth account at the registration agency (repository id and password), or null when unset. */
export function doiApiAuth(): { user: string; password: string } | null {
  const user = read("DOI_API_USER");
  return user ? { user, password: read("DOI_API_PASSWORD") ?? "" } : null;
}

/** Folder where the local fake DOI service keeps its records; set it empty to keep them in memory. */
export function fakeDoiDataDir(): string | null {
  return (read("DOI_FAKE_DATA_DIR") ?? ".data/fake-doi") || null;
}

/** bcrypt cost factor of password hashes. */
export function bcryptRounds(): number {
  return read("BCRYPT_ROUNDS") ?? 11;
}

/** Connections per app process. */
export function dbPoolSize(): number {
  return read("DB_POOL_SIZE") ?? 10;
}

/** First retry delay of background jobs, seconds (doubled on each retry). */
export function jobRetryDelaySeconds(): number {
  return read("JOB_RETRY_DELAY_SECONDS") ?? 15;
}

/** Folder of the local-disk file storage; undefined for .data/files under the working directory. */
export function storageDir(): string | undefined {
  return read("STORAGE_DIR");
}

/** Whether the demo seed adds its invented datasets (SEED_DATASETS=0 seeds the people only). */
export function seedsDemoDatasets(): boolean {
  return read("SEED_DATASETS") !== "0";
}

/** Whether the front server renders the public pages ahead of their readers (lib/render-ahead.ts); on unless RENDER_AHEAD=0. */
export function renderAhead(): boolean {
  return read("RENDER_AHEAD") !== "0";
}

/** Whether scripts/serve.ts keeps its start-up banner to itself. */
export function serveQuiet(): boolean {
  return read("SERVE_QUIET") === "1";
}

/**
 * Which proxies may tell us the client's address (X-Forwarded-For) and the public host
 * (X-Forwarded-Host): unset trusts none and uses the socket address; a number trusts that many
 * hops; otherwise a comma-separated list of addresses, CIDR ranges or `loopback` / `uniquelocal`.
 */
export function trustProxy(): string {
  return read("TRUST_PROXY") ?? "";
}

/**
 * Set by scripts/serve.ts for the Next process it fronts: proves that the client-address header
 * on a request came from that front server, not from the client.
 */
export function edgeKey(): string | null {
  return read("ARRHENIA_EDGE_KEY") ?? null;
}

/**
 * Worker threads that validate and analyse deposits off the request thread: by default one fewer
 * than the cores (at least one), so the request thread always keeps a core of its own.
 */
export function analysisThreads(): number {
  return read("ANALYSIS_THREADS") ?? Math.max(1, availableParallelism() - 1);
}

/** Tasks that may wait for an analysis thread; beyond this a request is answered 503 at once. */
export function analysisQueueLimit(): number {
  return read("ANALYSIS_QUEUE_LIMIT") ?? 32;
}

/** Longest one validation or analysis may take, waiting included, before it is stopped (ms). */
export function analysisTimeoutMs(): number {
  return read("ANALYSIS_TIMEOUT_MS") ?? 60_000;
}

/**
 * Heap (old generation) one analysis thread may use, MB: a file that would take more (a mechanism
 * or document built to exhaust memory) stops that thread with an error, never the server.
 */
export function analysisMemoryMb(): number {
  return read("ANALYSIS_MEMORY_MB") ?? 1024;
}

/**
 * Heap (old generation) budgets of the server's two processes, MB: the front server (scripts/serve.ts,
 * with the job workers and search; its launchers pass it as --max-old-space-size) and Next
 * (scripts/inner-server.ts). Under load V8 lets a heap grow to several times what it holds alive
 * before collecting (front: ~80 MB alive, 340 MB used; Next: ~150 alive, ~400 used); a budget makes it
 * collect sooner, so the two stay under 1 GiB together (Next's was 512 until the pages rendered ahead
 * of readers kept it rendering for hours: the benchmark's peak was 1 042 MiB, 571 + 460 MiB; the front
 * server's was 384 until the benchmark's peak was 1 066 MiB, 591 + 463 MiB: ~135 MB of it is alive,
 * mostly the modules' code, a heap snapshot under 1 800 searches a second shows, and 320 served
 * 2 600 searches a second at 418 MiB; then 288 and 416, and the page cache's 64 MiB halved, once the
 * page cache kept its pages across publications elsewhere and the peak was 1 089 MiB, 561 + 477).
 */
export function frontHeapMb(): number {
  return read("FRONT_HEAP_MB") ?? 288;
}
export function nextHeapMb(): number {
  return read("NEXT_HEAP_MB") ?? 416;
}

/** Requests a minute one API client (a token's holder, else an address) may make before 429s. */
export function apiRateLimit(): number {
  return read("API_RATE_LIMIT") ?? 600;
}

/** The search engine: SEARCH_ENGINE when set, else meilisearch when MEILISEARCH_URL is set, else postgres. */
export function searchEngineName(): "postgres" | "meilisearch" {
  return read("SEARCH_ENGINE") ?? (read("MEILISEARCH_URL") ? "meilisearch" : "postgres");
}

/** Base URL of the Meilisearch service (no trailing slash), or null when search stays in PostgreSQL. */
export function meilisearchUrl(): string | null {
  return read("MEILISEARCH_URL")?.replace(/\/$/, "") ?? null;
}

export function meilisearchApiKey(): string | undefined {
  return read("MEILISEARCH_API_KEY");
}

// Made once per process when neither secret is set: cursors then last as long as the process.
let processCursorSecret: string | null = null;

/**
 * Key that signs search cursors (HMAC): SEARCH_CURSOR_SECRET, else NEXTAUTH_SECRET, else a random
 * key of this process (a cursor from before a restart is then refused as tampered with).
 */
export function searchCursorSecret(): string {
  const configured = read("SEARCH_CURSOR_SECRET") ?? read("NEXTAUTH_SECRET");
  if (configured) return configured;
  processCursorSecret ??= randomBytes(32).toString("hex");
  return processCursorSecret;
}

/**
 * The Meilisearch service and index, or null when none is configured. When it is set, every change
 * to the searchable versions also goes into the outbox that the search-sync job drains into it.
 */
export function meilisearchConfig(): { host: string; apiKey: string | undefined; index: string } | null {
  const host = meilisearchUrl();
  return host ? { host, apiKey: meilisearchApiKey(), index: read("MEILISEARCH_INDEX") ?? "datasets" } : null;
}

/** Records (or headers) in one OAI-PMH list response before a resumption token. */
export function oaiPageSize(): number {
  return read("OAI_PAGE_SIZE") ?? 50;
}

/** The address OAI-PMH's Identify names as the repository's administrator: OAI_ADMIN_EMAIL, else MAIL_FROM's address. */
export function oaiAdminEmail(): string {
  const configured = read("OAI_ADMIN_EMAIL");
  if (configured) return configured;
  const from = mailFrom();
  return /<([^>]+)>/.exec(from)?.[1] ?? from.trim();
}

/** Port of the local stand-in ORCID sign-in service, started on 127.0.0.1 when ORCID_ISSUER is unset. */
export function orcidStandInPort(): number {
  return read("ORCID_STAND_IN_PORT") ?? 5300;
}

/** The stand-in's client: fixed, since it only ever answers on the loopback interface. */
export const ORCID_STAND_IN_CLIENT = { clientId: "arrhenia-local", clientSecret: "arrhenia-local-stand-in-secret" } as const;

/**
 * The OpenID provider behind "Sign in with ORCID": ORCID's own issuer (or its sandbox) when
 * ORCID_ISSUER is set, else the local stand-in that scripts/serve.ts starts.
 */
export function orcidSettings(): { issuer: string; clientId: string; clientSecret: string; standIn: boolean } {
  const issuer = read("ORCID_ISSUER");
  if (issuer === undefined) return { issuer: `http://127.0.0.1:${orcidStandInPort()}`, ...ORCID_STAND_IN_CLIENT, standIn: true };
  return {
    issuer: issuer.replace(/\/$/, ""),
    clientId: required("ORCID_CLIENT_ID"),
    clientSecret: required("ORCID_CLIENT_SECRET"),
    standIn: false,
  };
}
