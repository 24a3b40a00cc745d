// Environment configuration in one place. Every variable is listed in the README.

function required(name: string): string {
  const value = process.env[name];
  if (!value) throw new Error(`${name} is not set; start the app with \`npm start\` or set it (see README, Configuration)`);
  return value;
}

export function databaseUrl(): string {
  return required("DATABASE_URL");
}

/** The public base URL used in links inside e-mails. */
export function appUrl(): string {
  return (process.env.APP_URL ?? process.env.NEXTAUTH_URL ?? `http://127.0.0.1:${process.env.PORT ?? 3000}`).replace(/\/$/, "");
}

/** SMTP relay; when unset, mail goes to the local capture server. */
export function smtpUrl(): string {
  return process.env.SMTP_URL || `smtp://127.0.0.1:${captureSmtpPort()}`;
}

export function captureSmtpPort(): number {
  return Number(process.env.MAIL_CAPTURE_PORT ?? 2525);
}

export function usesMailCapture(): boolean {
  return !process.env.SMTP_URL;
}

export function mailFrom(): string {
  return process.env.MAIL_FROM ?? "Arrhenia <no-reply@arrhenia.invalid>";
}

/** Port of the local fake DOI registration service, started on 127.0.0.1 when DOI_API_URL is unset. */
export function doiFakePort(): number {
  return Number(process.env.DOI_FAKE_PORT ?? 5100);
}

/** Base URL of the DOI registration agency's REST API (no trailing slash); the local fake by default. */
export function doiApiUrl(): string {
  return (process.env.DOI_API_URL || `http://127.0.0.1:${doiFakePort()}`).replace(/\/$/, "");
}

export function usesFakeDoiService(): boolean {
  return !process.env.DOI_API_URL;
}

/** Basic-auth account at the registration agency (repository id and password), or null when unset. */
export function doiApiAuth(): { user: string; password: string } | null {
  const user = process.env.DOI_API_USER;
  return user ? { user, password: process.env.DOI_API_PASSWORD ?? "" } : null;
}

/** Folder where the local fake DOI service keeps its records; set it empty to keep them in memory. */
export function fakeDoiDataDir(): string | null {
  return (process.env.DOI_FAKE_DATA_DIR ?? ".data/fake-doi") || null;
}

function positiveInteger(name: string, fallback: number): number {
  const raw = process.env[name];
  if (raw === undefined || raw === "") return fallback;
  const value = Number(raw);
  if (!Number.isInteger(value) || value < 1) throw new Error(`${name} must be a whole number of at least 1 (got "${raw}")`);
  return value;
}

/** Worker threads that validate and analyse deposits off the request thread (one on a two-core machine). */
export function analysisThreads(): number {
  return positiveInteger("ANALYSIS_THREADS", 1);
}

/** Tasks that may wait for an analysis thread; beyond this a request is answered 503 at once. */
export function analysisQueueLimit(): number {
  return positiveInteger("ANALYSIS_QUEUE_LIMIT", 32);
}

/** Longest one validation or analysis may take, waiting included, before it is stopped (ms). */
export function analysisTimeoutMs(): number {
  return positiveInteger("ANALYSIS_TIMEOUT_MS", 60_000);
}
