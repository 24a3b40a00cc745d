import { mayCarrySession } from "@/lib/auth/session-cookie";
import { clientGone, whenAnswerEnds } from "@/lib/http/answer-ends";
import type http from "node:http";
import type { KeptPage, KeptPages } from "@/lib/kept-pages";

/**
 * The rendered HTML of public pages for anonymous readers (and crawlers), kept in the memory of the
 * front server (lib/auth/edge-proxy.ts wraps its passing on to Next with `withHtmlCache`), so that a
 * kept page is answered without reaching Next's thread at all.
 *
 * Every page renders per request because the site header (and a few pages) read the session; for a
 * request that carries no session cookie and no credentials that render is the same for everyone,
 * so its answer can be replayed. What keeps non-public content out:
 * - only GET requests without a session cookie or Authorization header are read from or written to
 *   the cache: a member's request never touches it, so what only members may see (a draft, curator
 *   controls) is never stored;
 * - only a 200 without Set-Cookie is stored (a draft fetched anonymously is a 404: never stored);
 * - only the public page paths below (never an API route, an action or a client navigation's RSC
 *   payload, which Next asks for with the `rsc` header).
 * Freshness: every invalidation of public data (lib/public-cache.ts, after publication, retraction,
 * re-fit, consensus exclusion, in whichever process or script) moves the public pages' mark in the
 * database (db/public-pages-mark.ts), read when a request arrives: an entry is served under the mark
 * it was kept under, or — when what it shows (its tags) is known — while none of its tags moved after
 * that mark, so that a publication elsewhere leaves the other pages in memory (`movedSince`). An
 * invalidation in this process also empties the cache at once, and an
 * entry lives at most `PUBLIC_CACHE_SECONDS`, as the data cache's entries do. A render that was
 * running when the cache was emptied is not stored (it may have read the old data).
 *
 * Behind the memory, the pages most readers arrive at (dataset versions, reactions, species) are kept
 * in the database too (`kept`, lib/kept-pages.ts), by what they show rather than under the one mark:
 * a page missing from memory is read from there before it is rendered, and every page rendered here
 * for such an address is kept there as well.
 */

/**
 * How long a cached entry (here and in the data cache of lib/public-cache.ts) is served when no
 * change invalidates it: a change made by a script with no server to tell (the seed, `npm run refit`)
 * stays unseen this long at most.
 */
export const PUBLIC_CACHE_SECONDS = 60;

/** Public pages whose anonymous render is cached: home, reactions list and pages, species, classes, datasets. */
const CACHED_PATHS = [
  /^\/$/,
  /^\/reactions$/,
  /^\/reactions\/[^/]+$/,
  /^\/species\/[^/]+$/,
  /^\/classes$/,
  /^\/classes\/[^/]+$/,
  /^\/datasets\/\d+$/,
  /^\/datasets\/\d+\/v\d+$/,
];

/** Request headers that make an answer personal or not a plain page (an RSC payload, a server action). */
const BYPASS_HEADERS = [
  "authorization",
  "rsc",
  "next-action",
  "next-router-state-tree",
  "next-router-prefetch",
  "next-router-segment-prefetch",
];

/** The longest Accept or Accept-Encoding a request may carry and still be answered from the cache. */
const MAX_KEYED_HEADER = 256;

/** The request header (with the per-start key) that marks a render ahead of readers (lib/render-ahead.ts). */
export const RENDER_AHEAD_HEADER = "x-arrhenia-render-ahead";

/** Response header saying whether the answer came from memory (`hit`), from the kept pages (`kept`), or was rendered and stored (`miss`). */
export const HTML_CACHE_HEADER = "x-arrhenia-html-cache";

export interface HtmlCacheOptions {
  /** Largest total of stored bodies; the least recently used entries go first. */
  maxBytes: number;
  /** Largest single body stored. */
  maxEntryBytes: number;
  /** How long an entry is served, in milliseconds. */
  ttlMs: number;
  /**
   * The current mark of the public pages' state (db/public-pages-mark.ts), read when a request
   * arrives: an entry is served only under the mark it was kept under. A failed read passes the
   * request on uncached. Without it, only this process's invalidations and the lifetime apply.
   */
  mark?: () => Promise<string>;
  /**
   * The tags moved after a mark, each with its latest move, or null when too many moved to say
   * (db/public-pages-mark.ts readTagMovesSince). With it, a page whose tags are known stays in memory
   * across a move of the mark that touches none of them (a publication elsewhere): it is served while
   * none of its tags moved after the mark it was rendered under. Without it, every move empties it.
   */
  movedSince?: (mark: string) => Promise<Map<string, bigint> | null>;
  /** How long a request waits for the render of the same page already under way (WAIT_FOR_RENDER_MS). */
  waitForRenderMs?: number;
  /** Pages kept in the database by what they show (lib/kept-pages.ts); used only with `mark`. */
  kept?: KeptPages;
  /**
   * The per-start key of the renders ahead of readers (lib/render-ahead.ts): a request carrying it in
   * RENDER_AHEAD_HEADER is rendered (never answered from memory or the kept pages) and its page kept
   * in the database only, not in memory, whose room is for the pages readers read.
   */
  aheadKey?: string;
  now?: () => number;
}

/** How long a request waits for another's render of the same page before it asks for its own. */
export const WAIT_FOR_RENDER_MS = 10_000;

/** Resolves when `work` settles or after `ms`, whichever comes first. */
function waitAtMost(work: Promise<void>, ms: number): Promise<void> {
  let timer: NodeJS.Timeout | undefined;
  return Promise.race([work, new Promise<void>((resolve) => (timer = setTimeout(resolve, ms)))]).finally(() => clearTimeout(timer));
}

interface Entry {
  /** The mark the page's render began under (for a page read from the kept pages, its row's). */
  mark: string;
  /** What the page shows (lib/kept-pages.ts keptPageTags), once known; null: served under its own mark only. */
  tags: readonly string[] | null;
  status: number;
  headers: http.OutgoingHttpHeaders;
  body: Buffer;
  storedAt: number;
  /** What the entry holds in memory, counted against the budget: body, key and headers. */
  size: number;
}

interface Store {
  entries: Map<string, Entry>;
  bytes: number;
  /** Moves on every invalidation; a render that began under an older generation is not stored. */
  generation: number;
  /** Renders under way, by mark and key: a second request for the same page waits for the first. */
  rendering: Map<string, Promise<void>>;
}

// On globalThis: the server script and Next's own bundle of lib/public-cache.ts load this module
// separately, and both must reach the one store of the process.
const STORE = Symbol.for("arrhenia.htmlCache");
function store(): Store {
  const g = globalThis as Record<symbol, Store | undefined>;
  return (g[STORE] ??= { entries: new Map(), bytes: 0, generation: 0, rendering: new Map() });
}

/** Empties the cache (every invalidation of public data). */
export function clearHtmlCache(): void {
  const s = store();
  s.entries.clear();
  s.bytes = 0;
  s.generation += 1;
}

/** The cache key of a request, or null when its answer must be rendered for it alone. */
export function htmlCacheKey(req: Pick<http.IncomingMessage, "method" | "url" | "headers">): string | null {
  if (req.method !== "GET" || !req.url) return null;
  const headers = req.headers;
  if (BYPASS_HEADERS.some((name) => headers[name] !== undefined)) return null;
  // A cookie next-auth may read as a session (lib/auth/session-cookie.ts) bypasses the cache.
  if (mayCarrySession(headers.cookie)) return null;
  // A GET that declares a body, even an empty one, is not a plain page view (proxy.ts's content
  // negotiation passes over it: stored, its HTML would answer a later request for a citation).
  if (headers["content-length"] !== undefined || headers["transfer-encoding"] !== undefined) return null;
  // Headers in the key stay short: a long one would hold memory the byte budget does not see.
  if ((headers.accept?.length ?? 0) > MAX_KEYED_HEADER || (headers["accept-encoding"]?.length ?? 0) > MAX_KEYED_HEADER) return null;
  const q = req.url.indexOf("?");
  const path = q === -1 ? req.url : req.url.slice(0, q);
  if (!CACHED_PATHS.some((re) => re.test(path))) return null;
  if (new URLSearchParams(q === -1 ? "" : req.url.slice(q + 1)).has("_rsc")) return null;
  // The same address answers HTML or a citation format by Accept, and compressed or not.
  return `${req.url}\n${headers.accept ?? ""}\n${headers["accept-encoding"] ?? ""}`;
}

function evict(s: Store, maxBytes: number) {
  for (const [key, entry] of s.entries) {
    if (s.bytes <= maxBytes) break;
    s.entries.delete(key);
    s.bytes -= entry.size;
  }
}

/** Stores a page in memory under `mark`, within the byte budget; answers the entry. */
function remember(s: Store, key: string, mark: string, page: KeptPage, storedAt: number, maxBytes: number): Entry {
  const old = s.entries.get(key);
  if (old) s.bytes -= old.size;
  const tags = page.tags ?? null;
  const size = page.body.length + 2 * key.length + JSON.stringify(page.headers).length * 2 + JSON.stringify(tags).length * 2;
  const entry: Entry = { mark, tags, status: page.status, headers: page.headers, body: page.body, storedAt, size };
  s.entries.set(key, entry);
  s.bytes += size;
  evict(s, maxBytes);
  return entry;
}

const isMark = (m: string) => /^\d+$/.test(m);

/** Whether `entry` may be served under the current `mark`: kept under it, or none of its tags moved since its own. */
async function stillCurrent(entry: Entry, mark: string, movedSince: HtmlCacheOptions["movedSince"]): Promise<boolean> {
  if (entry.mark === mark) return true;
  const tags = entry.tags;
  if (!tags || !movedSince || !isMark(entry.mark) || !isMark(mark)) return false;
  const moves = await movedSince(entry.mark).catch(() => null);
  if (!moves) return false;
  const since = BigInt(entry.mark);
  return tags.every((tag) => (moves.get(tag) ?? 0n) <= since);
}

type Handler = (req: http.IncomingMessage, res: http.ServerResponse) => Promise<void> | void;

/** Seconds a reader (or a crawler) is asked to wait before asking again while the database is out of reach, as the API asks (lib/errors.ts). */
const RETRY_AFTER_SECONDS = 5;

/**
 * While the mark cannot be read (the database out of reach), a page is rendered from what Next's
 * data cache kept, or fails: a failure is then sent as 503 with Retry-After — unavailable for a
 * moment, as the API says it — not as a fault of the page (500), which a crawler may take for a
 * broken address. The page shown is the app's own error page either way.
 */
function answerUnavailableForFailure(res: http.ServerResponse): void {
  const writeHead = res.writeHead.bind(res) as (...args: unknown[]) => http.ServerResponse;
  res.writeHead = ((status: number, ...rest: unknown[]) => {
    if (status !== 500) return writeHead(status, ...rest);
    res.setHeader("retry-after", String(RETRY_AFTER_SECONDS));
    // A reason phrase given with the 500 would name the wrong status.
    return writeHead(503, ...(typeof rest[0] === "string" ? rest.slice(1) : rest));
  }) as typeof res.writeHead;
}

/** A page request (GET or HEAD, not the API's nor Next's files) whose failure says the database is out of reach when it is. */
function mayAnswerUnavailable(req: http.IncomingMessage): boolean {
  if (req.method !== "GET" && req.method !== "HEAD") return false;
  const path = (req.url ?? "/").split("?")[0];
  return !path.startsWith("/api/") && !path.startsWith("/_next/") && path !== "/oai";
}

/** `handle` with the anonymous page cache in front (see the module comment). */
export function withHtmlCache(handle: Handler, options: HtmlCacheOptions): Handler {
  const now = options.now ?? Date.now;
  return async (req, res) => {
    const key = htmlCacheKey(req);
    if (key === null) {
      // Any other page (a member's, /people…) that fails while the database is out of reach is a 503 too.
      if (options.mark && mayAnswerUnavailable(req)) {
        try {
          await options.mark();
        } catch {
          answerUnavailableForFailure(res);
        }
      }
      return handle(req, res);
    }
    let mark = "";
    if (options.mark) {
      try {
        mark = await options.mark();
      } catch {
        answerUnavailableForFailure(res);
        return handle(req, res);
      }
    }
    const s = store();
    const ahead = options.aheadKey !== undefined && req.headers[RENDER_AHEAD_HEADER] === options.aheadKey;
    /** Answers from memory when a page is kept that is current under this request's mark. */
    const served = async (): Promise<boolean> => {
      const hit = s.entries.get(key);
      if (!hit) return false;
      const current = now() - hit.storedAt < options.ttlMs && (await stillCurrent(hit, mark, options.movedSince));
      if (clientGone(req, res)) return true;
      if (!current) {
        if (s.entries.get(key) === hit) {
          s.entries.delete(key);
          s.bytes -= hit.size;
        }
        return false;
      }
      // Least recently used first: a hit moves to the end.
      s.entries.delete(key);
      s.entries.set(key, hit);
      req.resume();
      res.writeHead(hit.status, { ...hit.headers, [HTML_CACHE_HEADER]: "hit", "content-length": hit.body.length });
      res.end(hit.body);
      return true;
    };
    if (!ahead && (await served())) return;
    const generation = s.generation;
    const keptKey = options.kept && options.mark ? options.kept.keyOf(req) : null;
    /** Answers from the kept pages when they hold this page. */
    const servedKept = async (): Promise<boolean> => {
      if (keptKey === null) return false;
      const page = await options.kept!.read(keptKey).catch(() => null);
      if (clientGone(req, res) || (await served())) return true;
      if (!page) return false;
      // Under the mark its render began under, not this request's: a move that took its value before
      // this request read the mark, and committed after the row was read, is still seen later.
      if (s.generation === generation) remember(s, key, page.renderedAt ?? mark, page, now(), options.maxBytes);
      req.resume();
      res.writeHead(page.status, { ...page.headers, [HTML_CACHE_HEADER]: "kept", "content-length": page.body.length });
      res.end(page.body);
      return true;
    };
    if (!ahead && (await servedKept())) return;
    // The same page being rendered for another anonymous reader (a popular page just after a change
    // emptied the cache): wait for that render rather than start another, then take what it kept.
    // The client left while the mark or the kept page was read: nothing to render for, and no slot
    // to register (its "close" has fired already, so the slot would never be given back).
    if (clientGone(req, res)) return;
    const slot = `${mark}\u0000${key}`;
    const underWay = s.rendering.get(slot);
    /** The kept copy being written (the waiting requests read it once written). */
    let keeping: Promise<void> | undefined;
    if (underWay) {
      await waitAtMost(underWay, options.waitForRenderMs ?? WAIT_FOR_RENDER_MS);
      if (clientGone(req, res) || (await served())) return;
      // A render ahead of readers is kept in the database only.
      if (!ahead && (await servedKept())) return;
    } else {
      let finished!: () => void;
      s.rendering.set(slot, new Promise<void>((resolve) => (finished = resolve)));
      // After the answer was stored (at its end) or given up (its client left).
      whenAnswerEnds(req, res, () => {
        void Promise.resolve(keeping).finally(() => {
          s.rendering.delete(slot);
          finished();
        });
      });
    }
    const chunks: Buffer[] = [];
    let size = 0;
    let keep = true;
    const record = (chunk: unknown, encoding?: unknown) => {
      if (!keep || chunk == null || typeof chunk === "function") return;
      const buf =
        typeof chunk === "string"
          ? Buffer.from(chunk, typeof encoding === "string" ? (encoding as BufferEncoding) : "utf8")
          : Buffer.from(chunk as Uint8Array);
      size += buf.length;
      if (size > options.maxEntryBytes) {
        keep = false;
        chunks.length = 0;
      } else chunks.push(buf);
    };
    const write = res.write.bind(res) as (...args: unknown[]) => boolean;
    const end = res.end.bind(res) as (...args: unknown[]) => http.ServerResponse;
    const writeHead = res.writeHead.bind(res) as (...args: unknown[]) => http.ServerResponse;
    res.writeHead = ((...args: unknown[]) => {
      // Headers given to writeHead itself (not set before) are taken into getHeaders() here.
      const headers = args.find((a, i) => i > 0 && a !== null && typeof a === "object");
      if (headers && !Array.isArray(headers) && !res.headersSent) {
        for (const [name, value] of Object.entries(headers as http.OutgoingHttpHeaders))
          if (value !== undefined) res.setHeader(name, value);
        args = args.filter((a) => a !== headers);
      } else if (Array.isArray(headers)) keep = false;
      if (!res.headersSent) res.setHeader(HTML_CACHE_HEADER, "miss");
      return writeHead(...args);
    }) as typeof res.writeHead;
    res.write = ((...args: unknown[]) => {
      record(args[0], args[1]);
      if (!res.headersSent && !res.hasHeader(HTML_CACHE_HEADER)) res.setHeader(HTML_CACHE_HEADER, "miss");
      return write(...args);
    }) as typeof res.write;
    res.end = ((...args: unknown[]) => {
      record(args[0], args[1]);
      if (!res.headersSent && !res.hasHeader(HTML_CACHE_HEADER)) res.setHeader(HTML_CACHE_HEADER, "miss");
      const status = res.statusCode;
      const headers = res.getHeaders();
      const result = end(...args);
      // A reader who left mid-answer may have cut the body short: never stored.
      if (clientGone(req, res)) keep = false;
      // Rendered HTML only: a citation format answered at a page's address (by Accept) is an API answer of its own.
      const html = /^text\/html\b/i.test(String(headers["content-type"] ?? ""));
      if (keep && status === 200 && html && headers["set-cookie"] === undefined && s.generation === generation) {
        const body = Buffer.concat(chunks);
        delete headers[HTML_CACHE_HEADER];
        // Replayed whole with its own length; hop-by-hop framing is the replay's own.
        delete headers["transfer-encoding"];
        delete headers["content-length"];
        delete headers.connection;
        delete headers["keep-alive"];
        // A replay is dated when it is sent (Node adds the Date of each answer); one passed on from Next carries its render's.
        delete headers.date;
        const entry = ahead ? null : remember(s, key, mark, { status, headers, body }, now(), options.maxBytes);
        if (keptKey !== null)
          keeping = options.kept!.keep(keptKey, { status, headers, body }, mark).then((tags) => {
            // Its tags once known: from then on a move of the mark that touches none of them leaves it served.
            if (entry && tags && s.entries.get(key) === entry) {
              entry.tags = tags;
              const grown = JSON.stringify(tags).length * 2 - JSON.stringify(null).length * 2;
              entry.size += grown;
              s.bytes += grown;
              evict(s, options.maxBytes);
            }
          });
      }
      return result;
    }) as typeof res.end;
    return handle(req, res);
  };
}

/** What the cache holds (for the benchmark and tests). */
export function htmlCacheSize(): { entries: number; bytes: number; rendering: number } {
  const s = store();
  return { entries: s.entries.size, bytes: s.bytes, rendering: s.rendering.size };
}
