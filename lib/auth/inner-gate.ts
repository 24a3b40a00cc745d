// The gate of Next's private loopback port (scripts/inner-server.ts). Any process on this machine
// can reach that port, so a request counts only when it carries the front server's per-start key
// (lib/auth/edge-proxy.ts sets it); anything else is refused before Next sees it, which would
// otherwise bypass every check of the front server. The body is never touched: it streams on.
import { timingSafeEqual } from "node:crypto";
import type http from "node:http";
import type { Duplex } from "node:stream";
import { EDGE_KEY_HEADER } from "./client-address";

/** True when `given` (one header value, exactly) equals `key`, compared in constant time. */
export function carriesEdgeKey(given: string | string[] | undefined, key: string): boolean {
  if (typeof given !== "string" || key === "") return false;
  const a = Buffer.from(given);
  const b = Buffer.from(key);
  // timingSafeEqual needs equal lengths; the length of a random per-start key is no secret.
  return a.length === b.length && timingSafeEqual(a, b);
}

type Handler = (req: http.IncomingMessage, res: http.ServerResponse) => unknown;

/**
 * Wraps Next's request handler: 403 without the key, else the key header is removed (nothing
 * behind the gate needs it, and no page or log can then show it) and the request goes on as is.
 */
export function innerGate(key: string, handle: Handler): Handler {
  if (key.length < 16) throw new Error("the inner server needs the front server's key (ARRHENIA_EDGE_KEY)");
  return (req, res) => {
    if (!carriesEdgeKey(req.headers[EDGE_KEY_HEADER], key)) {
      const body = JSON.stringify({
        type: "about:blank",
        title: "Forbidden",
        status: 403,
        code: "forbidden",
        detail: "This port serves only the front server; use the application's public address.",
      });
      res.writeHead(403, { "content-type": "application/problem+json", "content-length": Buffer.byteLength(body), connection: "close" });
      res.end(body);
      req.resume(); // whatever body was sent is drained, never read into memory
      return;
    }
    delete req.headers[EDGE_KEY_HEADER];
    // rawHeaders too: Next builds some of its views of the request from them.
    for (let i = req.rawHeaders.length - 2; i >= 0; i -= 2) {
      if (req.rawHeaders[i].toLowerCase() === EDGE_KEY_HEADER) req.rawHeaders.splice(i, 2);
    }
    return handle(req, res);
  };
}

/** Upgrades (WebSocket) get the same gate; the production app has none, so a keyless one is just closed. */
export function innerGateUpgrade(key: string, handle: (req: http.IncomingMessage, socket: Duplex, head: Buffer) => unknown) {
  return (req: http.IncomingMessage, socket: Duplex, head: Buffer) => {
    if (!carriesEdgeKey(req.headers[EDGE_KEY_HEADER], key)) {
      socket.end("HTTP/1.1 403 Forbidden\r\nconnection: close\r\ncontent-length: 0\r\n\r\n");
      return;
    }
    delete req.headers[EDGE_KEY_HEADER];
    return handle(req, socket, head);
  };
}
