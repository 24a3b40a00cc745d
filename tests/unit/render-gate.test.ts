import http from "node:http";
import type { AddressInfo } from "node:net";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { createRenderGate, isGatedRender } from "@/lib/http/render-gate";

// The gate in front of a stand-in for Next's handler: pages take turns, nothing else waits.

const gate = createRenderGate({ max: 2, holdMs: 300 });
let inside = 0;
let most = 0;
let rendered: string[] = [];

async function handler(req: http.IncomingMessage, res: http.ServerResponse) {
  inside++;
  most = Math.max(most, inside);
  const url = new URL(req.url!, "http://x");
  const ms = Number(url.searchParams.get("ms") ?? 50);
  try {
    if (url.searchParams.get("slow") === "1") {
      // A page whose reader takes long: the render ends late (the place is given back after holdMs).
      res.write("<p>start</p>");
      await new Promise((r) => setTimeout(r, ms));
    } else {
      await new Promise((r) => setTimeout(r, ms));
    }
    rendered.push(url.pathname + url.search);
    res.end("<p>done</p>");
  } finally {
    inside--;
  }
}

let server: http.Server;
let base = "";
beforeAll(async () => {
  server = http.createServer(gate(handler));
  await new Promise<void>((resolve) => server.listen(0, "127.0.0.1", resolve));
  base = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
});
afterAll(() => new Promise<void>((resolve) => server.close(() => resolve())));

const reset = () => {
  most = 0;
  rendered = [];
};

describe("isGatedRender", () => {
  it("gates GET and HEAD of pages only", () => {
    const r = (method: string, url: string, headers: Record<string, string> = {}) => isGatedRender({ method, url, headers });
    expect(r("GET", "/datasets/1/v2")).toBe(true);
    expect(r("HEAD", "/reactions/ABC~*?include=measured")).toBe(true);
    expect(r("GET", "/")).toBe(true);
    expect(r("POST", "/datasets/1/v2")).toBe(false);
    // Next renders the page for a GET whatever its Next-Action header says: the header cannot skip the queue.
    expect(r("GET", "/datasets/1/v2", { "next-action": "abc" })).toBe(true);
    expect(r("POST", "/datasets/1/v2", { "next-action": "abc" })).toBe(false);
    expect(r("GET", "/api/v1/search?q=x")).toBe(false);
    expect(r("GET", "/_next/static/chunks/a.js")).toBe(false);
    expect(r("GET", "/sitemap.xml")).toBe(false);
    expect(r("GET", "/reactions/ABC~*/feed.xml")).toBe(false);
    expect(r("GET", "/favicon.ico")).toBe(false);
  });
});

describe("createRenderGate", () => {
  it("lets at most max pages render at once and answers every one, in order of arrival", async () => {
    reset();
    const answers = await Promise.all(Array.from({ length: 7 }, (_, i) => fetch(`${base}/p${i}?ms=30`).then((r) => r.text())));
    expect(answers.every((a) => a.includes("done"))).toBe(true);
    expect(most).toBe(2);
    // The first two start at once; the rest run in the order they came.
    expect(rendered.slice(2)).toEqual(["/p2?ms=30", "/p3?ms=30", "/p4?ms=30", "/p5?ms=30", "/p6?ms=30"]);
    expect(gate.stats()).toEqual({ active: 0, waiting: 0 });
  });

  it("never holds back an API request, even while every place is taken", async () => {
    reset();
    const pages = [fetch(`${base}/a?ms=400`), fetch(`${base}/b?ms=400`)];
    await new Promise((r) => setTimeout(r, 50));
    const started = Date.now();
    await (await fetch(`${base}/api/x?ms=1`)).text();
    expect(Date.now() - started).toBeLessThan(300);
    await Promise.all(pages.map((p) => p.then((r) => r.text())));
  });

  it("gives a slow render's place back after holdMs, so others are not kept waiting", async () => {
    reset();
    const slow = [fetch(`${base}/s1?slow=1&ms=1500`), fetch(`${base}/s2?slow=1&ms=1500`)];
    await new Promise((r) => setTimeout(r, 50));
    const started = Date.now();
    await (await fetch(`${base}/quick?ms=1`)).text();
    const waited = Date.now() - started;
    expect(waited).toBeGreaterThanOrEqual(200);
    expect(waited).toBeLessThan(1200);
    await Promise.all(slow.map((p) => p.then((r) => r.text())));
    expect(gate.stats()).toEqual({ active: 0, waiting: 0 });
  });

  it("drops a waiting request whose client went away, without rendering it", async () => {
    reset();
    const pages = [fetch(`${base}/x1?ms=250`), fetch(`${base}/x2?ms=250`)];
    await new Promise((r) => setTimeout(r, 30));
    const abort = new AbortController();
    const gone = fetch(`${base}/left?ms=1`, { signal: abort.signal }).catch(() => null);
    await new Promise((r) => setTimeout(r, 30));
    expect(gate.stats().waiting).toBe(1);
    abort.abort();
    await gone;
    await Promise.all(pages.map((p) => p.then((r) => r.text())));
    await new Promise((r) => setTimeout(r, 30));
    expect(rendered).not.toContain("/left?ms=1");
    expect(gate.stats()).toEqual({ active: 0, waiting: 0 });
  });

  it("refuses a limit that is not a whole number of at least one", () => {
    expect(() => createRenderGate({ max: 0, holdMs: 10 })).toThrow(/max/);
  });
});
