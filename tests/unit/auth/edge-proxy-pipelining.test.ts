import http from "node:http";
import net from "node:net";
import { afterAll, beforeAll, beforeEach, describe, expect, it } from "vitest";
import { MAX_PIPELINED } from "@/lib/auth/edge-proxy";
import { clearHtmlCache, htmlCacheSize } from "@/lib/html-cache";
import { askFront, startFrontBefore } from "./front-server";

// A client that pipelines requests on one connection and leaves: Node attaches a response to the
// socket only when the one before it has been sent, and when the connection drops only that one
// hears "close" (found by an outside attack: the front server's memory and sockets grew with every
// such client until it ran out of heap). Every request passed on for it must stop, every render
// slot be given back, and one connection may not hold more than MAX_PIPELINED requests.

/** Requests the stand-in for Next holds (answers only when released), and those whose client went. */
const held: (() => void)[] = [];
let reached = 0;
let stopped = 0;

let app: http.Server;
let front: Awaited<ReturnType<typeof startFrontBefore>>;

beforeAll(async () => {
  app = http.createServer((req, res) => {
    reached += 1;
    req.resume();
    res.on("close", () => {
      if (!res.writableFinished) stopped += 1;
    });
    held.push(() => res.writeHead(200, { "content-type": "text/html; charset=utf-8" }).end(`<p>${req.url}</p>`));
  });
  front = await startFrontBefore(app, {
    pageCache: { maxBytes: 1 << 20, maxEntryBytes: 1 << 16, ttlMs: 60_000, mark: async () => "m1" },
  });
});
afterAll(async () => {
  await front.close();
  await new Promise<void>((resolve) => app.close(() => resolve()));
});
beforeEach(() => {
  clearHtmlCache();
  held.length = 0;
  reached = 0;
  stopped = 0;
});

const until = async (check: () => boolean, ms = 3000) => {
  const end = Date.now() + ms;
  while (!check() && Date.now() < end) await new Promise((r) => setTimeout(r, 10));
  expect(check()).toBe(true);
};

/** Opens a connection and writes `paths` as pipelined GETs at once. */
function pipeline(paths: string[]): Promise<net.Socket> {
  return new Promise((resolve) => {
    const socket = net.connect(front.port, "127.0.0.1", () => {
      socket.write(paths.map((p) => `GET ${p} HTTP/1.1\r\nHost: 127.0.0.1\r\n\r\n`).join(""));
      resolve(socket);
    });
    socket.on("error", () => {});
  });
}

describe("pipelined requests of a client that leaves", () => {
  it("stop every request passed on for it, queued answers included, and give every render slot back", async () => {
    const paths = ["/classes/a", "/classes/b", "/classes/c", "/classes/d"];
    const socket = await pipeline(paths);
    await until(() => reached === paths.length);
    expect(htmlCacheSize().rendering).toBe(paths.length);
    socket.destroy();
    // All four requests behind it are stopped, not only the one whose answer was due first.
    await until(() => stopped === paths.length);
    await until(() => htmlCacheSize().rendering === 0);
    // The server still answers.
    held.length = 0;
    const answer = askFront(front.port, "GET", "/classes/after");
    await until(() => held.length === 1);
    held[0]();
    expect((await answer).status).toBe(200);
  });

  it("close a connection that has more than MAX_PIPELINED requests under way, and pass none of the excess on", async () => {
    const paths = Array.from({ length: MAX_PIPELINED + 4 }, (_, i) => `/classes/p${i}`);
    const socket = await pipeline(paths);
    const closed = new Promise<void>((resolve) => socket.on("close", () => resolve()));
    await closed;
    await new Promise((r) => setTimeout(r, 100));
    expect(reached).toBeLessThanOrEqual(MAX_PIPELINED);
    await until(() => stopped === reached);
  });

  it("answer requests pipelined within the limit, in order", async () => {
    const paths = ["/classes/x", "/classes/y", "/classes/z"];
    const socket = await pipeline(paths);
    let text = "";
    socket.on("data", (chunk: Buffer) => (text += chunk.toString()));
    await until(() => held.length === paths.length);
    for (const release of held) release();
    await until(() => (text.match(/HTTP\/1\.1 200/g) ?? []).length === paths.length);
    expect(paths.map((p) => text.indexOf(`<p>${p}</p>`))).toEqual([...paths.map((p) => text.indexOf(`<p>${p}</p>`))].sort((a, b) => a - b));
    socket.destroy();
  });
});
