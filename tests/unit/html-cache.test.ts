import http from "node:http";
import type { AddressInfo } from "node:net";
import { afterAll, beforeAll, beforeEach, describe, expect, it } from "vitest";
import { clearHtmlCache, HTML_CACHE_HEADER, htmlCacheKey, htmlCacheSize, withHtmlCache } from "@/lib/html-cache";

// The anonymous page cache in front of a stand-in for Next's handler: what is replayed, what never is.

const SESSION = "next-auth.session-token=abc";
let clock = 0;
let renders = 0;
/** Set by a test to run while a render is under way (before it ends). */
let duringRender: (() => void) | null = null;

function page(req: http.IncomingMessage, res: http.ServerResponse): void {
  renders += 1;
  const url = new URL(req.url!, "http://x");
  const member = (req.headers.cookie ?? "").includes("session-token");
  if ((url.pathname === "/datasets/7/v1" || url.pathname === "/reactions/slow-missing") && !member) {
    if (url.pathname === "/reactions/slow-missing") {
      setTimeout(() => res.writeHead(404, { "content-type": "text/html" }).end("<h1>Not found</h1>"), 150);
      return;
    }
    res.writeHead(404, { "content-type": "text/html" });
    res.end("<h1>Not found</h1>");
    return;
  }
  if (url.pathname === "/datasets/8/v1") res.setHeader("set-cookie", "a=b");
  if (url.pathname === "/datasets/6/v1" && req.headers.accept === "application/x-bibtex") {
    res.writeHead(200, { "content-type": "application/x-bibtex" });
    res.end("@misc{x}");
    return;
  }
  res.setHeader("content-type", "text/html; charset=utf-8");
  res.write(`<p>${url.pathname}${url.search} ${member ? "member" : "anyone"} render ${renders}</p>`);
  duringRender?.();
  const end = () => res.end(url.pathname === "/reactions/big" ? "x".repeat(5000) : "<footer></footer>");
  // A slow render: the requests that arrive meanwhile for the same page wait for it.
  if (url.pathname.startsWith("/reactions/slow")) setTimeout(end, 150);
  else end();
}

let server: http.Server;
let base = "";
beforeAll(async () => {
  server = http.createServer(withHtmlCache(page, { maxBytes: 400, maxEntryBytes: 1000, ttlMs: 60_000, now: () => clock }));
  await new Promise<void>((resolve) => server.listen(0, "127.0.0.1", resolve));
  base = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
});
afterAll(() => new Promise<void>((resolve) => server.close(() => resolve())));
beforeEach(() => {
  clearHtmlCache();
  clock = 0;
  duringRender = null;
});

async function get(path: string, headers: Record<string, string> = {}) {
  const res = await fetch(base + path, { headers });
  return { status: res.status, body: await res.text(), cache: res.headers.get(HTML_CACHE_HEADER), cookie: res.headers.get("set-cookie") };
}

describe("html cache", () => {
  it("replays an anonymous public page, same body and headers", async () => {
    const first = await get("/datasets/5/v2?unit=x");
    const second = await get("/datasets/5/v2?unit=x");
    expect(first.cache).toBe("miss");
    expect(second).toEqual({ ...first, cache: "hit" });
    // Another query is another page.
    expect((await get("/datasets/5/v2")).cache).toBe("miss");
  });

  it("never lets a member's request in or out: a draft stays 404 to anyone after a member saw it", async () => {
    expect((await get("/datasets/7/v1")).status).toBe(404);
    const member = await get("/datasets/7/v1", { cookie: `theme=dark; ${SESSION}` });
    expect(member.status).toBe(200);
    expect(member.cache).toBeNull();
    expect((await get("/datasets/7/v1")).status).toBe(404);
    expect(htmlCacheSize().entries).toBe(0);
    // A public page cached for anyone is rendered afresh for a member.
    await get("/reactions/ab");
    expect((await get("/reactions/ab", { cookie: `__Secure-next-auth.session-token.0=x` })).body).toContain("member");
  });

  it("never stores a render for a request carrying any cookie next-auth may read as a session (its name only starting with the session cookie's)", async () => {
    for (const cookie of [
      "next-auth.session-tokenX=jwt",
      "a=1;next-auth.session-token_2=jwt",
      "__Host-next-auth.session-token.9=jwt",
      "Next-Auth.Session-Token=jwt",
    ]) {
      const path = `/reactions/k${cookie.length}`;
      const res = await get(path, { cookie });
      expect(res.cache).toBeNull();
      expect(htmlCacheSize().entries).toBe(0);
      // The anonymous reader gets a render of its own, never the member's.
      expect((await get(path)).body).not.toContain("member");
      clearHtmlCache();
    }
  });

  it("stores only 200s without Set-Cookie, on public page paths, for plain GETs", async () => {
    await get("/datasets/8/v1");
    expect((await get("/datasets/8/v1")).cache).toBe("miss");
    for (const path of ["/api/v1/search?q=x", "/deposits", "/datasets/5/audit", "/search?q=x"]) {
      await get(path);
      expect((await get(path)).cache, path).toBeNull();
    }
    await get("/species/K");
    expect((await get("/species/K", { rsc: "1" })).cache).toBeNull();
    expect((await get("/species/K?_rsc=abc")).cache).toBeNull();
    expect((await get("/species/K", { authorization: "Bearer arh_key_x" })).cache).toBeNull();
    // The same address in another format (by Accept) is another entry.
    expect((await get("/species/K", { accept: "application/x-bibtex" })).cache).toBe("miss");
  });

  it("empties on invalidation, and does not store a render that was under way then", async () => {
    await get("/classes/x");
    clearHtmlCache();
    expect((await get("/classes/x")).cache).toBe("miss");
    duringRender = clearHtmlCache;
    await get("/classes/y");
    duringRender = null;
    expect((await get("/classes/y")).cache).toBe("miss");
  });

  it("serves an entry for its lifetime only, and keeps the byte budget (least recently used out)", async () => {
    await get("/classes");
    clock = 59_999;
    expect((await get("/classes")).cache).toBe("hit");
    clock = 60_000;
    expect((await get("/classes")).cache).toBe("miss");
    // Each body is about 45 bytes: 400 bytes hold eight; "/classes" stays, being used.
    for (let i = 0; i < 12; i++) {
      await get(`/species/S${i}`);
      await get("/classes");
    }
    expect(htmlCacheSize().bytes).toBeLessThanOrEqual(400);
    expect((await get("/classes")).cache).toBe("hit");
    expect((await get("/species/S0")).cache).toBe("miss");
    // Over the single-entry limit: passed on, never stored.
    await get("/reactions/big");
    expect((await get("/reactions/big")).cache).toBe("miss");
  });

  it("renders a page asked for by several readers at once only once: the others wait and get what it kept", async () => {
    const before = renders;
    const answers = await Promise.all([get("/reactions/slow"), get("/reactions/slow"), get("/reactions/slow")]);
    expect(renders - before).toBe(1);
    expect(answers.map((a) => a.cache).sort()).toEqual(["hit", "hit", "miss"]);
    expect(new Set(answers.map((a) => a.body)).size).toBe(1);
    // A render that keeps nothing (a 404) sends each waiter to render its own.
    const missing = await Promise.all([get("/reactions/slow-missing"), get("/reactions/slow-missing")]);
    expect(missing.map((a) => a.status)).toEqual([404, 404]);
    expect(renders - before).toBe(3);
    // A member never waits for an anonymous render, nor gets it.
    const [anyone, member] = await Promise.all([get("/reactions/slow-2"), get("/reactions/slow-2", { cookie: SESSION })]);
    expect(anyone.body).toContain("anyone");
    expect(member.body).toContain("member");
  });

  it("never keeps a GET that declares a body (even an empty one), one with a long Accept, or an answer that is not HTML", async () => {
    // fetch never sends Content-Length on a GET: a raw request does.
    const emptyBody = () =>
      new Promise<string | undefined>((resolve, reject) => {
        const req = http.request(`${base}/species/B`, { headers: { "content-length": "0" } }, (res) => {
          res.resume();
          res.on("end", () => resolve(res.headers[HTML_CACHE_HEADER] as string | undefined));
        });
        req.on("error", reject);
        req.end();
      });
    await emptyBody();
    expect(await emptyBody()).toBeUndefined();
    const longAccept = { accept: `text/html, application/x-${"a".repeat(300)};q=0.1` };
    await get("/species/B", longAccept);
    expect((await get("/species/B", longAccept)).cache).toBeNull();
    expect(htmlCacheSize().entries).toBe(0);
    await get("/datasets/6/v1", { accept: "application/x-bibtex" });
    expect((await get("/datasets/6/v1", { accept: "application/x-bibtex" })).cache).toBe("miss");
    expect(htmlCacheSize().entries).toBe(0);
  });

  it("counts an entry's key and headers against the budget, not only its body", async () => {
    // A body of ~200 bytes fits the 400-byte budget; with its 150-character key and its headers it does not.
    const path = `/species/${"L".repeat(150)}`;
    expect((await get(path)).body.length).toBeLessThan(400);
    expect(htmlCacheSize()).toMatchObject({ entries: 0, bytes: 0 });
    await get("/species/short");
    expect(htmlCacheSize().entries).toBe(1);
    expect(htmlCacheSize().bytes).toBeGreaterThan(Buffer.byteLength((await get("/species/short")).body));
  });

  it("keys only what may be shared", () => {
    expect(htmlCacheKey({ method: "HEAD", url: "/", headers: {} })).toBeNull();
    expect(htmlCacheKey({ method: "GET", url: "/", headers: { cookie: "other=1" } })).not.toBeNull();
    expect(htmlCacheKey({ method: "GET", url: "/", headers: { cookie: "next-auth.csrf-token=1" } })).not.toBeNull();
    expect(htmlCacheKey({ method: "GET", url: "/reactions/A/extra", headers: {} })).toBeNull();
    expect(htmlCacheKey({ method: "GET", url: "/datasets/1/v1", headers: { "next-router-prefetch": "1" } })).toBeNull();
  });
});
