// A local stand-in for a Meilisearch service, for tests only: an HTTP server on 127.0.0.1 that
// answers the endpoints the `meilisearch` SDK calls for our engine, outbox and setup, as small as
// they need:
//   GET /health · POST /indexes · GET /indexes/:uid · GET|PATCH /indexes/:uid/settings
//   POST|PUT /indexes/:uid/documents (add or replace; PUT merges) · GET /indexes/:uid/documents/:id
//   POST /indexes/:uid/documents/delete-batch · DELETE /indexes/:uid/documents
//   GET /tasks/:uid (every write is applied at once and its task is "succeeded", or "failed" while
//   failTasks is on) · POST /indexes/:uid/search · POST /multi-search
// Search: q matched word by word (every word must be found in a searchable attribute, the last one
// as a prefix; with Meilisearch's default typo tolerance: one edit from 5 letters, two from 9; a
// word also matches through the index's synonyms), score = the earliest searchable
// attribute each word is found in; filter in array form only (outer AND, inner OR) with conditions
//   attr = value · attr IN [v, …] · attr >= n · attr <= n   (values as JSON literals);
// sort (attr:asc|desc, before relevance, as the engine's ranking rules put "sort" first), facets
// (facetDistribution over the filtered matches), offset/limit (estimatedTotalHits) or
// page/hitsPerPage (totalHits), attributesToRetrieve and distinct. Anything else is refused with
// a 400, so the engine cannot come to rely on something the stand-in only pretends to do.
// `down("refused")` stops listening (connection refused), `down("503")` answers 503; `up()` restores.
import { createServer, type IncomingMessage, type Server, type ServerResponse } from "node:http";
import type { AddressInfo, Socket } from "node:net";

type Doc = Record<string, unknown> & { id: string };
type Condition = (doc: Doc) => boolean;

interface Index {
  uid: string;
  primaryKey: string;
  docs: Map<string, Doc>;
  settings: Record<string, unknown>;
  createdAt: string;
}

interface TaskRecord {
  uid: number;
  indexUid: string | null;
  status: "succeeded" | "failed";
  type: string;
  error: { message: string; code: string; type: string; link: string } | null;
  enqueuedAt: string;
  startedAt: string;
  finishedAt: string;
  duration: string;
  details: Record<string, unknown>;
}

export interface MeiliStandIn {
  url: string;
  port: number;
  indexes: Map<string, Index>;
  /** Requests answered, by "METHOD path" (for tests that check what was asked). */
  requests: string[];
  /** While true, every write's task ends "failed" and changes nothing. */
  failTasks: boolean;
  down(mode?: "refused" | "503"): Promise<void>;
  up(): Promise<void>;
  close(): Promise<void>;
}

const SEARCH_PARAMS = new Set([
  "indexUid",
  "q",
  "filter",
  "sort",
  "facets",
  "offset",
  "limit",
  "page",
  "hitsPerPage",
  "attributesToRetrieve",
  "distinct",
  "matchingStrategy",
]);

class BadRequest extends Error {
  constructor(
    message: string,
    readonly code = "bad_request",
    readonly status = 400,
  ) {
    super(message);
  }
}

/** Lower-case words of a text (letters and digits; anything else separates). */
export function words(text: string): string[] {
  return text.toLowerCase().match(/[\p{L}\p{N}]+/gu) ?? [];
}

function parseLiteral(text: string): unknown {
  try {
    return JSON.parse(text);
  } catch {
    throw new BadRequest(`stand-in: cannot read the value ${text}`, "invalid_search_filter");
  }
}

function valuesOf(doc: Doc, attr: string): unknown[] {
  const v = doc[attr];
  return Array.isArray(v) ? v : v === undefined || v === null ? [] : [v];
}

/** One condition of the subset documented above. */
export function parseCondition(text: string): Condition {
  let m = /^(\w+) IN \[(.*)\]$/.exec(text);
  if (m) {
    const attr = m[1];
    const wanted = (parseLiteral(`[${m[2]}]`) as unknown[]).map(String);
    return (d) => valuesOf(d, attr).some((v) => wanted.includes(String(v)));
  }
  m = /^(\w+) (=|>=|<=) (.+)$/.exec(text);
  if (m) {
    const [, attr, op, raw] = m;
    const want = parseLiteral(raw);
    if (op === "=") return (d) => valuesOf(d, attr).some((v) => String(v) === String(want));
    if (typeof want !== "number") throw new BadRequest(`stand-in: ${op} needs a number in ${text}`, "invalid_search_filter");
    return (d) => valuesOf(d, attr).some((v) => typeof v === "number" && (op === ">=" ? v >= want : v <= want));
  }
  throw new BadRequest(`stand-in: unsupported filter condition ${text}`, "invalid_search_filter");
}

function parseFilter(filter: unknown): Condition {
  if (filter === undefined || filter === null) return () => true;
  if (!Array.isArray(filter)) throw new BadRequest("stand-in: filters must be in array form", "invalid_search_filter");
  const all = filter.map((item) => {
    if (typeof item === "string") return parseCondition(item);
    if (Array.isArray(item) && item.every((s) => typeof s === "string")) {
      const any = item.map(parseCondition);
      return (d: Doc) => any.some((c) => c(d));
    }
    throw new BadRequest("stand-in: nested filters deeper than one OR group are not supported", "invalid_search_filter");
  });
  return (d) => all.every((c) => c(d));
}

/** Edits (insert, delete, substitute) between two words, at most `max` + 1 counted. */
function editDistance(a: string, b: string, max: number): number {
  if (Math.abs(a.length - b.length) > max) return max + 1;
  let prev = Array.from({ length: b.length + 1 }, (_, j) => j);
  for (let i = 1; i <= a.length; i++) {
    const row = [i];
    for (let j = 1; j <= b.length; j++) row[j] = Math.min(prev[j] + 1, row[j - 1] + 1, prev[j - 1] + (a[i - 1] === b[j - 1] ? 0 : 1));
    prev = row;
  }
  return prev[b.length];
}

/** Whether token t matches the query word w (exactly, within the typos its length allows, or as a prefix when last). */
function wordMatches(w: string, t: string, prefix: boolean): boolean {
  if (t === w || (prefix && t.startsWith(w))) return true;
  const typos = w.length >= 9 ? 2 : w.length >= 5 ? 1 : 0;
  return typos > 0 && editDistance(w, t, typos) <= typos;
}

/** Score of a document for q: undefined when a word is missing; lower = better (earlier attribute). */
function scoreOf(doc: Doc, q: string, index: Index): number | undefined {
  const qWords = words(q);
  if (!qWords.length) return 0;
  const searchable = (index.settings.searchableAttributes as string[] | undefined) ?? Object.keys(doc);
  const synonyms = (index.settings.synonyms as Record<string, string[]> | undefined) ?? {};
  const attrWords = searchable.map((a) => valuesOf(doc, a).flatMap((v) => words(String(v))));
  const position = (phrase: string[], prefix: boolean) =>
    attrWords.findIndex((ws) => phrase.every((w, i) => ws.some((t) => wordMatches(w, t, prefix && i === phrase.length - 1))));
  let score = 0;
  for (const [i, w] of qWords.entries()) {
    const last = i === qWords.length - 1;
    const candidates = [position([w], last), ...(synonyms[w] ?? []).map((s) => position(words(s), false))].filter((p) => p >= 0);
    if (!candidates.length) return undefined;
    score += Math.min(...candidates);
  }
  return score;
}

function compareBy(sort: string[] | undefined) {
  const keys = (sort ?? []).map((s) => {
    const [attr, dir] = s.split(":");
    if (dir !== "asc" && dir !== "desc") throw new BadRequest(`stand-in: bad sort ${s}`, "invalid_search_sort");
    return { attr, sign: dir === "asc" ? 1 : -1 };
  });
  return (x: Doc, y: Doc) => {
    for (const { attr, sign } of keys) {
      const a = x[attr] as number | string;
      const b = y[attr] as number | string;
      if (a !== b) return (a < b ? -1 : 1) * sign;
    }
    return 0;
  };
}

function search(index: Index, params: Record<string, unknown>) {
  for (const key of Object.keys(params)) if (!SEARCH_PARAMS.has(key)) throw new BadRequest(`stand-in: unsupported search parameter ${key}`);
  const q = (params.q as string | undefined) ?? "";
  const filter = parseFilter(params.filter);
  const compare = compareBy(params.sort as string[] | undefined);
  const order = [...index.docs.values()];
  let matches = order
    .map((doc, at) => ({ doc, at, score: scoreOf(doc, q, index) }))
    .filter((m): m is { doc: Doc; at: number; score: number } => m.score !== undefined && filter(m.doc))
    .sort((x, y) => compare(x.doc, y.doc) || x.score - y.score || x.at - y.at)
    .map((m) => m.doc);
  const facetDistribution: Record<string, Record<string, number>> = {};
  for (const facet of (params.facets as string[] | undefined) ?? []) {
    const counts: Record<string, number> = {};
    for (const d of matches) for (const v of new Set(valuesOf(d, facet).map(String))) counts[v] = (counts[v] ?? 0) + 1;
    facetDistribution[facet] = counts;
  }
  if (typeof params.distinct === "string") {
    const seen = new Set<string>();
    const attr = params.distinct;
    matches = matches.filter((d) => {
      const key = String(d[attr]);
      return seen.has(key) ? false : (seen.add(key), true);
    });
  }
  const pick = (d: Doc) => {
    const fields = params.attributesToRetrieve as string[] | undefined;
    return fields ? Object.fromEntries(fields.filter((f) => f in d).map((f) => [f, d[f]])) : { ...d };
  };
  const base = { query: q, processingTimeMs: 0, ...(params.facets ? { facetDistribution } : {}) };
  if (params.page !== undefined || params.hitsPerPage !== undefined) {
    const page = Number(params.page ?? 1);
    const hitsPerPage = Number(params.hitsPerPage ?? 20);
    const hits = matches.slice((page - 1) * hitsPerPage, page * hitsPerPage).map(pick);
    return {
      ...base,
      hits,
      page,
      hitsPerPage,
      totalHits: matches.length,
      totalPages: hitsPerPage ? Math.ceil(matches.length / hitsPerPage) : 0,
    };
  }
  const offset = Number(params.offset ?? 0);
  const limit = Number(params.limit ?? 20);
  return { ...base, hits: matches.slice(offset, offset + limit).map(pick), offset, limit, estimatedTotalHits: matches.length };
}

async function readJson(req: IncomingMessage): Promise<unknown> {
  const chunks: Buffer[] = [];
  for await (const c of req) chunks.push(c as Buffer);
  const text = Buffer.concat(chunks).toString("utf8");
  return text ? JSON.parse(text) : undefined;
}

/** Starts the stand-in on 127.0.0.1 at a free port. */
export async function startMeiliStandIn(): Promise<MeiliStandIn> {
  const indexes = new Map<string, Index>();
  const tasks = new Map<number, TaskRecord>();
  const requests: string[] = [];
  const sockets = new Set<Socket>();
  let mode: "up" | "503" | "refused" = "up";

  const task = (indexUid: string | null, type: string, apply: () => Record<string, unknown>) => {
    const uid = tasks.size;
    const now = new Date().toISOString();
    let status: TaskRecord["status"] = "succeeded";
    let error: TaskRecord["error"] = null;
    let details: Record<string, unknown> = {};
    if (standIn.failTasks) {
      status = "failed";
      error = { message: "stand-in: task failed on purpose", code: "internal", type: "internal", link: "" };
    } else details = apply();
    tasks.set(uid, { uid, indexUid, status, type, error, enqueuedAt: now, startedAt: now, finishedAt: now, duration: "PT0S", details });
    return { status: 202, body: { taskUid: uid, indexUid, status: "enqueued", type, enqueuedAt: now } };
  };
  const ensureIndex = (uid: string, primaryKey = "id") => {
    let index = indexes.get(uid);
    if (!index) {
      index = { uid, primaryKey, docs: new Map(), settings: {}, createdAt: new Date().toISOString() };
      indexes.set(uid, index);
    }
    return index;
  };
  const existing = (uid: string) => {
    const index = indexes.get(uid);
    if (!index) throw new BadRequest(`Index \`${uid}\` not found.`, "index_not_found", 404);
    return index;
  };

  async function route(method: string, path: string, body: unknown): Promise<{ status: number; body: unknown }> {
    if (method === "GET" && path === "/health") return { status: 200, body: { status: "available" } };
    let m = /^\/tasks\/(\d+)$/.exec(path);
    if (m && method === "GET") {
      const t = tasks.get(Number(m[1]));
      if (!t) throw new BadRequest(`Task \`${m[1]}\` not found.`, "task_not_found", 404);
      return { status: 200, body: t };
    }
    if (method === "POST" && path === "/indexes") {
      const { uid, primaryKey } = body as { uid: string; primaryKey?: string };
      return task(uid, "indexCreation", () => (ensureIndex(uid, primaryKey), { primaryKey }));
    }
    if (method === "POST" && path === "/multi-search") {
      const { queries } = body as { queries: Record<string, unknown>[] };
      return {
        status: 200,
        body: { results: queries.map((qy) => ({ indexUid: qy.indexUid, ...search(existing(String(qy.indexUid)), qy) })) },
      };
    }
    m = /^\/indexes\/([\w-]+)(\/.*)?$/.exec(path);
    if (!m) throw new BadRequest(`stand-in: no route for ${method} ${path}`, "not_found", 404);
    const [, uid, rest = ""] = m;
    if (method === "GET" && rest === "") {
      const i = existing(uid);
      return { status: 200, body: { uid, primaryKey: i.primaryKey, createdAt: i.createdAt, updatedAt: i.createdAt } };
    }
    if (rest === "/settings" && method === "GET") return { status: 200, body: existing(uid).settings };
    if (rest === "/settings" && method === "PATCH")
      return task(uid, "settingsUpdate", () => (Object.assign(ensureIndex(uid).settings, body as object), {}));
    if (rest === "/documents" && (method === "POST" || method === "PUT")) {
      const docs = body as Doc[];
      return task(uid, "documentAdditionOrUpdate", () => {
        const index = ensureIndex(uid);
        for (const d of docs) {
          const id = String(d[index.primaryKey]);
          index.docs.set(id, { ...(method === "PUT" ? index.docs.get(id) : {}), ...d, id });
        }
        return { receivedDocuments: docs.length, indexedDocuments: docs.length };
      });
    }
    if (rest === "/documents" && method === "DELETE") return task(uid, "documentDeletion", () => (existing(uid).docs.clear(), {}));
    if (rest === "/documents/delete-batch" && method === "POST") {
      const ids = (body as (string | number)[]).map(String);
      return task(uid, "documentDeletion", () => {
        const index = existing(uid);
        return { providedIds: ids.length, deletedDocuments: ids.filter((id) => index.docs.delete(id)).length };
      });
    }
    m = /^\/documents\/([^/]+)$/.exec(rest);
    if (m && method === "GET") {
      const doc = existing(uid).docs.get(decodeURIComponent(m[1]));
      if (!doc) throw new BadRequest(`Document \`${m[1]}\` not found.`, "document_not_found", 404);
      return { status: 200, body: doc };
    }
    if (rest === "/search" && method === "POST") return { status: 200, body: search(existing(uid), body as Record<string, unknown>) };
    throw new BadRequest(`stand-in: no route for ${method} ${path}`, "not_found", 404);
  }

  async function handle(req: IncomingMessage, res: ServerResponse) {
    const path = new URL(req.url ?? "/", "http://stand-in").pathname;
    const method = req.method ?? "GET";
    requests.push(`${method} ${path}`);
    let status = 200;
    let payload: unknown;
    try {
      const body = await readJson(req);
      if (mode === "503") throw new BadRequest("stand-in: service unavailable", "unavailable", 503);
      ({ status, body: payload } = await route(method, path, body));
    } catch (err) {
      const e = err instanceof BadRequest ? err : new BadRequest(String(err), "internal", 500);
      status = e.status;
      payload = { message: e.message, code: e.code, type: status < 500 ? "invalid_request" : "internal", link: "" };
    }
    res.writeHead(status, { "content-type": "application/json" }).end(JSON.stringify(payload));
  }

  let server: Server = createServer(handle);
  const listen = (port: number) =>
    new Promise<number>((resolve, reject) => {
      server = createServer(handle);
      server.on("connection", (s) => {
        sockets.add(s);
        s.on("close", () => sockets.delete(s));
      });
      server.once("error", reject);
      server.listen(port, "127.0.0.1", () => resolve((server.address() as AddressInfo).port));
    });
  const stop = () =>
    new Promise<void>((resolve) => {
      server.close(() => resolve());
      for (const s of sockets) s.destroy();
    });
  const port = await listen(0);

  const standIn: MeiliStandIn = {
    url: `http://127.0.0.1:${port}`,
    port,
    indexes,
    requests,
    failTasks: false,
    async down(how = "refused") {
      if (how === "503") mode = "503";
      else if (mode !== "refused") {
        mode = "refused";
        await stop();
      }
    },
    async up() {
      if (mode === "refused") await listen(port);
      mode = "up";
    },
    async close() {
      if (mode !== "refused") await stop();
    },
  };
  return standIn;
}
