// The public face of `npm start`: a small HTTP server in front of Next (scripts/inner-server.ts) that decides the
// client's address from the socket (believing X-Forwarded-For only from proxies TRUST_PROXY
// names), strips forwarding headers nobody trusted set, and refuses before they reach Next: form
// posts (server actions) from another origin than APP_URL's (403), action bodies over their size
// (413) or nested past what Next's decoder survives (400), and undecodable paths (404).
import http from "node:http";
import { isIP, type AddressInfo, type Socket } from "node:net";
import proxyaddr from "proxy-addr";
import { ActionBodyGuard, isActionRequest, isApiPath, pagePath } from "./action-body-guard";
import { CLIENT_ADDRESS_HEADER, EDGE_KEY_HEADER, UNKNOWN_ADDRESS } from "./client-address";
import { answerHere, frontRoute } from "@/lib/http/front-routes";
import { varyOfAnswer } from "@/lib/http/content-negotiation";
import { RENDER_AHEAD_HEADER, withHtmlCache, type HtmlCacheOptions } from "@/lib/html-cache";
import { isGatedRender } from "@/lib/http/render-gate";
import { clientGone, whenAnswerEnds } from "@/lib/http/answer-ends";

export type TrustProxy = (address: string, hop: number) => boolean;

/** Parses TRUST_PROXY: "" trusts nobody, "2" trusts two hops, else a list of addresses / CIDRs. */
export function compileTrustProxy(value: string): TrustProxy {
  const v = value.trim();
  if (v === "" || v === "0" || v === "false") return () => false;
  if (/^\d+$/.test(v)) {
    const hops = Number(v);
    return (_address, hop) => hop < hops;
  }
  const list = v
    .split(",")
    .map((s) => s.trim())
    .filter(Boolean);
  try {
    return proxyaddr.compile(list);
  } catch (err) {
    throw new Error(`TRUST_PROXY: ${(err as Error).message} (expected a hop count or addresses / CIDR ranges, comma-separated)`);
  }
}

/** IPv4 peers on a dual-stack socket appear as ::ffff:a.b.c.d; count them as a.b.c.d. */
function plainAddress(address: string): string {
  return address.startsWith("::ffff:") && address.includes(".") ? address.slice(7) : address;
}

const STRIPPED_ALWAYS = [CLIENT_ADDRESS_HEADER, EDGE_KEY_HEADER, "forwarded", "x-real-ip"];
const STRIPPED_UNTRUSTED = ["x-forwarded-host", "x-forwarded-proto", "x-forwarded-port"];

/** localhost, 127.0.0.0/8, ::1 (IPv4-mapped too). */
export function isLoopbackHost(hostname: string): boolean {
  const h = hostname.replace(/^\[|\]$/g, "").toLowerCase();
  if (h === "localhost" || h.endsWith(".localhost")) return true;
  const plain = plainAddress(h);
  if (isIP(plain) === 4) return plain.startsWith("127.");
  return plain === "::1";
}

/**
 * A state-changing request to a page (a server action or form post) from another origin than the
 * app's own (APP_URL). Host and X-Forwarded-Host are never the reference: a client chooses them.
 * One exception keeps development and tests working: a browser on this machine that reached the
 * front server directly on a loopback address (socket, Origin and Host all loopback and equal).
 */
export function isCrossOriginPagePost(
  method: string | undefined,
  url: string | undefined,
  headers: http.IncomingHttpHeaders,
  { appOrigin, peerAddress, ownPort }: { appOrigin: string; peerAddress: string | undefined; ownPort?: number },
): boolean {
  if (!method || ["GET", "HEAD", "OPTIONS"].includes(method)) return false;
  // The REST API and next-auth's endpoints authenticate (bearer tokens, CSRF tokens) on their own,
  // and /oai is public and read-only; a server action is checked whatever path it is sent to.
  if (isApiPath(url) && headers["next-action"] === undefined) return false;
  // Browsers send Origin with every POST; a server action without it (and without a same-origin
  // Referer) proves nothing about where it came from.
  const claimed = headers.origin ?? originOf(headers.referer);
  if (claimed === undefined) return isActionRequest(method, url, headers);
  let parsed: URL;
  try {
    parsed = new URL(claimed);
  } catch {
    return true; // "null" or garbage: an opaque origin is never ours
  }
  if (parsed.origin === appOrigin) return false;
  // The front server's own loopback address (its port), never the Host header the client chose.
  const direct =
    ownPort !== undefined &&
    parsed.protocol === "http:" &&
    isLoopbackHost(parsed.hostname) &&
    Number(parsed.port || 80) === ownPort &&
    isLoopbackHost(peerAddress ?? "");
  return !direct;
}

/** The origin of a Referer header, undefined when there is none or it is not a URL. */
function originOf(referer: string | undefined): string | undefined {
  if (!referer) return undefined;
  try {
    return new URL(referer).origin;
  } catch {
    return undefined;
  }
}

/**
 * The request target as Next may see it: always origin-form. An absolute-form target
 * (`GET http://evil.example/ HTTP/1.1`, RFC 9112 §3.2.2) becomes its path and query, and the Host
 * sent on is APP_URL's, so nothing Next builds from the request (redirects, links) names a host
 * the client chose. Null when the target is neither form (refused as a bad request).
 */
export function originFormTarget(url: string | undefined): string | null {
  const target = url ?? "/";
  if (target.startsWith("/")) return target;
  if (!/^https?:\/\//i.test(target)) return null;
  try {
    const parsed = new URL(target);
    return parsed.pathname + parsed.search;
  } catch {
    return null;
  }
}

/** Largest server-action body, bytes: the deposit editor sends whole documents, every other action a form. */
export function actionBodyLimit(url: string | undefined): number {
  return pagePath(url).startsWith("/deposits") ? 32 * 1024 * 1024 : 1024 * 1024;
}

/** A path Next.js cannot decode (bad percent-encoding) is answered here, as not found. */
export function hasUndecodablePath(url: string | undefined): boolean {
  const path = (url ?? "/").split("?")[0];
  try {
    decodeURIComponent(path);
    return false;
  } catch {
    return true;
  }
}

/** Ends the connection once the answer is out: what the client still sends of its body is never read. */
function closeAfterAnswer(req: http.IncomingMessage, res: http.ServerResponse) {
  const drop = () => req.socket.destroy();
  if (res.writableFinished) drop();
  else res.once("finish", drop);
}

function refuse(res: http.ServerResponse, status: number, code: string, title: string, detail: string) {
  res.writeHead(status, { "content-type": "application/problem+json", connection: "close" });
  res.end(JSON.stringify({ type: "about:blank", title, status, code, detail }));
}

/**
 * How long a request body may stall (no byte arriving) before the front server answers 408 and
 * closes: a client that declares more bytes than it sends would otherwise hold a request, and
 * Next's handler behind it, open until Node's five-minute request timeout.
 */
export const BODY_IDLE_TIMEOUT_MS = 10_000;

/** How a socket the other side closed while idle fails the next request written to it. */
export function isStaleSocketError(err: NodeJS.ErrnoException): boolean {
  return err.code === "ECONNRESET" || err.code === "EPIPE" || err.code === "ECONNABORTED";
}

/** GET and HEAD carry no content (RFC 9110 §9.3.1–2); a declared body there is refused, never forwarded. */
const BODYLESS_METHODS = new Set(["GET", "HEAD"]);

/** True when the headers announce content: a Content-Length above 0, or any Transfer-Encoding. */
export function declaresBody(headers: http.IncomingHttpHeaders): boolean {
  const length = headers["content-length"];
  return (length !== undefined && Number(length) !== 0) || headers["transfer-encoding"] !== undefined;
}

/** The Connection header and the headers it lists (Transfer-Encoding kept: the body is sent on as it came). */
function hopByHop(connection: string | undefined): string[] {
  const named = (connection ?? "")
    .split(",")
    .map((s) => s.trim().toLowerCase())
    .filter((s) => s && s !== "transfer-encoding" && s !== "content-length");
  return ["connection", "keep-alive", ...named];
}

/** Rewrites the incoming headers for the app behind; exported for tests. */
export function forwardedHeaders(req: http.IncomingMessage, trust: TrustProxy, key: string): http.OutgoingHttpHeaders {
  const headers: http.OutgoingHttpHeaders = { ...req.headers };
  for (const name of STRIPPED_ALWAYS) delete headers[name];
  // Connection and what it names concern the client's hop only (RFC 9110 §7.6.1): the connection to
  // the app stays kept alive whatever the client asked of its own.
  for (const name of hopByHop(req.headers.connection)) delete headers[name];
  if (!trust(req.socket.remoteAddress ?? "", 0)) for (const name of STRIPPED_UNTRUSTED) delete headers[name];
  // No socket address at all (a socket reset under the request): the one unknown client, never a crash, and
  // never a trusted hop whose X-Forwarded-For would then be believed.
  const peer: string | undefined = req.socket.remoteAddress ? proxyaddr(req, trust) : undefined;
  const address = peer ? plainAddress(peer) : UNKNOWN_ADDRESS;
  headers["x-forwarded-for"] = address;
  headers[CLIENT_ADDRESS_HEADER] = address;
  headers[EDGE_KEY_HEADER] = key;
  return headers;
}

/** Events counted over about the last second, in four buckets of 250 ms. */
class RecentCount {
  private buckets = [0, 0, 0, 0];
  private at = 0;
  private roll() {
    const now = Math.floor(performance.now() / 250);
    if (now - this.at >= 4) this.buckets.fill(0);
    else for (let b = this.at + 1; b <= now; b++) this.buckets[b % 4] = 0;
    this.at = Math.max(this.at, now);
    return now;
  }
  add() {
    this.buckets[this.roll() % 4] += 1;
  }
  count() {
    this.roll();
    return this.buckets.reduce((a, b) => a + b, 0);
  }
}

/** How long a reader's page request counts as a render under way at most (Next's render gate gives a place back after 2 s). */
const RENDER_COUNTED_MS = 10_000;

/**
 * Requests one connection may have under way at once. Browsers send one at a time; a client that
 * pipelines more (each is passed on to Next at once, and its answer waits in memory for its turn) has
 * its connection closed, so that no connection holds more than a few renders and answers.
 */
export const MAX_PIPELINED = 8;

/** Connections to Next at once: more requests wait for one (Next renders one page at a time anyway). */
export const MAX_APP_SOCKETS = 128;

export async function startEdgeProxy({
  host,
  port,
  upstreamPort,
  trust,
  key,
  appOrigin,
  bodyIdleTimeoutMs = BODY_IDLE_TIMEOUT_MS,
  answersHere = false,
  pageCache,
  renderCountedMs = RENDER_COUNTED_MS,
}: {
  host: string;
  port: number;
  upstreamPort: number;
  trust: TrustProxy;
  key: string;
  /** The origin of APP_URL: the one origin server actions are accepted from. */
  appOrigin: string;
  bodyIdleTimeoutMs?: number;
  /** Answer the public reads of lib/http/front-routes.ts (search) in this process instead of passing them on to the app. */
  answersHere?: boolean;
  /** Keep public pages rendered for anonymous readers in this process (lib/html-cache.ts) and answer them from here. */
  pageCache?: HtmlCacheOptions;
  /** How long a reader's page request counts in `readers().rendering` at most (RENDER_COUNTED_MS). */
  renderCountedMs?: number;
}) {
  const agent = new http.Agent({ keepAlive: true, maxSockets: MAX_APP_SOCKETS });
  // One connection per request: the second try of a GET whose kept-alive socket the app had closed.
  const freshAgent = new http.Agent({ keepAlive: false, maxSockets: MAX_APP_SOCKETS });
  /** Requests under way per client connection (MAX_PIPELINED). */
  const underWay = new WeakMap<Socket, number>();
  const ownOrigin = new URL(appOrigin).origin;
  const ownHost = new URL(appOrigin).host;
  // What passOn needs of a request that goes through the page cache first.
  const passing = new WeakMap<http.IncomingMessage, { headers: http.OutgoingHttpHeaders; action: boolean }>();
  /** Readers' page requests passed on to Next and not yet answered, and readers' requests of the last second (lib/render-ahead.ts waits while either is high). */
  let readersRendering = 0;
  const readerRate = new RecentCount();
  const isAhead = (req: http.IncomingMessage) =>
    pageCache?.aheadKey !== undefined && req.headers[RENDER_AHEAD_HEADER] === pageCache.aheadKey;
  const cachedPassOn = pageCache ? withHtmlCache((req, res) => passOn(req, res, passing.get(req)!), pageCache) : null;
  /** A request whose handling threw (or rejected): a 500 if nothing was sent yet, else the connection is cut. */
  const failed = (req: http.IncomingMessage, res: http.ServerResponse, err: unknown) => {
    console.error(`[front] ${req.method} ${req.url?.slice(0, 200)}:`, err);
    if (!res.headersSent && !res.destroyed) refuse(res, 500, "internal", "Internal server error", "The request could not be answered.");
    else res.destroy();
  };
  const server = http.createServer((req, res) => {
    // Nothing thrown while a request is handled may end the server (an exception in a request listener would).
    try {
      handleRequest(req, res);
    } catch (err) {
      failed(req, res, err);
    }
  });
  const handleRequest = (req: http.IncomingMessage, res: http.ServerResponse) => {
    if (!isAhead(req)) readerRate.add();
    // A client whose connection is already gone (reset before its request was read) has no address and wants no answer.
    if (req.socket.remoteAddress === undefined) {
      req.socket.destroy();
      return;
    }
    const socket = req.socket;
    const count = (underWay.get(socket) ?? 0) + 1;
    if (count > MAX_PIPELINED) {
      socket.destroy();
      return;
    }
    underWay.set(socket, count);
    whenAnswerEnds(req, res, () => underWay.set(socket, (underWay.get(socket) ?? 1) - 1));
    const target = originFormTarget(req.url);
    if (target === null) {
      refuse(res, 400, "bad_request", "Bad request", "The request target must be a path (or an http URL).");
      closeAfterAnswer(req, res);
      return;
    }
    const absoluteForm = target !== req.url;
    req.url = target;
    const headers = forwardedHeaders(req, trust, key);
    // A client that named a host in the target chose it: Next hears APP_URL's host instead.
    if (absoluteForm) headers.host = ownHost;
    const ownPort = (req.socket.localPort ?? undefined) as number | undefined;
    if (isCrossOriginPagePost(req.method, req.url, req.headers, { appOrigin: ownOrigin, peerAddress: req.socket.remoteAddress, ownPort })) {
      refuse(res, 403, "forbidden", "Forbidden", "This form was sent from another site, or without saying where from.");
      req.resume();
      return;
    }
    const action = isActionRequest(req.method, req.url, req.headers);
    // Next compares an action's Origin with the host it is told; tell it the host just approved.
    if (action) headers["x-forwarded-host"] = new URL(req.headers.origin ?? originOf(req.headers.referer) ?? ownOrigin).host;
    if (hasUndecodablePath(req.url)) {
      refuse(res, 404, "not_found", "Not found", "This address has a malformed %-escape.");
      req.resume();
      return;
    }
    if (BODYLESS_METHODS.has(req.method ?? "") && declaresBody(req.headers)) {
      refuse(res, 400, "bad_request", "Bad request", `A ${req.method} request has no body; this one declares one.`);
      closeAfterAnswer(req, res);
      return;
    }
    const here = answersHere ? frontRoute(req.method, req.url) : null;
    if (here) {
      answerHere(here, req, res, { origin: ownOrigin, headers }).catch((err: unknown) => failed(req, res, err));
      req.resume();
      return;
    }
    if (cachedPassOn) {
      passing.set(req, { headers, action });
      Promise.resolve(cachedPassOn(req, res)).catch((err: unknown) => failed(req, res, err));
      return;
    }
    passOn(req, res, { headers, action });
  };
  /** Passes the request on to Next and its answer back to the client. */
  const passOn = (
    req: http.IncomingMessage,
    res: http.ServerResponse,
    { headers, action }: { headers: http.OutgoingHttpHeaders; action: boolean },
  ) => {
    // A reader's page on its way to Next (not one rendered ahead of readers): the renders ahead wait for it.
    // A client that left while the front server read the database (the page cache's mark) wants nothing rendered.
    if (clientGone(req, res)) {
      req.resume();
      return;
    }
    // Counted until its answer ends, or RENDER_COUNTED_MS at most: a reader who never reads the answer holds nothing back.
    if (isGatedRender(req) && !isAhead(req)) {
      readersRendering += 1;
      let counted = true;
      const done = () => {
        if (!counted) return;
        counted = false;
        readersRendering -= 1;
        clearTimeout(timer);
      };
      const timer = setTimeout(done, renderCountedMs);
      timer.unref();
      whenAnswerEnds(req, res, done);
    }
    // Server actions: Next reads the whole body before any code of ours runs, so it is capped here.
    const limit = action ? actionBodyLimit(req.url) : Infinity;
    const tooLarge = () => refuse(res, 413, "payload_too_large", "Payload too large", `A form may send at most ${limit / 1024 / 1024} MB.`);
    if (Number(req.headers["content-length"] ?? 0) > limit) {
      tooLarge();
      req.destroy();
      return;
    }
    // The app behind may close a kept-alive socket just as a request is written to it (its idle
    // timeout); a GET or HEAD that met such a socket (reused, nothing answered yet) is sent once more
    // on a fresh connection, since repeating it changes nothing (RFC 9110 §9.2.2). Anything else is a 502.
    const retryable = BODYLESS_METHODS.has(req.method ?? "");
    const send = (fresh: boolean): http.ClientRequest => {
      const sent = http.request(
        { host: "127.0.0.1", port: upstreamPort, method: req.method, path: req.url, headers, agent: fresh ? freshAgent : agent },
        (answer) => {
          // The app's Connection and Keep-Alive describe the inner hop; the client's own is Node's to answer.
          const answerHeaders = { ...answer.headers };
          for (const name of hopByHop(answer.headers.connection)) delete answerHeaders[name];
          const vary = varyOfAnswer(req.method, req.url, answerHeaders.vary);
          if (vary !== undefined) answerHeaders.vary = vary;
          res.writeHead(answer.statusCode ?? 502, answerHeaders);
          answer.pipe(res);
        },
      );
      sent.on("error", (err: NodeJS.ErrnoException) => {
        if (res.writableEnded) return; // already answered (e.g. 413)
        if (clientGone(req, res)) return; // the client went away first (and we stopped the request behind it)
        if (!fresh && retryable && sent.reusedSocket && !res.headersSent && isStaleSocketError(err)) {
          upstream = send(true);
          upstream.end();
          return;
        }
        if (!res.headersSent)
          console.error(`[front] ${req.method} ${req.url?.slice(0, 200)}: the app did not answer (${err.code ?? err.message})`);
        if (!res.headersSent) res.writeHead(502, { "content-type": "text/plain" }).end("The application is starting or unavailable.");
        else res.destroy();
      });
      return sent;
    };
    let upstream = send(false);
    // A client that goes away stops the work behind it too (one whose pipelined request waited its turn as well).
    whenAnswerEnds(req, res, () => {
      clearTimeout(idle);
      if (!res.writableFinished) upstream.destroy();
    });
    // A body that stops arriving (fewer bytes than Content-Length, a chunked body never ended) is
    // answered 408 here, and the request behind is stopped, rather than left waiting on both sides.
    let idle: NodeJS.Timeout | undefined;
    const stalled = () => {
      // Paused by backpressure (the app reads slowly): the client is not the one stalling.
      if (req.isPaused() || req.readableFlowing === false) return void (idle = setTimeout(stalled, bodyIdleTimeoutMs));
      upstream.destroy();
      req.unpipe();
      if (!res.headersSent) {
        const declared = req.headers["content-length"];
        refuse(
          res,
          408,
          "request_timeout",
          "Request timeout",
          declared !== undefined
            ? `The body is shorter than its Content-Length: ${arrived} of ${declared} bytes arrived, then nothing for ${bodyIdleTimeoutMs / 1000} s.`
            : `The body stopped arriving before its end: nothing for ${bodyIdleTimeoutMs / 1000} s after ${arrived} bytes.`,
        );
      }
      closeAfterAnswer(req, res);
    };
    let arrived = 0;
    const watchBody = (chunk?: Buffer) => {
      arrived += chunk?.length ?? 0;
      clearTimeout(idle);
      if (!req.complete) idle = setTimeout(stalled, bodyIdleTimeoutMs);
    };
    if (declaresBody(req.headers)) {
      watchBody(undefined);
      req.on("data", watchBody);
      req.on("end", () => clearTimeout(idle));
    }
    if (limit === Infinity) {
      // A GET or HEAD has no body (one that declared one was refused above): sent at once, so a second try needs nothing of it.
      if (retryable) {
        upstream.end();
        req.resume();
      } else req.pipe(upstream);
      return;
    }
    let received = 0;
    const guard = new ActionBodyGuard(req.headers["content-type"]);
    const stopForwarding = () => {
      upstream.destroy();
      req.unpipe();
      req.removeAllListeners("data");
      req.resume();
    };
    req.on("data", (chunk: Buffer) => {
      received += chunk.length;
      if (received > limit) {
        if (!res.headersSent) tooLarge();
        stopForwarding();
        return;
      }
      // Scanned before it is forwarded: a refused body never reaches Next's decoder whole.
      const problem = guard.write(chunk);
      if (problem) {
        if (!res.headersSent) refuse(res, 400, "bad_request", "Bad request", problem);
        stopForwarding();
        return;
      }
      if (!upstream.write(chunk)) req.pause();
    });
    upstream.on("drain", () => req.resume());
    req.on("end", () => upstream.end());
  };
  await new Promise<void>((resolve, reject) => {
    server.once("error", reject);
    server.listen(port, host, () => resolve());
  });
  const bound = server.address() as AddressInfo;
  return {
    port: bound.port,
    /** Readers' pages being rendered by Next now, and readers' requests (of any kind) in about the last second. */
    readers: () => ({ rendering: readersRendering, perSecond: readerRate.count() }),
    close: () =>
      new Promise<void>((resolve) => {
        agent.destroy();
        freshAgent.destroy();
        server.close(() => resolve());
        server.closeAllConnections();
      }),
  };
}

/** A free loopback port for the app behind the front server. */
export async function freeLoopbackPort(): Promise<number> {
  const probe = http.createServer();
  await new Promise<void>((resolve) => probe.listen(0, "127.0.0.1", () => resolve()));
  const { port } = probe.address() as AddressInfo;
  await new Promise<void>((resolve) => probe.close(() => resolve()));
  return port;
}
