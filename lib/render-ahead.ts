import http from "node:http";
import { listUnkeptPages, UNKEPT_PAGE_KINDS } from "@/db/kept-pages";
import { RENDER_AHEAD_HEADER } from "@/lib/html-cache";
import { KEPT_PAGE_HOURS } from "@/lib/kept-pages";

/**
 * Renders the public pages ahead of their readers: every dataset version, reaction and species page
 * that has no servable gzip copy in the kept pages (lib/kept-pages.ts) — never rendered by this
 * build, or shown data has changed since (its tags moved), or near the end of its lifetime
 * (`RENEW_BEFORE_HOURS` before, so that readers never meet the gap) — is asked for
 * through the front server as an anonymous reader would ask, so that the first reader finds it kept
 * instead of waiting for React to render it (tens of milliseconds alone, seconds behind a queue of
 * others). The front server keeps the answer in the database but not in its memory
 * (lib/html-cache.ts, `RENDER_AHEAD_HEADER`): pages nobody asked for do not push out those readers read.
 *
 * One page at a time, and only while the readers leave the server room (`busy`: no reader's page
 * rendering, fewer than READERS_BUSY_PER_SECOND readers' requests a second): a reader waits for at
 * most one page rendered ahead. Reaction and species pages first (few, and each names many
 * datasets), then dataset versions, newest first. A pass walks each kind once by its id; a page
 * that changes behind the pass is taken by the next pass; with nothing left to render the loop
 * looks again every `idleMs`. A database out of reach pauses it (logged once), it does not stop.
 */

/**
 * Readers' requests a second (of any kind) from which nothing is rendered ahead: under load the renders
 * ahead take a processor that searches and kept pages need (measured with `npm run bench:web`: a
 * search's p95 went from 17 to 87 ms while a pass ran beside 32 connections of searches), while a
 * trickle of requests (a few readers, a crawler, an icon) costs little and must not stop a pass.
 */
export const READERS_BUSY_PER_SECOND = 50;

/** How long before the end of its lifetime (KEPT_PAGE_HOURS) a kept page is rendered again. */
export const RENEW_BEFORE_HOURS = 2;

/** A page to render: its address and the id the pass walks by. */
interface Candidate {
  id: number;
  path: string;
}

/** The next pages of a kind (an index into UNKEPT_PAGE_KINDS) that have no servable kept copy, after `after` in the pass's order. */
export async function listPagesToRenderAhead({
  build,
  kind,
  after = null,
  limit = 100,
  hours = KEPT_PAGE_HOURS,
}: {
  build: string;
  kind: number;
  after?: number | null;
  limit?: number;
  hours?: number;
}): Promise<Candidate[]> {
  return listUnkeptPages({ build, kind: UNKEPT_PAGE_KINDS[kind], after, limit, hours });
}

/** What the loop has done since it started (the benchmark and the start-up banner read it). */
export interface RenderAheadStats {
  /** Pages asked for and answered 200, and the others (a 404 of a page gone meanwhile, a failure). */
  rendered: number;
  failed: number;
  /** Passes that found nothing left to render. */
  idlePasses: number;
  /** Milliseconds spent waiting for the answers (the renders' own time, one at a time). */
  renderMs: number;
  /** When the last pass that rendered something ended (ms since the epoch), or null. */
  lastPassEndedAt: number | null;
}

export interface RenderAheadOptions {
  /** The kept pages' build (lib/kept-pages.ts): pages kept by another build are rendered again. */
  build: string;
  /** Asks the front server for a page as an anonymous reader would; resolves with the answer's status. */
  ask: (path: string) => Promise<number>;
  /** Whether a reader's page is being rendered now: the loop waits until none is. */
  busy: () => boolean;
  /** Pages kept longer ago than this many hours are rendered again (KEPT_PAGE_HOURS − RENEW_BEFORE_HOURS). */
  hours?: number;
  /** Pages listed at once. */
  batch?: number;
  /** How long to wait before looking again when nothing was left to render (or the database was out of reach). */
  idleMs?: number;
  /** How often to look whether the readers' renders ended. */
  quietMs?: number;
  log?: (line: string) => void;
}

/** Resolves after `ms`, or at once when `stopping` is aborted. */
const sleep = (ms: number, stopping: AbortSignal) =>
  new Promise<void>((resolve) => {
    if (stopping.aborted) return resolve();
    const done = () => {
      clearTimeout(timer);
      stopping.removeEventListener("abort", done);
      resolve();
    };
    const timer = setTimeout(done, ms);
    stopping.addEventListener("abort", done, { once: true });
  });

/** Starts the loop; `stop` ends it after the page it is rendering. */
export function startRenderAhead({
  build,
  ask,
  busy,
  hours = KEPT_PAGE_HOURS - RENEW_BEFORE_HOURS,
  batch = 100,
  idleMs = 30_000,
  quietMs = 50,
  log = (line) => console.error(`[pages] ${line}`),
}: RenderAheadOptions): { stop: () => Promise<void>; stats: () => RenderAheadStats } {
  const stats: RenderAheadStats = { rendered: 0, failed: 0, idlePasses: 0, renderMs: 0, lastPassEndedAt: null };
  const stopping = new AbortController();
  let stopped = false;
  let outageLogged = false;
  const pass = async (): Promise<number> => {
    let asked = 0;
    for (let kind = 0; kind < UNKEPT_PAGE_KINDS.length && !stopped; kind++) {
      let after: number | null = null;
      while (!stopped) {
        const pages = await listPagesToRenderAhead({ build, kind, after, limit: batch, hours });
        if (pages.length === 0 || stopped) break;
        for (const page of pages) {
          while (busy() && !stopped) await sleep(quietMs, stopping.signal);
          if (stopped) break;
          const t0 = performance.now();
          const status = await ask(page.path).catch(() => 0);
          stats.renderMs += performance.now() - t0;
          if (status === 200) stats.rendered += 1;
          else stats.failed += 1;
          asked += 1;
        }
        after = pages[pages.length - 1].id;
      }
    }
    return asked;
  };
  const running = (async () => {
    while (!stopped) {
      try {
        const t0 = performance.now();
        const before = { ...stats };
        const asked = await pass();
        outageLogged = false;
        if (asked > 0) {
          stats.lastPassEndedAt = Date.now();
          const failed = stats.failed - before.failed;
          log(
            `rendered ahead ${stats.rendered - before.rendered} page(s) in ${((performance.now() - t0) / 1000).toFixed(0)} s` +
              (failed ? `; ${failed} did not answer 200` : ""),
          );
          continue;
        }
        stats.idlePasses += 1;
      } catch (e) {
        if (stopped) break;
        if (!outageLogged) log(`rendering ahead paused: ${e instanceof Error ? e.message : String(e)}`);
        outageLogged = true;
      }
      await sleep(idleMs, stopping.signal);
    }
  })();
  return {
    stats: () => ({ ...stats }),
    stop: async () => {
      stopped = true;
      stopping.abort();
      await running;
    },
  };
}

/**
 * Asks the front server at host:port for a page, as an anonymous browser would (HTML, gzip), marked
 * with the render-ahead header and key; the answer is read to its end and dropped.
 */
export function askFrontServer({
  host,
  port,
  key,
  publicHost,
  timeoutMs = 60_000,
}: {
  host: string;
  port: number;
  key: string;
  /** The Host a reader's browser sends (APP_URL's). */
  publicHost: string;
  timeoutMs?: number;
}): (path: string) => Promise<number> {
  // A front server listening on every address is reached on loopback.
  const address = host === "0.0.0.0" || host === "::" || host === "" ? "127.0.0.1" : host;
  const agent = new http.Agent({ keepAlive: true, maxSockets: 1 });
  return (path) =>
    new Promise<number>((resolve, reject) => {
      const req = http.get(
        {
          host: address,
          port,
          path,
          agent,
          timeout: timeoutMs,
          headers: { host: publicHost, accept: "text/html", "accept-encoding": "gzip", [RENDER_AHEAD_HEADER]: key },
        },
        (res) => {
          res.resume();
          res.on("end", () => resolve(res.statusCode ?? 0));
          res.on("error", reject);
        },
      );
      req.on("timeout", () => req.destroy(new Error(`no answer for ${path} within ${timeoutMs / 1000} s`)));
      req.on("error", reject);
    });
}
