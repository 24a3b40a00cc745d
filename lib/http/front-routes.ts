/**
 * Public reads the front server (lib/auth/edge-proxy.ts) answers itself, with the same route
 * handler Next would run, instead of passing them on to Next: search (GET /api/v1/search and its
 * suggestions). Next's router, its web-stream plumbing and the second hop cost about 3 ms of Next's
 * one thread per request, more than a kept search answer costs to send; answered here, search runs
 * in the front server's own process (the machine's second core) and never queues behind a page render.
 *
 * Only handlers that ignore the caller (withApi with scope null, no session look-up) and answer the
 * same for everyone are listed; a bearer token is still checked by withApi as in Next. The request
 * carries the headers the proxy would forward (the client's address and the per-start key, which
 * lib/auth/client-address.ts believes). A token holder's budget is counted in PostgreSQL, shared
 * with Next; an anonymous client's is counted in each process's memory (lib/auth/rate-limit.ts),
 * so search has its own API_RATE_LIMIT a minute here, beside the one Next grants the other reads.
 */
import type http from "node:http";
import { clientGone, whenAnswerEnds } from "./answer-ends";
import { promisify } from "node:util";
import { gzip } from "node:zlib";
import Negotiator from "negotiator";
import { assertStorableQuery, problemResponse } from "@/lib/auth/api";
import { databaseUnavailable } from "@/lib/errors";
import { clientAddress } from "@/lib/auth/client-address";
import { apiBudgetHeaders, consumeApiBudget } from "@/lib/auth/rate-limit";
import { bodyBytes, builtFromBytes } from "./byte-body";

/** A route handler as Next calls one: a web Request in, a web Response out. */
export type WebHandler = (request: Request, context: { params: Promise<Record<string, string>> }) => Promise<Response>;

/** Paths answered in the front server, each with the module that exports its GET handler. */
const ROUTES: Record<string, () => Promise<{ GET: WebHandler }>> = {
  "/api/v1/search": once(() => import("@/app/api/v1/search/route") as Promise<{ GET: WebHandler }>),
  "/api/v1/search/suggest": once(() => import("@/app/api/v1/search/suggest/route") as Promise<{ GET: WebHandler }>),
};

/**
 * Kept answers of these paths, by query parameters (null: none kept): sent by the front server
 * without running the route (see `answerKept`).
 */
const KEPT: Record<string, () => Promise<(params: URLSearchParams) => Promise<Uint8Array | null>>> = {
  "/api/v1/search": once(async () => (await import("@/lib/search")).keptSearchAnswerBytes),
};

/** The module loaded at its first request, then kept (each import() would go through the module loader again). */
function once<T>(load: () => Promise<T>): () => Promise<T> {
  let loaded: Promise<T> | null = null;
  return () =>
    (loaded ??= load().catch((err) => {
      loaded = null;
      throw err;
    }));
}

/**
 * Loads every handler answered here and RDKit, which reads SMILES and InChI in search text (the front
 * server does it before it opens, as Next's routes are warmed: loading RDKit at a reader's first SMILES
 * held this thread, and every request it passes on, for a third of a second). A failure is logged, not
 * thrown: the site opens, search answers 500 and loads again at its next request.
 */
export async function loadFrontRoutes(): Promise<void> {
  const loads = [...Object.values(ROUTES).map((load) => load()), import("@/lib/chem").then(({ getRdkit }) => getRdkit())];
  for (const result of await Promise.allSettled(loads))
    if (result.status === "rejected")
      console.error("[front] search could not be loaded; it is tried again at its next request:", result.reason);
}

/** The paths answered here (for tests and DEVELOPERS.md). */
export const FRONT_ROUTE_PATHS = Object.keys(ROUTES);

/** A path answered here: its route handler's module, and its kept answers when it has them. */
export interface FrontRoute {
  path: string;
  load: () => Promise<{ GET: WebHandler }>;
}

/** The route of a GET or HEAD of one of these paths (query string aside), or null: Next answers it. */
export function frontRoute(method: string | undefined, url: string): FrontRoute | null {
  if (method !== "GET" && method !== "HEAD") return null;
  const q = url.indexOf("?");
  // Dot segments resolved as Next resolves them ("/api/v1/./search" is the search too, and is answered
  // here, under this process's budget); a double slash is not (Next redirects it).
  const path = new URL(`http://front.invalid${q === -1 ? url : url.slice(0, q)}`).pathname;
  return Object.hasOwn(ROUTES, path) ? { path, load: ROUTES[path] } : null;
}

/** Bodies at least this long are compressed for a client that accepts gzip (as Next's own server does). */
const COMPRESS_FROM_BYTES = 1024;
const gzipAsync = promisify(gzip);

/**
 * Compressed bodies by the bytes they compress: a kept search answer is the same bytes at every
 * hit (lib/http/byte-body.ts), so it is compressed once while it is kept, not at every request.
 */
const compressed = new WeakMap<Uint8Array, Promise<Buffer>>();
function gzipped(bytes: Uint8Array): Promise<Buffer> {
  let done = compressed.get(bytes);
  if (!done) {
    done = gzipAsync(bytes);
    compressed.set(bytes, done);
    done.catch(() => compressed.delete(bytes));
  }
  return done;
}

/**
 * The headers a route sent with bytes it keeps (a kept search answer), its budget headers aside,
 * by those bytes: what `answerKept` sends with them again. Only while the bytes are kept.
 */
const replayHeaders = new WeakMap<Uint8Array, http.OutgoingHttpHeaders>();

/** The budget headers (lib/auth/rate-limit.ts): counted for each request, never replayed. */
const BUDGET_HEADERS = Object.keys(apiBudgetHeaders({ limit: 0, remaining: 0, resetSeconds: 0, spent: false }));

/** A web Response's headers as Node writes them. */
function headersOf(response: Response): http.OutgoingHttpHeaders {
  const out: http.OutgoingHttpHeaders = {};
  response.headers.forEach((value, name) => {
    out[name] = value;
  });
  return out;
}

/** Counts an anonymous public read against its client's budget, as withApi counts it (in this process's memory). */
function countAnonymousRead(headers: http.OutgoingHttpHeaders) {
  return consumeApiBudget(`address:${clientAddress(headers as Record<string, string | string[] | undefined>)}`, { inProcess: true });
}

/**
 * A kept answer sent without running the route: its web Request and Response, withApi's checks and
 * the validators cost more of this thread than the answer itself (~60 % of a kept search). Only a
 * plain anonymous read (no Authorization, no If-None-Match), of a query the route would accept,
 * whose answer the route has sent before (its headers are replayed, so the answer is the route's
 * own, byte for byte), within the client's budget, counted here as the route counts it. Anything
 * else returns false and takes the route: a spent budget among them (the route counts it once
 * more and answers 429).
 */
async function answerKept(
  route: FrontRoute,
  req: http.IncomingMessage,
  res: http.ServerResponse,
  headers: http.OutgoingHttpHeaders,
): Promise<boolean> {
  const kept = KEPT[route.path];
  if (!kept || req.headers.authorization !== undefined || req.headers["if-none-match"] !== undefined) return false;
  const url = new URL(req.url ?? "/", "http://front.invalid");
  try {
    assertStorableQuery(url);
  } catch {
    return false;
  }
  let bytes: Uint8Array | null;
  try {
    bytes = await (await kept())(url.searchParams);
  } catch (err) {
    // The mark unread, the database out of reach: said here as the route says it (counted, then the
    // 503 problem), rather than by the route after waiting as long again for the same read.
    const unavailable = databaseUnavailable(err);
    if (!unavailable) return false;
    const budget = await countAnonymousRead(headers);
    if (budget.spent) return false;
    console.warn(`[api] ${req.method} ${route.path}: database out of reach`, (err as Error).message);
    const problem = problemResponse(unavailable, route.path);
    await writeAnswer(
      req,
      res,
      problem.status,
      { ...headersOf(problem), ...apiBudgetHeaders(budget) },
      new Uint8Array(await problem.arrayBuffer()),
    );
    return true;
  }
  const replay = bytes && replayHeaders.get(bytes);
  if (!bytes || !replay) return false;
  const budget = await countAnonymousRead(headers);
  if (budget.spent) return false;
  await writeAnswer(req, res, 200, { ...replay, ...apiBudgetHeaders(budget) }, bytes);
  return true;
}

/**
 * Runs the route's GET for the request (or sends its kept answer, `answerKept`) and writes its
 * answer to `res`: status, headers, body (none for HEAD), gzip when the client accepts it.
 * `headers` are the ones the proxy would have forwarded.
 */
export async function answerHere(
  route: FrontRoute,
  req: http.IncomingMessage,
  res: http.ServerResponse,
  { origin, headers }: { origin: string; headers: http.OutgoingHttpHeaders },
): Promise<void> {
  if (await answerKept(route, req, res, headers)) return;
  if (clientGone(req, res)) return;
  const aborted = new AbortController();
  whenAnswerEnds(req, res, () => {
    if (!res.writableFinished) aborted.abort();
  });
  const requestHeaders = new Headers();
  for (const [name, value] of Object.entries(headers)) {
    if (value === undefined) continue;
    if (Array.isArray(value)) for (const v of value) requestHeaders.append(name, v);
    else requestHeaders.set(name, String(value));
  }
  const request = new Request(new URL(req.url ?? "/", origin), { method: "GET", headers: requestHeaders, signal: aborted.signal });
  const { GET } = await route.load();
  const answer = await GET(request, { params: Promise.resolve({}) });
  if (res.destroyed) return;
  const bytes = await bodyBytes(answer);
  const out = headersOf(answer);
  if (KEPT[route.path] && answer.status === 200 && req.headers.authorization === undefined && builtFromBytes(answer) === bytes) {
    const replay = { ...out };
    for (const name of BUDGET_HEADERS) delete replay[name];
    replayHeaders.set(bytes, replay);
  }
  await writeAnswer(req, res, answer.status, out, bytes);
}

/** Writes an answer of the route: Vary, gzip when the client takes it (a weak tag then), its length; no body for HEAD. */
async function writeAnswer(
  req: http.IncomingMessage,
  res: http.ServerResponse,
  status: number,
  out: http.OutgoingHttpHeaders,
  bytes: Uint8Array,
): Promise<void> {
  let body = Buffer.from(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  // Every answer of these addresses may come compressed, a 304 included (RFC 9110 §15.4.5 asks it to say what its 200 would).
  out.vary = out.vary ? `${out.vary}, Accept-Encoding` : "Accept-Encoding";
  const gzipWanted = !out["content-encoding"] && new Negotiator(req).encoding(["gzip", "identity"]) === "gzip";
  if (gzipWanted) {
    // The compressed bytes are not the ones a strong tag names (RFC 9110 §8.8.1): to a client that
    // takes gzip the tag is weak, on its 200s and 304s alike (If-None-Match compares weakly).
    if (typeof out.etag === "string" && !out.etag.startsWith("W/")) out.etag = `W/${out.etag}`;
    if (status === 200 && body.length >= COMPRESS_FROM_BYTES) {
      body = await gzipped(bytes);
      out["content-encoding"] = "gzip";
    }
  }
  // A 304 has no content and states no length (its 200's is not known here; RFC 9110 §8.6).
  if (status !== 304 && status !== 204) out["content-length"] = body.length;
  if (res.destroyed) return;
  res.writeHead(status, out);
  res.end(req.method === "HEAD" ? undefined : body);
}
