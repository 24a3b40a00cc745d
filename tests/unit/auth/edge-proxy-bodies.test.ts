import http from "node:http";
import net from "node:net";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { declaresBody } from "@/lib/auth/edge-proxy";
import { startFrontBefore } from "./front-server";

// The front server before a stand-in for Next that reads every body to its end, as a route
// handler does, and counts the requests that reached it.
const IDLE_MS = 600;
let app: http.Server;
let front: { port: number; close: () => Promise<void> };
let reached = 0;

beforeAll(async () => {
  app = http.createServer((req, res) => {
    reached++;
    let bytes = 0;
    req.on("data", (c: Buffer) => (bytes += c.length));
    req.on("end", () => res.end(JSON.stringify({ bytes })));
  });
  front = await startFrontBefore(app, { bodyIdleTimeoutMs: IDLE_MS });
});

afterAll(async () => {
  await front.close();
  await new Promise((resolve) => app.close(resolve));
});

/** Raw bytes on one connection; what came back, and after how long, once the server closes (or 5 s). */
function raw(bytes: string, { halfClose = false } = {}): Promise<{ answer: string; ms: number }> {
  return new Promise((resolve, reject) => {
    const started = Date.now();
    const socket = net.connect(front.port, "127.0.0.1");
    let answer = "";
    let settled = false;
    const done = () => {
      if (settled) return;
      settled = true;
      socket.destroy();
      resolve({ answer, ms: Date.now() - started });
    };
    socket.on("data", (d) => (answer += d));
    socket.on("end", done);
    socket.on("close", done);
    socket.on("error", reject);
    socket.setTimeout(5000, done);
    socket.write(bytes);
    if (halfClose) socket.end();
  });
}
const statusOf = (answer: string) => Number(/^HTTP\/1\.[01] (\d{3})/.exec(answer)?.[1] ?? 0);

describe("bodies that are not what their headers say, at the front server", () => {
  it.each(["GET", "HEAD"])("a %s declaring a body is a 400 at once and never reaches the app", async (method) => {
    const before = reached;
    const { answer, ms } = await raw(`${method} /x HTTP/1.1\r\nHost: x\r\nContent-Length: 5\r\n\r\n`);
    expect(statusOf(answer)).toBe(400);
    if (method === "GET") expect(answer).toMatch(/A GET request has no body/);
    expect(ms).toBeLessThan(IDLE_MS);
    expect(reached).toBe(before);
    // Chunked too.
    expect(statusOf((await raw(`${method} /x HTTP/1.1\r\nHost: x\r\nTransfer-Encoding: chunked\r\n\r\n`)).answer)).toBe(400);
  });

  it("a GET with Content-Length: 0 is served as usual", async () => {
    const { answer } = await raw(`GET /x HTTP/1.1\r\nHost: x\r\nContent-Length: 0\r\nConnection: close\r\n\r\n`);
    expect(statusOf(answer)).toBe(200);
  });

  it("a POST whose body stops short of its Content-Length is a 408 that says so, soon after the body stalls; never a 502", async () => {
    const { answer, ms } = await raw(`POST /x HTTP/1.1\r\nHost: x\r\nContent-Length: 5\r\n\r\nab`);
    expect(statusOf(answer)).toBe(408);
    expect(answer).toMatch(/shorter than its Content-Length: 2 of 5 bytes arrived/);
    expect(ms).toBeGreaterThanOrEqual(IDLE_MS - 50);
    expect(ms).toBeLessThan(IDLE_MS + 2000);
  });

  it("a POST with no body at all, and a chunked body never ended, get the same answer", async () => {
    expect(statusOf((await raw(`POST /x HTTP/1.1\r\nHost: x\r\nContent-Length: 5\r\n\r\n`)).answer)).toBe(408);
    const chunked = await raw(`POST /x HTTP/1.1\r\nHost: x\r\nTransfer-Encoding: chunked\r\n\r\n3\r\nabc\r\n`);
    expect(statusOf(chunked.answer)).toBe(408);
    expect(chunked.answer).toMatch(/stopped arriving before its end/);
  });

  it("a client that closes its side mid-body is answered 400 at once, as Node's server does", async () => {
    const { answer, ms } = await raw(`POST /x HTTP/1.1\r\nHost: x\r\nContent-Length: 5\r\n\r\nab`, { halfClose: true });
    expect(statusOf(answer)).toBe(400);
    expect(ms).toBeLessThan(IDLE_MS);
  });

  it("a complete body, even one sent slowly in pieces, goes through whole", async () => {
    const socket = net.connect(front.port, "127.0.0.1");
    let answer = "";
    socket.on("data", (d) => (answer += d));
    socket.write(`POST /x HTTP/1.1\r\nHost: x\r\nContent-Length: 6\r\nConnection: close\r\n\r\nabc`);
    await new Promise((r) => setTimeout(r, IDLE_MS / 2));
    socket.write("def");
    await new Promise((r) => socket.on("close", r));
    expect(statusOf(answer)).toBe(200);
    expect(answer).toMatch(/\{"bytes":6\}/);
  });

  it("a form posted to /api/%2e%2e/<page> (Next routes it to the page) gets a page's checks: origin, nesting, size", async () => {
    const path = "/api/%2e%2e/admin/people";
    const form = (origin: string, body: string, length = Buffer.byteLength(body)) =>
      `POST ${path} HTTP/1.1\r\nHost: 127.0.0.1\r\nOrigin: ${origin}\r\nContent-Type: multipart/form-data; boundary=b\r\nContent-Length: ${length}\r\n\r\n${body}`;
    const before = reached;
    const small = `--b\r\nContent-Disposition: form-data; name="0"\r\n\r\n[]\r\n--b--\r\n`;
    expect(statusOf((await raw(form("https://evil.example", small))).answer)).toBe(403);
    const deep = `--b\r\nContent-Disposition: form-data; name="0"\r\n\r\n${"[".repeat(100_000)}${"]".repeat(100_000)}\r\n--b--\r\n`;
    expect(statusOf((await raw(form("http://127.0.0.1", deep))).answer)).toBe(400);
    expect(statusOf((await raw(form("http://127.0.0.1", small, 200 * 1024 * 1024))).answer)).toBe(413);
    expect(reached).toBe(before);
  });

  it("a harvester's form-encoded POST to /oai from another origin reaches the app; a page posted from there is refused", async () => {
    const body = "verb=Identify";
    const post = (path: string) =>
      `POST ${path} HTTP/1.1\r\nHost: 127.0.0.1\r\nOrigin: https://harvester.example\r\nContent-Type: application/x-www-form-urlencoded\r\nContent-Length: ${body.length}\r\nConnection: close\r\n\r\n${body}`;
    const before = reached;
    const { answer } = await raw(post("/oai"));
    expect(statusOf(answer)).toBe(200);
    expect(answer).toMatch(/\{"bytes":13\}/);
    expect(reached).toBe(before + 1);
    expect(statusOf((await raw(post("/settings"))).answer)).toBe(403);
    expect(reached).toBe(before + 1);
  });

  it("declaresBody", () => {
    expect(declaresBody({ "content-length": "5" })).toBe(true);
    expect(declaresBody({ "content-length": "0" })).toBe(false);
    expect(declaresBody({ "transfer-encoding": "chunked" })).toBe(true);
    expect(declaresBody({})).toBe(false);
  });
});
