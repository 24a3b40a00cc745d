import http from "node:http";
import type { AddressInfo } from "node:net";
import { afterAll, beforeAll, beforeEach, describe, expect, it } from "vitest";
import { clearHtmlCache, HTML_CACHE_HEADER, htmlCacheSize, RENDER_AHEAD_HEADER, withHtmlCache } from "@/lib/html-cache";
import { keptPageKey, type KeptPage, type KeptPages } from "@/lib/kept-pages";

// The front server's page cache with pages kept in the database behind its memory (a stand-in for
// lib/kept-pages.ts's store, with its real keys): what is read from there, what is written there.

const SESSION = "next-auth.session-token=abc";
const AHEAD_KEY = "ahead-key-of-this-start";
let renders = 0;
let mark = "10";
let failReads = false;
const kept = new Map<string, { page: KeptPage; mark: string }>();
const reads: string[] = [];
/** When each tag last moved (db/public-pages-mark.ts page_tag_moves), and whether too many moved to say. */
const moves = new Map<string, bigint>();
let tooManyMoves = false;

/** A stand-in for keptPageTags: what the page at the key's path shows. */
const tagsOf = (key: string) => [`page:${key.slice(0, key.indexOf("\n"))}`, "all"];
const movedAfter = (tags: readonly string[], mark: string) => tags.some((t) => (moves.get(t) ?? 0n) > BigInt(mark));

const store: KeptPages = {
  keyOf: keptPageKey,
  async read(key) {
    reads.push(key);
    if (failReads) throw new Error("database out of reach");
    const row = kept.get(key);
    // As the database reads them (db/kept-pages.ts servable): none of its tags moved after its render began.
    if (!row || (row.page.tags && movedAfter(row.page.tags, row.mark))) return null;
    return row.page;
  },
  async keep(key, page, at) {
    const tags = tagsOf(key);
    kept.set(key, { page: { ...page, tags, renderedAt: at }, mark: at });
    return tags;
  },
};

function page(req: http.IncomingMessage, res: http.ServerResponse): void {
  renders += 1;
  const url = new URL(req.url!, "http://x");
  if (url.pathname === "/datasets/7/v1") {
    res.writeHead(404, { "content-type": "text/html" }).end("<h1>Not found</h1>");
    return;
  }
  res.setHeader("content-type", "text/html; charset=utf-8");
  res.end(`<p>${url.pathname}${url.search} render ${renders}</p>`);
}

let server: http.Server;
let base = "";
beforeAll(async () => {
  server = http.createServer(
    withHtmlCache(page, {
      maxBytes: 1 << 20,
      maxEntryBytes: 1 << 16,
      ttlMs: 60_000,
      mark: async () => mark,
      movedSince: async (since) => (tooManyMoves ? null : new Map([...moves].filter(([, moved]) => moved > BigInt(since)))),
      kept: store,
      aheadKey: AHEAD_KEY,
    }),
  );
  await new Promise<void>((resolve) => server.listen(0, "127.0.0.1", resolve));
  base = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
});
afterAll(() => new Promise<void>((resolve) => server.close(() => resolve())));
beforeEach(() => {
  clearHtmlCache();
  kept.clear();
  reads.length = 0;
  failReads = false;
  mark = "10";
  moves.clear();
  tooManyMoves = false;
});

async function get(path: string, headers: Record<string, string> = {}) {
  const res = await fetch(base + path, { headers: { "accept-encoding": "identity", ...headers } });
  return { status: res.status, body: await res.text(), cache: res.headers.get(HTML_CACHE_HEADER), type: res.headers.get("content-type") };
}

describe("pages kept in the database behind the memory cache", () => {
  it("a page rendered for an anonymous reader is kept under the mark read when its request arrived", async () => {
    const first = await get("/datasets/5/v2");
    expect(first.cache).toBe("miss");
    await new Promise((r) => setTimeout(r, 10));
    const entry = kept.get("/datasets/5/v2\nidentity");
    expect(entry?.mark).toBe("10");
    expect(entry?.page.body.toString()).toBe(first.body);
    expect(entry?.page.headers["content-type"]).toBe("text/html; charset=utf-8");
    expect(entry?.page.headers[HTML_CACHE_HEADER]).toBeUndefined();
  });

  it("a page missing from memory is answered from the kept pages, then from memory, without a render", async () => {
    kept.set("/species/VNWKTOKETHGBQD-UHFFFAOYSA-N\nidentity", {
      page: { status: 200, headers: { "content-type": "text/html; charset=utf-8" }, body: Buffer.from("<p>kept methane</p>") },
      mark: "3",
    });
    const before = renders;
    expect(await get("/species/VNWKTOKETHGBQD-UHFFFAOYSA-N")).toEqual({
      status: 200,
      body: "<p>kept methane</p>",
      cache: "kept",
      type: "text/html; charset=utf-8",
    });
    expect((await get("/species/VNWKTOKETHGBQD-UHFFFAOYSA-N")).cache).toBe("hit");
    expect(renders).toBe(before);
    // A change elsewhere moves the mark: memory forgets, the kept page (its tags unmoved) still answers.
    mark = "11";
    expect((await get("/species/VNWKTOKETHGBQD-UHFFFAOYSA-N")).cache).toBe("kept");
    expect(renders).toBe(before);
  });

  it("nothing else is read from or written to the kept pages", async () => {
    await get("/datasets/5/v2?k=cm3");
    await get("/reactions");
    await get("/datasets/7/v1");
    await get("/datasets/9/v1", { cookie: SESSION });
    await get("/datasets/6/v1", { accept: "application/x-bibtex" });
    await new Promise((r) => setTimeout(r, 10));
    // Only the page's own address is looked up (a 404 is found nowhere and kept nowhere).
    expect(reads).toEqual(["/datasets/7/v1\nidentity"]);
    expect([...kept.keys()]).toEqual([]);
  });

  it("a kept page that cannot be read is rendered as before", async () => {
    failReads = true;
    const res = await get("/datasets/5/v3");
    expect(res).toMatchObject({ status: 200, cache: "miss" });
    expect(reads).toEqual(["/datasets/5/v3\nidentity"]);
  });

  it("a render ahead of readers is kept in the database, not in memory, and never answered from either", async () => {
    const path = "/reactions/IUAWJZWBUGYCRS-UHFFFAOYSA-N+VNWKTOKETHGBQD-UHFFFAOYSA-N~XLYOFNOQVPJJNP-UHFFFAOYSA-N";
    const key = `${path}\nidentity`;
    const ahead = { [RENDER_AHEAD_HEADER]: AHEAD_KEY };
    const before = renders;
    const first = await get(path, ahead);
    expect(first).toMatchObject({ status: 200, cache: "miss" });
    await new Promise((r) => setTimeout(r, 10));
    expect(kept.get(key)?.page.body.toString()).toBe(first.body);
    expect(htmlCacheSize().entries).toBe(0);
    // Asked again, it renders again (the loop asks only for pages without a kept copy).
    expect((await get(path, ahead)).cache).toBe("miss");
    expect(renders).toBe(before + 2);
    // The first reader finds it kept, the next one in memory: no render.
    expect(await get(path)).toMatchObject({ cache: "kept", body: kept.get(key)!.page.body.toString() });
    expect((await get(path)).cache).toBe("hit");
    expect(renders).toBe(before + 2);
    // Another key in the header is an ordinary reader.
    expect((await get(path, { [RENDER_AHEAD_HEADER]: "guess" })).cache).toBe("hit");
  });

  it("a page whose tags are known stays in memory across moves that touch none of them, and goes when one does", async () => {
    const path = "/datasets/5/v2";
    const first = await get(path);
    expect(first.cache).toBe("miss");
    await new Promise((r) => setTimeout(r, 10));
    expect((await get(path)).cache).toBe("hit");
    // Another dataset published: the mark moves, this page's tags do not.
    moves.set("page:/datasets/99/v1", 11n);
    mark = "11";
    expect(await get(path)).toMatchObject({ cache: "hit", body: first.body });
    // Its own tag moves (a re-fit of this dataset): memory and the kept copy are both passed over, it renders.
    moves.set(`page:${path}`, 12n);
    mark = "12";
    const again = await get(path);
    expect(again.cache).toBe("miss");
    expect(again.body).not.toBe(first.body);
  });

  it("a page read from the kept pages is judged by the mark its render began under, not the reader's", async () => {
    const key = "/species/VNWKTOKETHGBQD-UHFFFAOYSA-N\nidentity";
    kept.set(key, {
      page: {
        status: 200,
        headers: { "content-type": "text/html; charset=utf-8" },
        body: Buffer.from("<p>kept methane</p>"),
        tags: tagsOf(key),
        renderedAt: "3",
      },
      mark: "3",
    });
    expect((await get("/species/VNWKTOKETHGBQD-UHFFFAOYSA-N")).cache).toBe("kept");
    expect((await get("/species/VNWKTOKETHGBQD-UHFFFAOYSA-N")).cache).toBe("hit");
    // A move that took its value (5) before the reader read the mark (10) but committed after the row
    // was read: seen now, so the page is no longer served from memory.
    moves.set(tagsOf(key)[0], 5n);
    const after = await get("/species/VNWKTOKETHGBQD-UHFFFAOYSA-N");
    expect(after.cache).toBe("miss");
    expect(after.body).not.toBe("<p>kept methane</p>");
  });

  it("a move of every page, too many moves to read, or a page with no known tags empties memory as before", async () => {
    await get("/datasets/5/v2");
    await get("/");
    await new Promise((r) => setTimeout(r, 10));
    expect((await get("/datasets/5/v2")).cache).toBe("hit");
    expect((await get("/")).cache).toBe("hit");
    mark = "11";
    // The home page shows no kept page's tags: a move of the mark renders it again.
    expect((await get("/")).cache).toBe("miss");
    expect((await get("/datasets/5/v2")).cache).toBe("hit");
    tooManyMoves = true;
    mark = "12";
    expect((await get("/datasets/5/v2")).cache).not.toBe("hit");
    tooManyMoves = false;
    await new Promise((r) => setTimeout(r, 10));
    expect((await get("/datasets/5/v2")).cache).toBe("hit");
    moves.set("all", 13n);
    mark = "13";
    expect((await get("/datasets/5/v2")).cache).toBe("miss");
  });
});
