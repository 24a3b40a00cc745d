import type http from "node:http";

/**
 * At most `max` page renders at once in the process that runs Next (scripts/inner-server.ts); the
 * others wait their turn, first come first served.
 *
 * Why: Node runs one render at a time anyway (one thread); letting 32 interleave gains no
 * throughput but keeps 32 React trees, their data and their half-written HTML in the heap at once
 * (measured with `npm run bench:web`: the inner server's peak memory grew with the number of
 * renders in flight). A few at a time keep the processor busy while one waits for PostgreSQL.
 *
 * What is never held back: anything but a GET or HEAD of a page (API routes, server actions, Next's
 * static files), so an upload, a download or a long export never waits behind renders and never
 * holds a place. A place is given back when the render ends, when the client goes away, or after
 * `holdMs` whichever comes first: a reader on a slow connection, whose page is still being written
 * out, cannot keep others waiting longer than that. A request whose client left while it waited is
 * dropped without rendering.
 */
export interface RenderGateOptions {
  /** Renders at once. */
  max: number;
  /** Longest a single render keeps its place, in milliseconds. */
  holdMs: number;
}

type Handler = (req: http.IncomingMessage, res: http.ServerResponse) => Promise<void>;

/** Paths that are not page renders: API routes, Next's own files (scripts, styles, images, its data). */
const NOT_A_PAGE = /^\/(?:api\/|_next\/)/;

/** Whether a request is a page render that waits for a place. */
export function isGatedRender(req: Pick<http.IncomingMessage, "method" | "url" | "headers">): boolean {
  // A server action is a POST; a Next-Action header on a GET is ignored by Next (the page renders), so not by the gate.
  if (req.method !== "GET" && req.method !== "HEAD") return false;
  const path = (req.url ?? "/").split("?")[0];
  if (NOT_A_PAGE.test(path)) return false;
  // A path ending in a file extension (favicon, robots.txt, sitemaps, feeds) is a file or a route handler.
  return !/\.[a-z0-9]+$/i.test(path);
}

interface Waiter {
  start: () => void;
  gone: boolean;
}

export interface RenderGate {
  (handler: Handler): Handler;
  /** Renders holding a place now, and requests waiting for one. */
  stats(): { active: number; waiting: number };
}

export function createRenderGate({ max, holdMs }: RenderGateOptions): RenderGate {
  if (!Number.isInteger(max) || max < 1) throw new Error(`render gate: max must be a whole number ≥ 1 (got ${max})`);
  let active = 0;
  const queue: Waiter[] = [];

  function next() {
    while (active < max && queue.length) {
      const waiter = queue.shift()!;
      if (waiter.gone) continue;
      active++;
      waiter.start();
    }
  }

  const gate = ((handler: Handler): Handler =>
    async (req, res) => {
      if (!isGatedRender(req)) return handler(req, res);
      if (active >= max) {
        const waiter: Waiter = { start: () => {}, gone: false };
        const started = new Promise<void>((resolve) => (waiter.start = resolve));
        const leave = () => {
          waiter.gone = true;
          waiter.start();
        };
        res.once("close", leave);
        queue.push(waiter);
        await started;
        res.off("close", leave);
        // The client went away while waiting: nothing to render for.
        if (waiter.gone) return;
      } else {
        active++;
      }
      let released = false;
      const release = () => {
        if (released) return;
        released = true;
        clearTimeout(timer);
        res.off("close", release);
        active--;
        next();
      };
      const timer = setTimeout(release, holdMs);
      timer.unref?.();
      res.once("close", release);
      try {
        await handler(req, res);
      } finally {
        release();
      }
    }) as RenderGate;
  gate.stats = () => ({ active, waiting: queue.filter((w) => !w.gone).length });
  return gate;
}
