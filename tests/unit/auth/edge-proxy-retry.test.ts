import http from "node:http";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { startFrontBefore } from "./front-server";

// The front server before a stand-in for Next that, once told to, drops every kept-alive socket
// the moment a second request arrives on it, unanswered: what the front server meets when the
// app's idle timeout closes a socket just as a request is written to it.
let app: http.Server;
let front: { port: number; close: () => Promise<void> };
let dropReused = false;
const served = new WeakMap<object, number>();
const reached: string[] = [];

beforeAll(async () => {
  app = http.createServer((req, res) => {
    const before = served.get(req.socket) ?? 0;
    served.set(req.socket, before + 1);
    reached.push(`${req.method} ${before > 0 ? "reused" : "fresh"}`);
    if (dropReused && before > 0) {
      req.socket.destroy();
      return;
    }
    req.resume();
    req.on("end", () => res.end(`${req.method} ${req.url}`));
  });
  front = await startFrontBefore(app);
});

afterAll(async () => {
  await front.close();
  await new Promise((resolve) => app.close(resolve));
});

/** One request to the front server on a connection of its own; status and body. */
function ask(method: string, path: string, body?: string): Promise<{ status: number; body: string }> {
  return new Promise((resolve, reject) => {
    const req = http.request({ host: "127.0.0.1", port: front.port, method, path, agent: false }, (res) => {
      let text = "";
      res.on("data", (c) => (text += c));
      res.on("end", () => resolve({ status: res.statusCode ?? 0, body: text }));
    });
    req.on("error", reject);
    req.end(body);
  });
}

describe("a kept-alive socket the app closed, at the front server", () => {
  it("a GET that meets it is sent once more on a fresh connection and answered, never a 502", async () => {
    dropReused = false;
    expect((await ask("GET", "/a")).status).toBe(200); // leaves one kept-alive socket with the front server
    dropReused = true;
    reached.length = 0;
    const answer = await ask("GET", "/b");
    expect(answer).toEqual({ status: 200, body: "GET /b" });
    // The reused socket was dropped unanswered, then the second try arrived on a new one.
    expect(reached).toEqual(["GET reused", "GET fresh"]);
  });

  it("a HEAD is retried too", async () => {
    dropReused = false;
    await ask("GET", "/warm");
    dropReused = true;
    reached.length = 0;
    expect((await ask("HEAD", "/c")).status).toBe(200);
    expect(reached).toEqual(["HEAD reused", "HEAD fresh"]);
  });

  it("a POST is never repeated: it is a 502, and reached the app once", async () => {
    dropReused = false;
    await ask("GET", "/warm");
    dropReused = true;
    reached.length = 0;
    const answer = await ask("POST", "/api/v1/thing", "{}");
    expect(answer.status).toBe(502);
    expect(reached).toEqual(["POST reused"]);
  });

  it("a GET is tried at most twice: an app that drops a fresh connection too gives a 502", async () => {
    dropReused = false;
    await ask("GET", "/warm");
    dropReused = true;
    const dropAll = (req: http.IncomingMessage) => req.socket.destroy();
    app.prependListener("request", dropAll);
    reached.length = 0;
    try {
      expect((await ask("GET", "/d")).status).toBe(502);
    } finally {
      app.removeListener("request", dropAll);
    }
    expect(reached).toHaveLength(2);
  });
});
