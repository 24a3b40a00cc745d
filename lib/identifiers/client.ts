// HTTP client of a DOI registration agency's REST API (JSON:API `dois` resource). Only two calls:
// PUT (create-or-update, so a retry after a lost answer never mints a second identifier) and GET.
import { doiApiAuth, doiApiUrl } from "@/lib/config";
import type { DataciteAttributes, DataciteBody } from "./datacite";

export interface AgencyOptions {
  /** Base URL of the API, no trailing slash; `DOI_API_URL` (or the local fake) by default. */
  baseUrl?: string;
  /** Basic-auth account; `DOI_API_USER` / `DOI_API_PASSWORD` by default. `null` sends none. */
  auth?: { user: string; password: string } | null;
  /** Give up after this many milliseconds (default 15 000). */
  timeoutMs?: number;
}

/** One DOI record as the agency returns it. */
export interface DoiRecord {
  id: string;
  type: "dois";
  attributes: Partial<DataciteAttributes> & { doi: string; state?: string; created?: string; updated?: string };
}

/** A refusal or failure of the agency, with its HTTP status (0 when it could not be reached). */
export class DoiAgencyError extends Error {
  constructor(
    message: string,
    readonly status: number,
    readonly detail: string | null,
  ) {
    super(message);
    this.name = "DoiAgencyError";
  }

  /** 5xx, 408, 429 and network failures are worth retrying; a 4xx refusal will not change by itself. */
  get retryable(): boolean {
    return this.status === 0 || this.status === 408 || this.status === 429 || this.status >= 500;
  }
}

const JSON_API = "application/vnd.api+json";

/** `/dois/10.5072/arrhenia.4.v1`: the slash between prefix and suffix stays a path separator. */
export function doiPath(doi: string): string {
  return `/dois/${doi.split("/").map(encodeURIComponent).join("/")}`;
}

/** Registers the identifier in `body` or updates its metadata (PUT is an upsert). Returns the stored record. */
export async function registerDoi({ body, ...options }: AgencyOptions & { body: DataciteBody }): Promise<DoiRecord> {
  const doi = body.data.attributes.doi;
  const res = await callAgency("PUT", doi, options, JSON.stringify(body));
  if (res.status !== 200 && res.status !== 201) throw await agencyError(res, `registering ${doi}`);
  return readRecord(res, doi);
}

/** The agency's record of `doi`, or null when it has none. */
export async function getDoi(doi: string, options: AgencyOptions = {}): Promise<DoiRecord | null> {
  const res = await callAgency("GET", doi, options);
  if (res.status === 404) return null;
  if (res.status !== 200) throw await agencyError(res, `reading ${doi}`);
  return readRecord(res, doi);
}

async function callAgency(method: "GET" | "PUT", doi: string, options: AgencyOptions, body?: string): Promise<Response> {
  const baseUrl = (options.baseUrl ?? doiApiUrl()).replace(/\/$/, "");
  const auth = options.auth === undefined ? doiApiAuth() : options.auth;
  const headers: Record<string, string> = { accept: JSON_API };
  if (body) headers["content-type"] = JSON_API;
  if (auth) headers.authorization = `Basic ${Buffer.from(`${auth.user}:${auth.password}`).toString("base64")}`;
  try {
    return await fetch(`${baseUrl}${doiPath(doi)}`, { method, headers, body, signal: AbortSignal.timeout(options.timeoutMs ?? 15_000) });
  } catch (err) {
    const reason = err instanceof Error ? (err.cause instanceof Error ? err.cause.message : err.message) : String(err);
    throw new DoiAgencyError(`DOI agency at ${baseUrl} unreachable (${method} ${doi}): ${reason}`, 0, reason);
  }
}

async function readRecord(res: Response, doi: string): Promise<DoiRecord> {
  const json = (await res.json().catch(() => null)) as { data?: DoiRecord } | null;
  if (!json?.data?.attributes)
    throw new DoiAgencyError(`DOI agency answered ${res.status} for ${doi} without a JSON:API record`, res.status, null);
  return json.data;
}

/** Reads the JSON:API `errors` array (title, detail, source) into one line for logs and `last_error`. */
async function agencyError(res: Response, what: string): Promise<DoiAgencyError> {
  const text = await res.text().catch(() => "");
  let detail: string | null = text.trim().slice(0, 500) || null;
  try {
    const json = JSON.parse(text) as { errors?: { title?: string; detail?: string; source?: string | { pointer?: string } }[] };
    if (Array.isArray(json.errors) && json.errors.length) {
      detail = json.errors
        .map((e) => {
          const where = typeof e.source === "string" ? e.source : e.source?.pointer;
          return [where, e.detail ?? e.title].filter(Boolean).join(": ");
        })
        .join("; ");
    }
  } catch {
    // Not JSON (a proxy's HTML page, say): keep the start of the text.
  }
  return new DoiAgencyError(`DOI agency refused ${what}: HTTP ${res.status}${detail ? ` — ${detail}` : ""}`, res.status, detail);
}
