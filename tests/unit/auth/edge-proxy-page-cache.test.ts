import http from "node:http";
import { afterAll, beforeAll, beforeEach, describe, expect, it } from "vitest";
import net from "node:net";
import { clearHtmlCache, HTML_CACHE_HEADER, htmlCacheSize, RENDER_AHEAD_HEADER } from "@/lib/html-cache";
import { startFrontBefore } from "./front-server";

// The front server's page cache (lib/html-cache.ts through lib/auth/edge-proxy.ts `pageCache`) before a
// stand-in for Next that counts its renders: what is answered without reaching it, and when it is reached again.
let renders = 0;
let mark = "m1";
let markFails = false;
/** How long reading the mark takes (a client may leave meanwhile). */
let markDelayMs = 0;
const reached: string[] = [];

let app: http.Server;
let front: Awaited<ReturnType<typeof startFrontBefore>>;
/** Pages that answer only when released (to see what is counted while they render). */
const held = new Map<string, () => void>();

beforeAll(async () => {
  app = http.createServer((req, res) => {
    reached.push(`${req.method} ${req.url}`);
    renders += 1;
    req.resume();
    req.on("end", () => {
      if (req.url?.startsWith("/classes/held")) {
        held.set(req.url, () => res.writeHead(200, { "content-type": "text/html; charset=utf-8" }).end("<p>held</p>"));
        return;
      }
      if (req.url?.split("?")[0] === "/classes/failing") {
        // As Next answers a page whose data it could not read and had not kept.
        res.statusCode = 500;
        res.setHeader("content-type", "text/html; charset=utf-8");
        res.end("<h1>Something went wrong</h1>");
        return;
      }
      if (req.url === "/datasets/9/v1") {
        res.writeHead(404, { "content-type": "text/html" });
        res.end("<h1>Not found</h1>");
        return;
      }
      // An old date, as a render passed on from the app carries its own.
      res.writeHead(200, { "content-type": "text/html; charset=utf-8", date: "Mon, 01 Jan 2024 00:00:00 GMT" });
      res.write(`<p>${req.url} render ${renders}</p>`);
      res.end(req.headers.cookie ? " for a member" : " for anyone");
    });
  });
  front = await startFrontBefore(app, {
    pageCache: {
      maxBytes: 1 << 20,
      maxEntryBytes: 1 << 16,
      ttlMs: 60_000,
      mark: async () => {
        if (markDelayMs) await new Promise((r) => setTimeout(r, markDelayMs));
        if (markFails) throw new Error("the database is out of reach");
        return mark;
      },
      aheadKey: "ahead-key",
    },
    renderCountedMs: 1_000,
  });
});

afterAll(async () => {
  await front.close();
  await new Promise((resolve) => app.close(resolve));
});

beforeEach(() => {
  clearHtmlCache();
  mark = "m1";
  markFails = false;
  reached.length = 0;
});

async function get(path: string, headers: Record<string, string> = {}) {
  const res = await fetch(`http://127.0.0.1:${front.port}${path}`, { headers });
  return { status: res.status, body: await res.text(), cache: res.headers.get(HTML_CACHE_HEADER), date: res.headers.get("date") };
}

describe("public pages kept by the front server", () => {
  it("counts the readers' pages being rendered, not the renders ahead of readers nor the API", async () => {
    expect(front.readers().rendering).toBe(0);
    const waitFor = async (url: string) => {
      while (!held.has(url)) await new Promise((r) => setTimeout(r, 5));
    };
    const reader = get("/classes/held-1");
    await waitFor("/classes/held-1");
    expect(front.readers().rendering).toBe(1);
    const ahead = get("/classes/held-2", { [RENDER_AHEAD_HEADER]: "ahead-key" });
    await waitFor("/classes/held-2");
    expect(front.readers().rendering).toBe(1);
    held.get("/classes/held-1")!();
    expect((await reader).status).toBe(200);
    // Counted until the answer's end was handed on (its "close"), a moment before or after the client read it.
    for (let i = 0; i < 100 && front.readers().rendering > 0; i++) await new Promise((r) => setTimeout(r, 5));
    expect(front.readers().rendering).toBe(0);
    held.get("/classes/held-2")!();
    expect((await ahead).status).toBe(200);
    // A reader whose page never ends is counted for a while only.
    const stuck = get("/classes/held-3");
    await waitFor("/classes/held-3");
    expect(front.readers().rendering).toBe(1);
    await new Promise((r) => setTimeout(r, 1_100));
    expect(front.readers().rendering).toBe(0);
    held.get("/classes/held-3")!();
    await stuck;
    expect(front.readers().rendering).toBe(0);
    // Every reader's request counts in the rate, a render ahead does not.
    await new Promise((r) => setTimeout(r, 1_100));
    expect(front.readers().perSecond).toBe(0);
    await get("/classes/r-ahead", { [RENDER_AHEAD_HEADER]: "ahead-key" });
    expect(front.readers().perSecond).toBe(0);
    await get("/api/v1/anything");
    await get("/favicon.ico");
    expect(front.readers().rendering).toBe(0);
    expect(front.readers().perSecond).toBe(2);
    await new Promise((r) => setTimeout(r, 1_100));
    expect(front.readers().perSecond).toBe(0);
  });

  it("a client gone while the mark was read leaves nothing counted, waiting or rendered", async () => {
    markDelayMs = 100;
    try {
      for (let i = 0; i < 5; i++) {
        const socket = net.connect(front.port, "127.0.0.1");
        await new Promise<void>((resolve) => socket.once("connect", () => resolve()));
        socket.write(`GET /classes/gone-${i} HTTP/1.1\r\nHost: 127.0.0.1\r\nAccept: text/html\r\n\r\n`);
        await new Promise((r) => setTimeout(r, 10));
        socket.resetAndDestroy();
      }
      await new Promise((r) => setTimeout(r, 300));
    } finally {
      markDelayMs = 0;
    }
    expect(reached.filter((r) => r.includes("/classes/gone-"))).toEqual([]);
    expect(front.readers().rendering).toBe(0);
    expect(htmlCacheSize().rendering).toBe(0);
  });

  it("answers a page read before without reaching the app, with the same body and a date of its own", async () => {
    const first = await get("/reactions/r-1");
    expect(first.cache).toBe("miss");
    const again = await get("/reactions/r-1");
    expect(again).toMatchObject({ status: 200, body: first.body, cache: "hit" });
    expect(reached).toEqual(["GET /reactions/r-1"]);
    // Replayed with the time it is sent, not the render's.
    expect(again.date).not.toContain("2024");
  });

  it("renders again once the public pages' mark moved (a change in any process), and keeps the new render", async () => {
    await get("/species/ABC");
    mark = "m2";
    const after = await get("/species/ABC");
    expect(after.cache).toBe("miss");
    expect((await get("/species/ABC")).cache).toBe("hit");
    expect(reached).toEqual(["GET /species/ABC", "GET /species/ABC"]);
  });

  it("passes a request on uncached when the mark cannot be read", async () => {
    await get("/classes");
    markFails = true;
    const res = await get("/classes");
    expect(res.status).toBe(200);
    // Not through the cache at all: neither read nor stored.
    expect(res.cache).toBeNull();
    markFails = false;
    expect((await get("/classes")).cache).toBe("hit");
    expect(reached).toEqual(["GET /classes", "GET /classes"]);
  });

  it("sends a page that fails while the database is out of reach as unavailable for a moment (503, Retry-After), not as a fault", async () => {
    markFails = true;
    const down = await fetch(`http://127.0.0.1:${front.port}/classes/failing`);
    expect(down.status).toBe(503);
    expect(down.headers.get("retry-after")).toBe("5");
    expect(await down.text()).toContain("Something went wrong");
    // A page Next could render from what it kept is sent as rendered.
    expect((await get("/classes")).status).toBe(200);
    // So is a member's page, and a page the cache never keeps; an API answer says it in its own words.
    const member = await fetch(`http://127.0.0.1:${front.port}/classes/failing`, { headers: { cookie: "next-auth.session-token=abc" } });
    expect([member.status, member.headers.get("retry-after")]).toEqual([503, "5"]);
    expect((await fetch(`http://127.0.0.1:${front.port}/classes/failing?x=1`)).status).toBe(503);
    markFails = false;
    // With the database back, a failing page is the fault it is.
    expect((await fetch(`http://127.0.0.1:${front.port}/classes/failing`)).status).toBe(500);
    expect(
      (await fetch(`http://127.0.0.1:${front.port}/classes/failing`, { headers: { cookie: "next-auth.session-token=abc" } })).status,
    ).toBe(500);
  });

  it("never answers a member's request from memory, nor keeps a 404, an API answer or a form post", async () => {
    await get("/classes");
    const member = await get("/classes", { cookie: "next-auth.session-token=abc" });
    expect(member.body).toContain("for a member");
    expect(member.cache).toBeNull();
    expect((await get("/datasets/9/v1")).status).toBe(404);
    expect((await get("/datasets/9/v1")).status).toBe(404);
    await get("/api/v1/reactions");
    await get("/api/v1/reactions");
    const posted = await fetch(`http://127.0.0.1:${front.port}/classes`, {
      method: "POST",
      headers: { origin: "http://127.0.0.1", "content-type": "text/plain" },
      body: "x",
    });
    expect(posted.status).toBe(200);
    expect(reached).toEqual([
      "GET /classes",
      "GET /classes",
      "GET /datasets/9/v1",
      "GET /datasets/9/v1",
      "GET /api/v1/reactions",
      "GET /api/v1/reactions",
      "POST /classes",
    ]);
  });
});
