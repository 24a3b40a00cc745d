import { describe, expect, it } from "vitest";
import { GET as sitemapIndexRoute } from "@/app/sitemap.xml/route";
import sitemapFile, { generateSitemaps } from "@/app/sitemaps/sitemap";
import { getSitemapPage, listSitemapEntries, listSitemapIds, renderSitemapIndex, sitemapFilePath } from "@/lib/sitemap";

// The sitemaps protocol (sitemaps.org, 0.9) allows 50 000 addresses per file and a sitemap index
// naming the files; a small page size stands in for 50 000 here (the demo has about a hundred pages).

describe("the sitemap, split into files under an index", () => {
  it("every public page is in exactly one file of at most the page size, in order", async () => {
    const all = (await listSitemapEntries()).map((e) => e.url);
    expect(all.length).toBeGreaterThan(20);
    expect(new Set(all).size).toBe(all.length);
    const pageSize = 7;
    const ids = await listSitemapIds({ pageSize });
    expect(ids).toEqual(Array.from({ length: Math.ceil(all.length / pageSize) }, (_, i) => i));
    const pages = await Promise.all(ids.map((id) => getSitemapPage({ id, pageSize })));
    for (const page of pages) expect(page.length).toBeLessThanOrEqual(pageSize);
    expect(pages.flat().map((e) => e.url)).toEqual(all);
    expect(await getSitemapPage({ id: ids.length, pageSize })).toEqual([]);
  });

  it("the index names every file, and one file holds everything while under 50 000", async () => {
    const xml = await renderSitemapIndex({ pageSize: 7 });
    expect(xml).toMatch(
      /^<\?xml version="1.0" encoding="UTF-8"\?>\n<sitemapindex xmlns="http:\/\/www.sitemaps.org\/schemas\/sitemap\/0.9">/,
    );
    const locs = [...xml.matchAll(/<loc>([^<]+)<\/loc>/g)].map((m) => m[1]);
    expect(locs.length).toBe((await listSitemapIds({ pageSize: 7 })).length);
    expect(locs.at(-1)).toMatch(new RegExp(`${sitemapFilePath(locs.length - 1).replace(/\./g, "\\.")}$`));

    expect(await generateSitemaps()).toEqual([{ id: 0 }]);
    const res = await sitemapIndexRoute();
    expect(res.headers.get("content-type")).toMatch(/^application\/xml/);
    expect(await res.text()).toContain(`${sitemapFilePath(0)}</loc>`);
    const file = await sitemapFile({ id: Promise.resolve("0") });
    expect(file.map((e) => e.url)).toEqual((await listSitemapEntries()).map((e) => e.url));
  });
});
