// Next's production server on the private loopback port behind the front server, in place of
// `next start`: Next's own request handler, reached only through the gate of lib/auth/inner-gate.ts
// (the front server's per-start key, ARRHENIA_EDGE_KEY, or 403), not in proxy.ts: a request the proxy
// runs on has its body buffered whole, so proxy.ts's matcher never takes one with a body (DEVELOPERS.md).
// Started by scripts/serve.ts with the port as argument.
import http from "node:http";
import { INNER_GATE_MARK } from "@/lib/auth/client-address";
import { innerGate, innerGateUpgrade } from "@/lib/auth/inner-gate";
import { createRenderGate } from "@/lib/http/render-gate";
import { renderConcurrency } from "@/lib/config";

const port = Number(process.argv[2]);
const key = process.env.ARRHENIA_EDGE_KEY ?? "";
if (!Number.isInteger(port) || port <= 0 || port > 65535) {
  console.error(`[inner] usage: inner-server.ts PORT (got ${process.argv[2] ?? "nothing"})`);
  process.exit(1);
}
if (key.length < 16) {
  console.error("[inner] ARRHENIA_EDGE_KEY is missing: start the app with scripts/serve.ts (npm start)");
  process.exit(1);
}
// As `next start` does; Next warns about and misbehaves under any other value.
(process.env as Record<string, string>).NODE_ENV = "production";
(globalThis as Record<symbol, unknown>)[INNER_GATE_MARK] = true;

// tsx (the loader this file is started with) turns on Node's source maps for every module: each of
// Next's server chunks would then keep its source map's mappings in memory (tens of MB) and read
// its .map file while loading. `next start` runs without them; so does this server from here on.
process.setSourceMapsEnabled(false);
// Loaded after NODE_ENV is set: Next reads it while loading.
const { default: next } = await import("next");
// Next's own name for its origin: it writes every loopback address as "localhost" in a proxy.ts
// rewrite, and a rewrite to another origin than this one is fetched over HTTP (external), which
// this port's gate refuses. The socket still listens on 127.0.0.1 only (below).
const app = next({ dev: false, dir: process.cwd(), hostname: "localhost", port });
// Renders take turns, a few at a time (lib/http/render-gate.ts). Public pages already rendered for
// anonymous readers are answered by the front server's page cache (lib/html-cache.ts) and never come here.
const renderGate = createRenderGate({ max: renderConcurrency(), holdMs: 2_000 });
const handle = renderGate(app.getRequestHandler());
await app.prepare();
const upgrade = app.getUpgradeHandler();

// As `next start` does: an error Next's handler lets through is a 500, never a crash.
async function serve(req: http.IncomingMessage, res: http.ServerResponse) {
  try {
    await handle(req, res);
  } catch (err) {
    console.error(`[inner] ${req.method} ${req.url?.slice(0, 200)}:`, err);
    if (!res.headersSent) res.writeHead(500, { "content-type": "text/plain" });
    res.end("Internal Server Error");
  }
}

const server = http.createServer(innerGate(key, serve));
server.on(
  "upgrade",
  innerGateUpgrade(key, (req, socket, head) => upgrade(req, socket, head)),
);
await new Promise<void>((resolve, reject) => {
  server.once("error", reject);
  server.listen(port, "127.0.0.1", () => resolve());
});

let closing = false;
function close() {
  if (closing) return;
  closing = true;
  server.close();
  server.closeIdleConnections();
  void app.close().finally(() => process.exit(0));
  setTimeout(() => process.exit(0), 5_000).unref();
}
process.on("SIGTERM", close);
process.on("SIGINT", close);
// The front server (scripts/serve.ts) may end without signalling (a crash): this process must not
// live on as an orphan holding its port. Checked every two seconds.
const front = process.ppid;
setInterval(() => {
  let alive = process.ppid === front;
  try {
    process.kill(front, 0);
  } catch {
    alive = false;
  }
  if (!alive) close();
}, 2_000).unref();
