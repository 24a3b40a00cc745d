/**
 * npm run bench:web — public discovery under load, on a database of about 100 000 published
 * datasets. Not a test: prints one table and whether each target is met.
 *
 * 1. The benchmark's own cluster (scripts/with-bench-db.sh: .data/bench-postgres, port 54489) gets
 *    a fresh database, migrated by scripts/migrate.ts, filled with synthetic published data
 *    (scripts/bench/fill.ts) and given its search documents (lib/search/documents.ts, timed). The
 *    filled database is kept: the next run only migrates it, unless the generator's version
 *    (FILL_VERSION) or the size changed (BENCH_FRESH=1 refills; BENCH_FILL_ONLY=1 stops after the fill).
 * 2. `next build` into .next-bench (skipped when the checkout has not changed since); the database's
 *    files read into the OS cache (pg_prewarm), as a database in service has them; served by
 *    scripts/serve.ts, the real front server, on 127.0.0.1:3400 (BENCH_PORT).
 * 3. autocannon, 32 connections (BENCH_CONNECTIONS), a short warm-up then BENCH_SECONDS (10) per
 *    scenario, each request on the next of a few thousand URLs spread over the data, accepting
 *    compressed answers as browsers do (ACCEPT_ENCODING in ./bench/load.ts); the server's
 *    process tree's peak RSS is sampled from /proc throughout. Pages: first views of pages the server
 *    has not rendered ahead yet (the kept pages of earlier runs are dropped first, as a new build
 *    starts with none), views after the first, and first views of pages it rendered ahead of readers
 *    (lib/render-ahead.ts; the run waits for them, BENCH_AHEAD_WAIT_SECONDS at most). Under the table,
 *    how each page row's answers were served (memory, kept pages, rendered), each with its own p95.
 *
 * BENCH_DATASETS (default 100 000) sizes the data (2 000 for a quick run); BENCH_KEEP=1 leaves the
 * server running on port 3400 until Ctrl-C.
 */
import { spawn, spawnSync, type ChildProcess } from "node:child_process";
import { createHash } from "node:crypto";
import { existsSync, mkdtempSync, readFileSync, statSync, writeFileSync } from "node:fs";
import { loadavg, tmpdir } from "node:os";
import path from "node:path";
import postgres from "postgres";
import { ENGINE_VERSION } from "@/lib/datasets/prepare";
import { frontHeapMb } from "@/lib/config";
import { reactionPath } from "@/lib/reactions/paths";
import { FILTER_PARAMETERS } from "@/lib/search/params";
import { fillBenchDatabase, fillSize, FILL_VERSION, type FillReport } from "./bench/fill";
import { ACCEPT_ENCODING, drive, formatTable, sampleTreeMemory, type ScenarioResult } from "./bench/load";

const root = process.cwd();
const env = (name: string, fallback: number) => (process.env[name] ? Number(process.env[name]) : fallback);
const datasets = env("BENCH_DATASETS", 100_000);
const port = env("BENCH_PORT", 3400);
const connections = env("BENCH_CONNECTIONS", 32);
const seconds = env("BENCH_SECONDS", 10);
const warmSeconds = env("BENCH_WARM_SECONDS", 2);
const distDir = ".next-bench";
const base = `http://127.0.0.1:${port}`;
const log = (s: string) => console.error(`[bench:web] ${s}`);

for (const name of ["DATABASE_URL", "MIGRATION_DATABASE_URL", "BENCH_ADMIN_URL", "BENCH_PG_DIR"]) {
  if (!process.env[name]) throw new Error(`${name} is not set: run through npm run bench:web (scripts/with-bench-db.sh)`);
}
const databaseUrl = process.env.DATABASE_URL!;
const ownerUrl = process.env.MIGRATION_DATABASE_URL!;
const databaseName = new URL(databaseUrl).pathname.slice(1);

const sha = (...parts: (string | Buffer)[]) => {
  const h = createHash("sha256");
  for (const p of parts) h.update(p);
  return h.digest("hex").slice(0, 16);
};

// ---------------------------------------------------------------------------------------------
// 1. The filled database

interface FillStamp {
  signature: string;
  /** BENCH_REUSE: the engine version the database records as current. */
  engine?: string | null;
  report: FillReport;
  searchDocumentsSeconds: number | null;
  searchDocuments: number | null;
}

/**
 * What the fill depends on: the generator's version, the kinetics engine that fitted every version
 * (a kept fill by another engine would otherwise be re-fitted by the server, 100 000 fits under
 * the load) and the size (migrations are applied to a kept database at every run).
 */
const signature = `fill-${FILL_VERSION}-${ENGINE_VERSION}-${datasets}`;

async function readStamp(): Promise<FillStamp | null> {
  const sql = postgres(ownerUrl, { max: 1, onnotice: () => {} });
  try {
    const [row] = await sql<
      { comment: string | null }[]
    >`select shobj_description(oid, 'pg_database') as comment from pg_database where datname = ${databaseName}`;
    const stamp = row?.comment?.startsWith("bench-fill ") ? (JSON.parse(row.comment.slice("bench-fill ".length)) as FillStamp) : null;
    return stamp;
  } finally {
    await sql.end();
  }
}

function run(command: string, args: string[], extraEnv: Record<string, string> = {}) {
  const done = spawnSync(command, args, { stdio: ["ignore", "inherit", "inherit"], env: { ...process.env, ...extraEnv } });
  if (done.status !== 0) throw new Error(`${command} ${args.join(" ")} failed (exit ${done.status})`);
}

async function recreateDatabase() {
  const admin = postgres(process.env.BENCH_ADMIN_URL!, { max: 1, onnotice: () => {} });
  try {
    await admin.unsafe(`drop database if exists ${databaseName} with (force)`);
  } finally {
    await admin.end();
  }
  // The roles and the database, owned by the owner role, exactly as the project's clusters have them.
  const port = new URL(databaseUrl).port;
  run("bash", ["-c", `source scripts/env.sh && ensure_postgres && pg_roles "$BENCH_PG_DIR" ${port}`]);
}

/**
 * The search documents of every public version, written by the search code's own bulk builder
 * (rebuildSearchDocuments, as `npm run search:reindex` does: batches of versions through the same
 * definition of a document as the publishing transaction), then each reaction's summary; timed.
 * Null when this checkout has no builder.
 */
async function buildSearchDocuments(): Promise<number | null> {
  if (!existsSync("lib/search/documents.ts")) {
    log("no lib/search/documents.ts in this checkout: search documents not built");
    return null;
  }
  const { rebuildSearchDocuments } = await import("@/lib/search/documents");
  const t0 = performance.now();
  let documentsSeconds = 0;
  const every = (what: string, step: number) => (done: number, total: number) => {
    if (done % step === 0 || done === total) log(`  ${done}/${total} ${what} (${((performance.now() - t0) / 1000).toFixed(0)} s)`);
  };
  const onVersions = every("search documents", 10_000);
  const versions = await rebuildSearchDocuments({
    onProgress: (done, total) => {
      onVersions(done, total);
      if (done === total) documentsSeconds = (performance.now() - t0) / 1000;
    },
    onSummaryProgress: every("reaction summaries", 2_000),
  });
  const total = (performance.now() - t0) / 1000;
  log(
    `${versions} search documents in ${documentsSeconds.toFixed(1)} s (${(versions / Math.max(documentsSeconds, 1e-3)).toFixed(0)} versions/s), ` +
      `reaction summaries in ${(total - documentsSeconds).toFixed(1)} s`,
  );
  return total;
}

async function countSearchDocuments(): Promise<number | null> {
  const sql = postgres(ownerUrl, { max: 1, onnotice: () => {} });
  try {
    const [t] = await sql`select to_regclass('search_documents') as t`;
    if (!t.t) return null;
    const [row] = await sql<{ n: number }[]>`select count(*)::int as n from search_documents`;
    return row.n;
  } finally {
    await sql.end();
  }
}

/** BENCH_REUSE=1: the database as it is, described by counting (a fill still building its search documents, or changed by hand). */
async function describeDatabaseAsIs(): Promise<FillStamp> {
  const sql = postgres(ownerUrl, { max: 1, onnotice: () => {} });
  try {
    const [c] = await sql<{ datasets: number; versions: number; points: number; reactions: number; species: number; users: number }[]>`
      select (select count(*)::int from datasets) as datasets,
        (select count(*)::int from dataset_versions where state in ('published', 'retracted')) as versions,
        (select count(*)::int from version_points) as points, (select count(*)::int from reactions) as reactions,
        (select count(*)::int from species) as species, (select count(*)::int from users) as users`;
    const [e] = await sql<{ engine: string | null }[]>`select (select engine_version from arrhenia_engine where only_row) as engine`;
    return {
      signature,
      report: { ...c, seconds: {} },
      searchDocumentsSeconds: null,
      searchDocuments: await countSearchDocuments(),
      engine: e?.engine ?? null,
    };
  } finally {
    await sql.end();
  }
}

async function ensureFilledDatabase(): Promise<FillStamp> {
  if (process.env.BENCH_REUSE) {
    log("BENCH_REUSE: the database as it is, no fill and no migration");
    const stamp = await describeDatabaseAsIs();
    if (stamp.engine !== ENGINE_VERSION)
      log(
        `its database records engine ${stamp.engine ?? "none"}, this code is ${ENGINE_VERSION}: the server queues no re-fit (scripts/serve.ts)`,
      );
    return stamp;
  }
  const existing = process.env.BENCH_FRESH ? null : await readStamp().catch(() => null);
  if (existing?.signature === signature) {
    log(`reusing the filled database (${existing.report.datasets} datasets; BENCH_FRESH=1 refills)`);
    run("node_modules/.bin/tsx", ["--conditions=react-server", "scripts/migrate.ts"]);
    return existing;
  }
  log(existing ? "the generator, the engine or the size changed: refilling" : "filling a new benchmark database");
  await recreateDatabase();
  run("node_modules/.bin/tsx", ["--conditions=react-server", "scripts/migrate.ts"]);
  const owner = postgres(ownerUrl, { max: 1, onnotice: () => {} });
  let report: FillReport;
  try {
    report = await fillBenchDatabase(owner, fillSize(datasets), path.join(process.env.BENCH_PG_DIR!, "fill"), log);
  } finally {
    await owner.end();
  }
  const searchDocumentsSeconds = await buildSearchDocuments();
  const stamp: FillStamp = { signature, report, searchDocumentsSeconds, searchDocuments: await countSearchDocuments() };
  const sql = postgres(ownerUrl, { max: 1, onnotice: () => {} });
  try {
    await sql.unsafe(`comment on database ${databaseName} is 'bench-fill ${JSON.stringify(stamp).replace(/'/g, "''")}'`);
  } finally {
    await sql.end();
  }
  return stamp;
}

// ---------------------------------------------------------------------------------------------
// 2. Build and serve

/** What the build depends on: every file outside scripts/, tests/ and Markdown, as committed and as changed since. */
function buildStamp(): string {
  const git = (...args: string[]) => {
    const done = spawnSync("git", args, { encoding: "utf8", maxBuffer: 256 * 2 ** 20 });
    // A failing git (e.g. a pathspec it refuses) must not give the same stamp every time: the build would never be redone.
    if (done.status !== 0) throw new Error(`git ${args.join(" ")} failed: ${done.stderr || done.error?.message}`);
    return done.stdout;
  };
  const paths = ["--", ".", ":!scripts", ":!tests", ":!*.md"];
  // ls-files (not ls-tree, which refuses exclude pathspecs): the committed blobs, then what changed since.
  return sha(git("ls-files", "--stage", ...paths), git("diff", "HEAD", ...paths), git("status", "--porcelain", ...paths));
}

function buildApp() {
  const stampFile = path.join(distDir, "bench-build-stamp");
  const stamp = buildStamp();
  if (existsSync(stampFile) && readFileSync(stampFile, "utf8") === stamp) {
    log(`reusing the production build in ${distDir} (no change since it was made)`);
    return;
  }
  log(`next build into ${distDir}`);
  const t0 = performance.now();
  run("node_modules/.bin/next", ["build"], { NEXT_DIST_DIR: distDir });
  writeFileSync(stampFile, stamp);
  log(`built in ${((performance.now() - t0) / 1000).toFixed(0)} s`);
}

function startServer(): ChildProcess {
  // Node with tsx's loader, as scripts/serve.ts starts Next: no tsx command process in the measured tree.
  return spawn(
    process.execPath,
    [`--max-old-space-size=${frontHeapMb()}`, "--import", "tsx", "--conditions=react-server", "scripts/serve.ts"],
    {
      stdio: ["ignore", "inherit", "inherit"],
      detached: false,
      env: {
        ...process.env,
        PORT: String(port),
        HOST: "127.0.0.1",
        APP_URL: base,
        NEXTAUTH_URL: base,
        NEXTAUTH_SECRET: `bench-${Math.random().toString(36).slice(2)}`,
        NEXT_DIST_DIR: distDir,
        SERVE_QUIET: "1",
        // One load generator is one client: its budget would end the run in a second.
        API_RATE_LIMIT: "10000000",
        NODE_ENV: "production",
        // As scripts/start.sh starts the server.
        MALLOC_ARENA_MAX: process.env.MALLOC_ARENA_MAX ?? "2",
        MAIL_CAPTURE_PORT: String(env("MAIL_CAPTURE_PORT", port + 5)),
        DOI_FAKE_PORT: String(env("DOI_FAKE_PORT", port + 7)),
        DOI_FAKE_DATA_DIR: mkdtempSync(path.join(tmpdir(), "arrhenia-bench-doi-")),
      },
    },
  );
}

async function waitForServer(server: ChildProcess, deadline = Date.now() + 180_000) {
  while (Date.now() < deadline) {
    if (server.exitCode !== null) throw new Error(`the server exited (${server.exitCode}) before it answered`);
    const ok = await fetch(`${base}/api/health`).then(
      (r) => r.ok,
      () => false,
    );
    if (ok) return;
    await new Promise((r) => setTimeout(r, 300));
  }
  throw new Error("the server did not answer /api/health within 3 minutes");
}

// ---------------------------------------------------------------------------------------------
// 3. Scenarios

interface Scenario {
  name: string;
  kind: "search" | "page";
  paths: string[];
  /** Each path is read once before the warm-up: the figures are of views after the first (from the page cache for anonymous readers). */
  repeat?: boolean;
  /** A first view: only the pages that have no kept copy when the scenario starts are read (the render ahead has not reached them). */
  firstView?: boolean;
  /** The pages rendered ahead of readers during this run, read for the first time (from the kept pages). */
  aheadKind?: "datasets" | "reactions" | "species";
  /**
   * While it runs, changes elsewhere move the public pages' mark (a tag no page shows, CHURN_MS
   * apart, as publications of other datasets would): the memory of the front server forgets its
   * pages at each, and they come back from the pages kept in the database (lib/kept-pages.ts).
   */
  churn?: boolean;
}

/** Every page path some scenario of this run reads (the pages rendered ahead are taken among the others). */
const read: string[] = [];

/** How often the "changes elsewhere" scenarios move the mark, in milliseconds. */
const CHURN_MS = 200;

const routeExists = (...segments: string[]) => existsSync(path.join(root, "app", ...segments));

/** URLs spread over the data, read from the bench database (as the runtime role). */
async function scenarios(): Promise<{ list: Scenario[]; missing: string[] }> {
  const sql = postgres(databaseUrl, { max: 1, onnotice: () => {} });
  const q = (params: Record<string, string | number>) =>
    `/api/v1/search?${new URLSearchParams(Object.entries(params).map(([k, v]) => [k, String(v)]))}`;
  try {
    const versions = await sql<{ dataset_id: number; number: number }[]>`
      select dataset_id, number from dataset_versions where state in ('published', 'retracted') order by random() limit 3000`;
    const reactions = await sql<{ id: number; key: string }[]>`
      select r.id, r.key from reactions r where exists (select 1 from dataset_versions v where v.reaction_id = r.id and v.state = 'published')
      order by random() limit 3000`;
    const species = await sql<{ inchi_key: string; name: string; formula: string }[]>`
      select s.inchi_key, min(n.name) as name, s.formula from species s join species_names n on n.species_id = s.id
      where exists (select 1 from reaction_participants p where p.species_id = s.id) group by s.id order by random() limit 1000`;
    const words = await sql<{ w: string }[]>`
      select distinct split_part(name, ',', 1) as w from users where role = 'researcher' order by 1 limit 300`;
    const pairs = await sql<{ x: string; m: string }[]>`
      select (select name from species_names where species_id = a.species_id order by length(name), name limit 1) as x,
             (select name from species_names where species_id = b.species_id order by length(name), name limit 1) as m
      from reaction_participants a join reaction_participants b on a.reaction_id = b.reaction_id and a.side = 'reactant' and b.side = 'reactant' and a.species_id < b.species_id
      order by random() limit 2000`;
    const techniques = [
      "flash photolysis",
      "shock tube",
      "discharge flow",
      "master equation",
      "relative rate",
      "pulsed laser photolysis",
      "combustion",
      "halocarbons",
    ];
    const text = [...techniques, ...words.map((w) => w.w)];
    const classes = ["hydrogen-abstraction", "addition", "bond-fission", "recombination"];
    const list: Scenario[] = [];
    const missing: string[] = [];
    if (routeExists("api", "v1", "search", "route.ts")) {
      list.push(
        { name: "search: text", kind: "search", paths: text.map((t) => q({ q: t })) },
        { name: "search: species", kind: "search", paths: species.flatMap((s, i) => [q({ q: i % 3 === 2 ? s.formula : s.name })]) },
        { name: "search: reaction (X + Y)", kind: "search", paths: pairs.map((p) => q({ q: `${p.x} + ${p.m}` })) },
        {
          name: "search: T window + class",
          kind: "search",
          paths: Array.from({ length: 500 }, (_, i) => {
            const tMin = 200 + ((i * 37) % 800);
            return q({ tMin, tMax: tMin + 100 + ((i * 53) % 400), [FILTER_PARAMETERS.reactionClass]: classes[i % classes.length] });
          }),
        },
      );
    } else missing.push("search (no app/api/v1/search yet)");
    const versionPaths = versions.map((v) => `/datasets/${v.dataset_id}/v${v.number}`);
    const reactionPaths = reactions.map((r) => reactionPath(r.key));
    const speciesPaths = species.map((s) => `/species/${s.inchi_key}`);
    list.push({ name: "page: dataset version, first view, not rendered ahead", kind: "page", paths: versionPaths, firstView: true });
    list.push({ name: "page: reaction, first view, not rendered ahead", kind: "page", paths: reactionPaths, firstView: true });
    if (routeExists("species", "[inchikey]"))
      list.push({ name: "page: species, first view, not rendered ahead", kind: "page", paths: speciesPaths, firstView: true });
    else missing.push("species page (no app/species/[inchikey] yet)");
    // Views after the first of a few hundred pages (a reader coming back, a link shared, a crawler's second pass).
    const repeatCount = env("BENCH_REPEAT_PAGES", 200);
    list.push({ name: "page: dataset version, again", kind: "page", paths: versionPaths.slice(0, repeatCount), repeat: true });
    list.push({
      name: "page: reaction, again",
      kind: "page",
      paths: reactionPaths.filter((_, i) => i % Math.max(1, Math.floor(reactionPaths.length / 40)) === 0).slice(0, 40),
      repeat: true,
    });
    if (routeExists("species", "[inchikey]"))
      list.push({ name: "page: species, again", kind: "page", paths: speciesPaths.slice(0, repeatCount), repeat: true });
    // The same pages while other datasets are published (the mark moves 5 times a second).
    list.push({
      name: "page: dataset version, again, changes elsewhere",
      kind: "page",
      paths: versionPaths.slice(0, repeatCount),
      repeat: true,
      churn: true,
    });
    if (routeExists("species", "[inchikey]"))
      list.push({
        name: "page: species, again, changes elsewhere",
        kind: "page",
        paths: speciesPaths.slice(0, repeatCount),
        repeat: true,
        churn: true,
      });
    // First views of pages the server rendered ahead of readers meanwhile (never read by this run
    // before), while the mark moves as above: each page's first view comes from kept_pages, the
    // next ones from memory (the moves touch none of its tags).
    const ahead = (name: string, aheadKind: Scenario["aheadKind"]): Scenario => ({ name, kind: "page", paths: [], aheadKind, churn: true });
    list.push(ahead("page: dataset version, rendered ahead", "datasets"), ahead("page: reaction, rendered ahead", "reactions"));
    if (routeExists("species", "[inchikey]")) list.push(ahead("page: species, rendered ahead", "species"));
    read.push(...versionPaths, ...reactionPaths, ...speciesPaths);
    return { list, missing };
  } finally {
    await sql.end();
  }
}

/**
 * Moves the public pages' mark every CHURN_MS until the returned function is called, each time with
 * another tag no page of the run carries (as publications of other datasets would: the front server's
 * memory then reads which tags moved, a few hundred rows after a minute of them).
 */
function churn(): () => Promise<void> {
  const sql = postgres(databaseUrl, { max: 1, onnotice: () => {} });
  let moves = 0;
  const timer = setInterval(() => {
    moves += 1;
    const tag = `bench:elsewhere:${moves % 500}`;
    void sql`insert into page_tag_moves (tag, moved) values (${tag}, nextval('public_pages_mark'))
      on conflict (tag) do update set moved = excluded.moved`.catch(() => undefined);
  }, CHURN_MS);
  return async () => {
    clearInterval(timer);
    log(`  the mark moved ${moves} times meanwhile`);
    await sql.end();
  };
}

/** The paths among `paths` whose page has no kept copy now (not rendered ahead, nor read, yet). */
async function withoutKeptCopy(paths: string[]): Promise<string[]> {
  const sql = postgres(databaseUrl, { max: 1, onnotice: () => {} });
  try {
    const rows = await sql<{ key: string }[]>`select key from kept_pages where key = any(${paths.map((p) => `${p}\ngzip`)})`;
    const kept = new Set(rows.map((r) => r.key.slice(0, -"\ngzip".length)));
    return paths.filter((p) => !kept.has(p));
  } finally {
    await sql.end();
  }
}

const AHEAD_PREFIX = { datasets: "/datasets/", reactions: "/reactions/", species: "/species/" } as const;

/** What the render ahead did while the run waited for it (printed under the table). */
interface AheadReport {
  waitedSeconds: number;
  /** Pages kept while the run waited, read by nobody: the render ahead alone, on an otherwise idle server. */
  keptWhileWaiting: number;
  publicPages: number;
  enough: boolean;
}

/**
 * Waits until the server has rendered ahead at least `count` pages of each kind that no scenario
 * of this run reads (at most BENCH_AHEAD_WAIT_SECONDS), and says how fast it went.
 */
async function waitForRenderedAhead(count: number): Promise<AheadReport> {
  const sql = postgres(databaseUrl, { max: 1, onnotice: () => {} });
  const limit = env("BENCH_AHEAD_WAIT_SECONDS", 1800);
  const t0 = performance.now();
  const keptNow = async () => Number((await sql<{ n: number }[]>`select count(*)::int as n from kept_pages`)[0].n);
  try {
    const before = await keptNow();
    const [{ n: publicPages }] = await sql<{ n: number }[]>`
      select (select count(*) from dataset_versions where state in ('published', 'retracted'))
        + (select count(distinct reaction_id) from dataset_versions where state in ('published', 'retracted'))
        + (select count(distinct p.species_id) from reaction_participants p
            where exists (select 1 from dataset_versions v where v.reaction_id = p.reaction_id and v.state in ('published', 'retracted')))::int as n`;
    let enough = false;
    let lastLog = 0;
    while (!enough && performance.now() - t0 < limit * 1000) {
      const counts = await Promise.all(Object.values(AHEAD_PREFIX).map((prefix) => aheadPaths(sql, prefix, count).then((p) => p.length)));
      enough = counts.every((n) => n >= count);
      if (!enough) {
        if (performance.now() - lastLog > 30_000) {
          log(`waiting for the pages rendered ahead: ${counts.join(" / ")} of ${count} (datasets / reactions / species)`);
          lastLog = performance.now();
        }
        await new Promise((r) => setTimeout(r, 2000));
      }
    }
    return {
      waitedSeconds: (performance.now() - t0) / 1000,
      keptWhileWaiting: (await keptNow()) - before,
      publicPages: Number(publicPages),
      enough,
    };
  } finally {
    await sql.end();
  }
}

/** Up to `count` pages under `prefix` kept by this run's server and read by no scenario, in random order. */
async function aheadPaths(sql: postgres.Sql, prefix: string, count: number): Promise<string[]> {
  const rows = await sql<{ path: string }[]>`
    select left(key, -5) as path from kept_pages
    where key like ${`${prefix}%\ngzip`} and left(key, -5) <> all(${read}) order by random() limit ${count}`;
  return rows.map((r) => r.path);
}

/** One request per scenario first: a scenario whose URLs fail is reported, not silently timed. */
async function probe(s: Scenario): Promise<string> {
  try {
    const res = await fetch(base + s.paths[0], { redirect: "manual", signal: AbortSignal.timeout(60_000) });
    const body = await res.text();
    return `${res.status} ${body.length} B ${s.paths[0]}`;
  } catch (err) {
    // A saturated server (the previous scenario's requests still running) must not end the run.
    return `no answer (${(err as Error).message}) ${s.paths[0]}`;
  }
}

/** Reads every path once, eight at a time (seconds taken). */
async function primeAll(paths: string[]): Promise<number> {
  const t0 = performance.now();
  let next = 0;
  const worker = async () => {
    while (next < paths.length) {
      const p = paths[next++];
      // The same Accept-Encoding as the timed requests: the page cache keeps one answer per encoding.
      await fetch(base + p, { redirect: "manual", headers: { "accept-encoding": ACCEPT_ENCODING }, signal: AbortSignal.timeout(60_000) })
        .then((res) => res.arrayBuffer())
        .catch(() => undefined);
    }
  };
  await Promise.all(Array.from({ length: 8 }, worker));
  return (performance.now() - t0) / 1000;
}

// ---------------------------------------------------------------------------------------------

/** Statements the cluster logged as slow since `offset` (log_min_duration_statement), slowest first. */
function slowStatements(file: string, offset: number): { ms: number; text: string }[] {
  if (!existsSync(file)) return [];
  const text = readFileSync(file).subarray(offset).toString("utf8");
  const found: { ms: number; text: string }[] = [];
  // A statement runs on over its continuation lines (tab-indented) up to the next entry, which starts with its time.
  for (const m of text.matchAll(/duration: ([\d.]+) ms\s+(?:statement|execute [^:]*): ([\s\S]*?)(?=\n\d{4}-\d\d-\d\d |$)/g))
    found.push({ ms: Number(m[1]), text: m[2].replace(/\s+/g, " ").trim() });
  return found.sort((a, b) => b.ms - a.ms);
}

const ms = (x: number) => (Number.isFinite(x) ? x.toFixed(x < 10 ? 1 : 0) : "-");
const mib = (b: number) => `${(b / 2 ** 20).toFixed(0)} MiB`;

if (process.env.BENCH_BUILD_ONLY) {
  buildApp();
  process.exit(0);
}
const stamp = await ensureFilledDatabase();
if (process.env.BENCH_FILL_ONLY) {
  log(`filled: ${JSON.stringify(stamp)}`);
  process.exit(0);
}
buildApp();
// Statements slower than SLOW_MS go to the cluster's log, read back after the run (the plan of a slow search starts there).
const SLOW_MS = env("BENCH_SLOW_MS", 200);
const serverLog = path.join(process.env.BENCH_PG_DIR!, "server.log");
{
  const admin = postgres(process.env.BENCH_ADMIN_URL!, { max: 1, onnotice: () => {} });
  await admin.unsafe(`alter system set log_min_duration_statement = ${SLOW_MS}`);
  await admin`select pg_reload_conf()`;
  await admin.end();
}
/**
 * The database's files read into the operating system's cache (pg_prewarm, 'read' mode) before the
 * server starts, as a database in service has them: the cluster starts afresh every run and this
 * machine reclaims page cache left idle, and runs after such a reclaim measured reads from disk (a
 * reaction's analyses, 36 versions: 3 ms from the cache, 420 ms from disk).
 */
async function warmDatabaseFiles(): Promise<{ seconds: number; megabytes: number }> {
  const url = new URL(process.env.BENCH_ADMIN_URL!);
  url.pathname = `/${databaseName}`;
  const admin = postgres(url.toString(), { max: 1, onnotice: () => {} });
  try {
    await admin`create extension if not exists pg_prewarm`;
    const t0 = performance.now();
    const relations = await admin<{ oid: number; bytes: string }[]>`
      select c.oid, pg_relation_size(c.oid) as bytes from pg_class c join pg_namespace n on n.oid = c.relnamespace
      where n.nspname in ('public', 'pg_toast') and c.relkind in ('r', 'i', 't', 'm') and pg_relation_size(c.oid) > 0`;
    let bytes = 0;
    for (const r of relations) {
      await admin`select pg_prewarm(${r.oid}::oid::regclass, 'read')`;
      bytes += Number(r.bytes);
    }
    return { seconds: (performance.now() - t0) / 1000, megabytes: bytes / 2 ** 20 };
  } finally {
    await admin.end();
  }
}
const warmed = await warmDatabaseFiles();
log(`database files read into the OS cache: ${warmed.megabytes.toFixed(0)} MiB in ${warmed.seconds.toFixed(1)} s (pg_prewarm)`);
// Every page unrendered, as after a new build: the kept pages of an earlier run (the same build reused) are dropped.
{
  const sql = postgres(databaseUrl, { max: 1, onnotice: () => {} });
  const [{ n }] = await sql<{ n: number }[]>`with gone as (delete from kept_pages returning 1) select count(*)::int as n from gone`;
  await sql.end();
  log(`kept pages of earlier runs dropped: ${n}`);
}
const logOffset = existsSync(serverLog) ? statSync(serverLog).size : 0;
log(`starting scripts/serve.ts on ${base}`);
const startedAt = performance.now();
const server = startServer();
const stopServer = () => {
  if (server.exitCode === null) server.kill("SIGTERM");
};
process.on("exit", stopServer);
let memory: ReturnType<typeof sampleTreeMemory> | null = null;
try {
  await waitForServer(server);
  const startSeconds = (performance.now() - startedAt) / 1000;
  memory = sampleTreeMemory(server.pid!);
  const { list, missing } = await scenarios();
  const results: ScenarioResult[] = [];
  const loadBefore = loadavg();
  let ahead: AheadReport | null = null;
  for (const s of list) {
    if (s.firstView) {
      const unrendered = await withoutKeptCopy(s.paths);
      log(`${s.name}: ${s.paths.length - unrendered.length} of ${s.paths.length} pages rendered ahead already, left out`);
      s.paths = unrendered;
    }
    memory.phase = s.name;
    if (s.aheadKind) {
      memory.phase = "waiting for the render ahead";
      ahead ??= await waitForRenderedAhead(env("BENCH_REPEAT_PAGES", 200));
      const sql = postgres(databaseUrl, { max: 1, onnotice: () => {} });
      s.paths = await aheadPaths(sql, AHEAD_PREFIX[s.aheadKind], env("BENCH_REPEAT_PAGES", 200)).finally(() => sql.end());
      if (s.paths.length === 0) {
        log(`${s.name}: no page rendered ahead in time, not measured`);
        continue;
      }
    }
    memory.phase = s.name;
    log(`${s.name}: ${await probe(s)}`);
    if (s.repeat) log(`${s.name}: read each of ${s.paths.length} once first (${(await primeAll(s.paths)).toFixed(1)} s)`);
    const stopChurn = s.churn ? churn() : null;
    await drive(base, s.paths, warmSeconds, connections);
    const r = await drive(base, s.paths, seconds, connections);
    await stopChurn?.();
    results.push({ name: s.name, kind: s.kind, ...r });
    log(`${s.name}: p95 ${ms(r.p95)} ms, ${r.requestsPerSecond.toFixed(0)} req/s, non-2xx ${r.non2xx}`);
  }
  const loadAfter = loadavg();
  memory.stop();

  const rep = stamp.report;
  console.log(
    `\nArrhenia web benchmark: ${rep.datasets} datasets (${rep.versions} published versions, ${rep.points} points, ${rep.reactions} reactions, ${rep.species} species)`,
  );
  console.log(
    `autocannon ${connections} connections, ${seconds} s per scenario after ${warmSeconds} s warm-up; Accept-Encoding: ${ACCEPT_ENCODING}; server ${base} (scripts/serve.ts, ${distDir})\n`,
  );
  const rows = [["scenario", "p50 ms", "p95 ms", "p99 ms", "req/s", "requests", "non-2xx", "errors"]];
  for (const r of results)
    rows.push([
      r.name,
      ms(r.p50),
      ms(r.p95),
      ms(r.p99),
      r.requestsPerSecond.toFixed(0),
      String(r.requests),
      String(r.non2xx),
      String(r.errors),
    ]);
  console.log(formatTable(rows));
  // How each page scenario's answers were served (from memory, from the kept pages, or rendered), each with its own p95:
  // what sets a row's p95 when a few renders hide among many fast answers.
  console.log("\nhow the pages were served (x-arrhenia-html-cache: hit = memory, kept = the kept pages, miss = rendered):");
  for (const r of results.filter((x) => x.kind === "page")) {
    const total = Object.values(r.served).reduce((n, x) => n + x.count, 0) || 1;
    const parts = Object.entries(r.served)
      .sort((a, b) => b[1].count - a[1].count)
      .map(([how, x]) => `${how} ${((100 * x.count) / total).toFixed(1)} % (p95 ${ms(x.p95)} ms)`);
    console.log(`  ${r.name}: ${parts.join(", ")}`);
  }
  console.log(
    `\nserver peak RSS (process tree, ${memory.processes} processes): ${mib(memory.peak)} (${memory.atPeak.bytes.map(mib).join(" + ")}, during "${memory.atPeak.phase}"); start to first answer ${startSeconds.toFixed(1)} s`,
  );
  if (ahead) {
    const rate = ahead.keptWhileWaiting / ahead.waitedSeconds;
    console.log(
      `rendered ahead of readers: ${ahead.keptWhileWaiting} pages in the ${ahead.waitedSeconds.toFixed(0)} s the run waited (${rate.toFixed(1)} pages/s with no reader)` +
        (rate > 0
          ? `; all ${ahead.publicPages} public pages at that pace: ${(ahead.publicPages / rate / 60).toFixed(0)} min after a new build`
          : "") +
        (ahead.enough ? "" : " — fewer pages than asked for within BENCH_AHEAD_WAIT_SECONDS"),
    );
  }
  console.log(
    `search documents: ${stamp.searchDocuments ?? 0}${stamp.searchDocumentsSeconds === null ? " (build not timed in this run)" : ` built in ${stamp.searchDocumentsSeconds.toFixed(1)} s`}`,
  );
  console.log(
    `fill: ${Object.entries(rep.seconds)
      .map(([k, v]) => `${k} ${v.toFixed(1)} s`)
      .join("; ")}`,
  );
  console.log(
    `load average (1/5/15 min): before ${loadBefore.map((x) => x.toFixed(2)).join(" ")}, after ${loadAfter.map((x) => x.toFixed(2)).join(" ")}\n`,
  );

  const search = results.filter((r) => r.kind === "search");
  // Pages as readers find them once rendered ahead (or read before), and the first views a new build's pass had not reached yet.
  const pages = results.filter((r) => r.kind === "page" && !r.name.includes("not rendered ahead"));
  const unrendered = results.filter((r) => r.kind === "page" && r.name.includes("not rendered ahead"));
  const verdict = (ok: boolean | null) => (ok === null ? "not measured" : ok ? "met" : "NOT MET");
  const worst = (rs: ScenarioResult[]) => (rs.length ? Math.max(...rs.map((r) => r.p95)) : NaN);
  const targets = [
    ["target", "measured", "result"],
    ["search p95 ≤ 50 ms", search.length ? `${ms(worst(search))} ms (worst)` : "-", verdict(search.length ? worst(search) <= 50 : null)],
    [
      "pages p95 ≤ 100 ms (rendered ahead, or read before)",
      pages.length ? `${ms(worst(pages))} ms (worst)` : "-",
      verdict(pages.length ? worst(pages) <= 100 : null),
    ],
    [
      "pages p95 ≤ 100 ms before the render ahead reached them",
      unrendered.length ? `${ms(worst(unrendered))} ms (worst)` : "-",
      verdict(unrendered.length ? worst(unrendered) <= 100 : null),
    ],
    [
      "search ≥ 200 requests/s",
      search.length ? `${Math.min(...search.map((r) => r.requestsPerSecond)).toFixed(0)} req/s (lowest)` : "-",
      verdict(search.length ? search.every((r) => r.requestsPerSecond >= 200) : null),
    ],
    ["server memory < 1 GiB", mib(memory.peak), verdict(memory.peak < 2 ** 30)],
    [
      "every answer 2xx",
      String(results.reduce((n, r) => n + r.non2xx + r.errors, 0)),
      verdict(results.every((r) => r.non2xx === 0 && r.errors === 0)),
    ],
  ];
  console.log(formatTable(targets));
  if (missing.length) console.log(`\nnot measured: ${missing.join("; ")}`);
  const slow = slowStatements(serverLog, logOffset);
  console.log(`\nPostgreSQL: ${slow.length} statement(s) over ${SLOW_MS} ms during the run (${serverLog})`);
  for (const x of slow.slice(0, 3)) console.log(`  ${x.ms.toFixed(0)} ms: ${x.text.slice(0, 300)}`);

  if (process.env.BENCH_KEEP) {
    console.log(`\nThe server stays up at ${base} (bench database on port ${new URL(databaseUrl).port}); Ctrl-C stops it.`);
    await new Promise<void>((resolve) => {
      process.once("SIGINT", resolve);
      process.once("SIGTERM", resolve);
      server.once("exit", () => resolve());
    });
  }
} finally {
  memory?.stop();
  stopServer();
  await new Promise((r) => (server.exitCode === null ? server.once("exit", r) : r(null)));
}
process.exit(0);
