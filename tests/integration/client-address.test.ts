import http from "node:http";
import type { AddressInfo } from "node:net";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { POST as analyse } from "@/app/api/v1/analyses/route";
import { clientAddress } from "@/lib/auth/client-address";
import { compileTrustProxy, startEdgeProxy } from "@/lib/auth/edge-proxy";
import { authorizeCredentials } from "@/lib/auth/options";
import { uniqueEmail } from "./helpers";

// The front server that scripts/serve.ts puts before Next, in front of a small stand-in for the
// app that answers with what the app's own code makes of each request.
let app: http.Server;
let appPort: number;
const edges: { port: number; close: () => Promise<void> }[] = [];

async function readBody(req: http.IncomingMessage): Promise<string> {
  const chunks: Buffer[] = [];
  for await (const c of req) chunks.push(c as Buffer);
  return Buffer.concat(chunks).toString("utf8");
}

beforeAll(async () => {
  app = http.createServer(async (req, res) => {
    const headers = req.headers as Record<string, string>;
    if (req.url === "/echo") {
      res.setHeader("content-type", "application/json");
      res.end(JSON.stringify({ address: clientAddress(headers), forwardedHost: headers["x-forwarded-host"] ?? null, host: headers.host }));
    } else if (req.url === "/sign-in") {
      const answer = await authorizeCredentials(JSON.parse(await readBody(req)), clientAddress(headers)).then(
        () => "ok",
        (err: Error) => err.message,
      );
      res.end(answer);
    } else if (req.url === "/api/v1/analyses") {
      const web = new Request("http://127.0.0.1/api/v1/analyses", {
        method: "POST",
        headers: new Headers(headers),
        body: await readBody(req),
      });
      const answer = await analyse(web, { params: Promise.resolve({}) });
      res.writeHead(answer.status).end();
    } else {
      await readBody(req).catch(() => ""); // as Next does with an action: the whole body first (the front server may cut it)
      res.writeHead(200).end("reached the app");
    }
  });
  await new Promise<void>((resolve) => app.listen(0, "127.0.0.1", () => resolve()));
  appPort = (app.address() as AddressInfo).port;
});

afterAll(async () => {
  await Promise.all(edges.map((e) => e.close()));
  await new Promise((resolve) => app.close(resolve));
});

const APP_ORIGIN = "https://arrhenia.example";

async function edge(trustProxy: string) {
  const e = await startEdgeProxy({
    host: "127.0.0.1",
    port: 0,
    upstreamPort: appPort,
    trust: compileTrustProxy(trustProxy),
    key: process.env.ARRHENIA_EDGE_KEY!,
    appOrigin: APP_ORIGIN,
  });
  edges.push(e);
  return e.port;
}

/** One request from the loopback address `from` (127.x.y.z: every one is this machine). */
function send(
  port: number,
  from: string,
  {
    method = "GET",
    path = "/echo",
    headers = {},
    body,
  }: { method?: string; path?: string; headers?: Record<string, string>; body?: string },
) {
  return new Promise<{ status: number; text: string }>((resolve, reject) => {
    const req = http.request({ host: "127.0.0.1", port, method, path, headers, localAddress: from }, (res) => {
      let text = "";
      res.on("data", (c) => (text += c));
      res.on("end", () => resolve({ status: res.statusCode ?? 0, text }));
    });
    req.on("error", reject);
    req.end(body);
  });
}

let n = 0;
/** A fresh loopback source address per test, so the limits of one test do not touch another. */
function loopback(): string {
  n++;
  return `127.${10 + Math.floor(Math.random() * 200)}.${n}.${1 + Math.floor(Math.random() * 250)}`;
}

const spoof = () => `203.0.113.${Math.floor(Math.random() * 250)}, 198.51.100.${Math.floor(Math.random() * 250)}`;

describe("client address behind the front server", () => {
  it("without TRUST_PROXY the socket address counts, whatever the forwarding headers say", async () => {
    const port = await edge("");
    const from = loopback();
    const res = await send(port, from, {
      headers: {
        "x-forwarded-for": spoof(),
        "x-real-ip": "203.0.113.7",
        "x-arrhenia-client-address": "203.0.113.8",
        "x-forwarded-host": "evil.example",
      },
    });
    expect(JSON.parse(res.text)).toMatchObject({ address: from, forwardedHost: null });
  });

  it("31 sign-ins from one socket with a new spoofed X-Forwarded-For each are limited after 30", async () => {
    const port = await edge("");
    const from = loopback();
    const answers: string[] = [];
    for (let i = 0; i < 31; i++) {
      const body = JSON.stringify({ email: uniqueEmail("spoof"), password: "a-guessed-password" });
      answers.push(
        (
          await send(port, from, {
            method: "POST",
            path: "/sign-in",
            headers: { "x-forwarded-for": spoof(), "content-type": "application/json" },
            body,
          })
        ).text,
      );
    }
    expect(answers.slice(0, 30).every((a) => /not right/.test(a))).toBe(true);
    expect(answers[30]).toMatch(/Too many failed sign-in attempts from this network/);
  }, 60_000);

  it("analyses from one socket with spoofed X-Forwarded-For get a 429 after 120 a minute", async () => {
    const port = await edge("");
    const from = loopback();
    const body = JSON.stringify({ points: [250, 300, 350].map((T) => ({ T, k: 1e-12 * Math.exp(-1000 / T) })), order: 2 });
    const statuses: number[] = [];
    for (let i = 0; i < 121; i++) {
      statuses.push(
        (
          await send(port, from, {
            method: "POST",
            path: "/api/v1/analyses",
            headers: { "x-forwarded-for": spoof(), "content-type": "application/json" },
            body,
          })
        ).status,
      );
    }
    expect(statuses.slice(0, 120).every((s) => s === 200)).toBe(true);
    expect(statuses[120]).toBe(429);
  }, 60_000);

  it("with TRUST_PROXY=1 the proxy's X-Forwarded-For and X-Forwarded-Host are believed", async () => {
    const port = await edge("1");
    const res = await send(port, loopback(), {
      headers: { "x-forwarded-for": "203.0.113.50, 192.0.2.10", "x-forwarded-host": "arrhenia.example" },
    });
    expect(JSON.parse(res.text)).toMatchObject({ address: "192.0.2.10", forwardedHost: "arrhenia.example" });
  });

  it("with TRUST_PROXY naming other proxies, this socket is not believed", async () => {
    const port = await edge("10.0.0.0/8");
    const from = loopback();
    const res = await send(port, from, { headers: { "x-forwarded-for": "203.0.113.50" } });
    expect(JSON.parse(res.text).address).toBe(from);
  });

  it("a cross-origin server action is a 403, also when X-Forwarded-Host claims the other origin", async () => {
    const port = await edge("");
    const action = { "next-action": "0123456789abcdef", "content-type": "text/plain;charset=UTF-8" };
    const crossSite = await send(port, loopback(), {
      method: "POST",
      path: "/settings",
      headers: { ...action, host: `127.0.0.1:${port}`, origin: "https://evil.example" },
      body: "[]",
    });
    expect(crossSite.status).toBe(403);
    expect(JSON.parse(crossSite.text)).toMatchObject({ status: 403, code: "forbidden" });
    const claimed = await send(port, loopback(), {
      method: "POST",
      path: "/settings",
      headers: { ...action, host: `127.0.0.1:${port}`, origin: "https://evil.example", "x-forwarded-host": "evil.example" },
      body: "[]",
    });
    expect(claimed.status).toBe(403);
    const sameSite = await send(port, loopback(), {
      method: "POST",
      path: "/settings",
      headers: { ...action, host: `127.0.0.1:${port}`, origin: `http://127.0.0.1:${port}` },
      body: "[]",
    });
    expect(sameSite).toEqual({ status: 200, text: "reached the app" });
  });

  it("a server action sent under /api/ is checked for its origin too", async () => {
    const port = await edge("");
    const res = await send(port, loopback(), {
      method: "POST",
      path: "/api/../settings",
      headers: { "next-action": "0123456789abcdef", host: `127.0.0.1:${port}`, origin: "https://evil.example" },
      body: "[]",
    });
    expect(res.status).toBe(403);
  });

  it("a path with a malformed %-escape is a 404, never reaching the app", async () => {
    const port = await edge("");
    for (const path of ["/datasets/%FF", "/datasets/%C0%80", "/datasets/1/v%ED%A0%80", "/datasets/%", "/api/v1/versions/%E0%A4%A"]) {
      const res = await send(port, loopback(), { path });
      expect(res.status, path).toBe(404);
      expect(JSON.parse(res.text)).toMatchObject({ code: "not_found" });
    }
    expect(await send(port, loopback(), { path: "/datasets/%E2%82%AC" })).toEqual({ status: 200, text: "reached the app" });
  });

  it("a server action body over its limit is a 413 as soon as the limit is crossed, declared or chunked", async () => {
    const port = await edge("");
    const action = { "next-action": "0123456789abcdef", host: `127.0.0.1:${port}`, origin: `http://127.0.0.1:${port}` };
    const declared = await send(port, loopback(), {
      method: "POST",
      path: "/forgot-password",
      headers: { ...action, "content-length": String(2 * 1024 * 1024) },
      body: "x".repeat(2 * 1024 * 1024),
    });
    expect(declared.status).toBe(413);
    // Chunked: the front server stops forwarding after 1 MB, whatever the client goes on sending.
    const chunked = await new Promise<number>((resolve, reject) => {
      const req = http.request(
        { host: "127.0.0.1", port, method: "POST", path: "/sign-up", headers: action, localAddress: loopback() },
        (res) => {
          res.resume();
          resolve(res.statusCode ?? 0);
        },
      );
      req.on("error", (err) =>
        (err as NodeJS.ErrnoException).code === "ECONNRESET" || (err as NodeJS.ErrnoException).code === "EPIPE" ? resolve(-1) : reject(err),
      );
      const chunk = "y".repeat(64 * 1024);
      let sent = 0;
      const pump = () => {
        while (sent < 200) {
          sent++;
          if (!req.write(chunk)) return void req.once("drain", pump);
        }
        req.end();
      };
      pump();
    });
    expect(chunked).toBe(413);
    const small = await send(port, loopback(), { method: "POST", path: "/forgot-password", headers: action, body: "[]" });
    expect(small).toEqual({ status: 200, text: "reached the app" });
  });

  it("server actions are accepted from APP_URL's origin only: a forged Host (or X-Forwarded-Host) to match another origin is a 403", async () => {
    for (const trust of ["", "1"]) {
      const port = await edge(trust);
      const action = { "next-action": "0123456789abcdef", "content-type": "text/plain;charset=UTF-8" };
      const forged = await send(port, loopback(), {
        method: "POST",
        path: "/settings",
        headers: { ...action, host: "evil.example", origin: "http://evil.example" },
        body: "[]",
      });
      expect(forged.status, `TRUST_PROXY=${trust}`).toBe(403);
      const forwarded = await send(port, loopback(), {
        method: "POST",
        path: "/settings",
        headers: { ...action, host: "evil.example", origin: "https://evil.example", "x-forwarded-host": "evil.example" },
        body: "[]",
      });
      expect(forwarded.status, `TRUST_PROXY=${trust}`).toBe(403);
      const ours = await send(port, loopback(), {
        method: "POST",
        path: "/settings",
        headers: { ...action, host: `127.0.0.1:${port}`, origin: APP_ORIGIN },
        body: "[]",
      });
      expect(ours).toEqual({ status: 200, text: "reached the app" });
    }
  });

  it("an absolute-form request (GET http://evil.example/ HTTP/1.1) reaches the app as its path, with APP_URL's host", async () => {
    const port = await edge("");
    for (const target of ["http://evil.example/echo", "https://evil.example:8443/echo"]) {
      const res = await send(port, loopback(), { path: target, headers: { host: "evil.example" } });
      expect(res.status, target).toBe(200);
      expect(JSON.parse(res.text), target).toMatchObject({ host: new URL(APP_ORIGIN).host, forwardedHost: null });
    }
    // An ordinary request keeps its Host (Next answers under it; links come from APP_URL).
    const plain = await send(port, loopback(), { path: "/echo", headers: { host: `127.0.0.1:${port}` } });
    expect(JSON.parse(plain.text)).toMatchObject({ host: `127.0.0.1:${port}` });
  });

  it("a server action without Origin is a 403 unless its Referer is on APP_URL's origin", async () => {
    const port = await edge("");
    const action = { "next-action": "0123456789abcdef", "content-type": "text/plain;charset=UTF-8", host: `127.0.0.1:${port}` };
    const bare = await send(port, loopback(), { method: "POST", path: "/settings", headers: action, body: "[]" });
    expect(bare.status).toBe(403);
    const elsewhere = await send(port, loopback(), {
      method: "POST",
      path: "/settings",
      headers: { ...action, referer: "https://evil.example/page" },
      body: "[]",
    });
    expect(elsewhere.status).toBe(403);
    const ours = await send(port, loopback(), {
      method: "POST",
      path: "/settings",
      headers: { ...action, referer: `${APP_ORIGIN}/settings` },
      body: "[]",
    });
    expect(ours).toEqual({ status: 200, text: "reached the app" });
  });

  it("an action body nested past the limit is a 400 before Next decodes it, as text or multipart; files and strings are not counted", async () => {
    const port = await edge("");
    const headers = { "next-action": "0123456789abcdef", host: `127.0.0.1:${port}`, origin: `http://127.0.0.1:${port}` };
    const deep = "[".repeat(100_000);
    const text = await send(port, loopback(), {
      method: "POST",
      path: "/deposits/new",
      headers: { ...headers, "content-type": "text/plain;charset=UTF-8" },
      body: deep,
    });
    expect(text.status).toBe(400);
    expect(JSON.parse(text.text)).toMatchObject({ status: 400, detail: expect.stringMatching(/nested more than 128 levels/) });

    const boundary = "----formdata-arrhenia-test";
    const multipart = (parts: string[]) => parts.map((p) => `--${boundary}\r\n${p}\r\n`).join("") + `--${boundary}--\r\n`;
    const field = (name: string, value: string) => `Content-Disposition: form-data; name="${name}"\r\n\r\n${value}`;
    const file = (name: string, value: string) =>
      `Content-Disposition: form-data; name="${name}"; filename="blob"\r\nContent-Type: application/octet-stream\r\n\r\n${value}`;
    const form = { "content-type": `multipart/form-data; boundary=${boundary}` };
    // With the Next-Action header, and as a form that works without script (no header).
    for (const h of [
      { ...headers, ...form },
      { host: headers.host, origin: headers.origin, ...form },
    ]) {
      const nested = await send(port, loopback(), {
        method: "POST",
        path: "/settings",
        headers: h,
        body: multipart([field("0", '["$K1"]'), field("1_x", deep)]),
      });
      expect(nested.status).toBe(400);
    }
    const inFile = await send(port, loopback(), {
      method: "POST",
      path: "/settings",
      headers: { ...headers, ...form },
      body: multipart([field("0", '["$K1"]'), file("1", deep)]),
    });
    expect(inFile).toEqual({ status: 200, text: "reached the app" });
    // Brackets inside a JSON string (a deposit document sent as text) are data, not nesting.
    const asString = await send(port, loopback(), {
      method: "POST",
      path: "/deposits/new",
      headers: { ...headers, "content-type": "text/plain;charset=UTF-8" },
      body: JSON.stringify([JSON.stringify({ points: deep.length, deep })]),
    });
    expect(asString).toEqual({ status: 200, text: "reached the app" });
  });
});
