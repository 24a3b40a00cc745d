import { XMLParser, XMLValidator } from "fast-xml-parser";
import { describe, expect, it } from "vitest";
import { feedEntries, FEED_ENTRIES, renderAtomFeed, type FeedVersion } from "@/lib/feeds/atom";

const version = (over: Partial<FeedVersion>): FeedVersion => ({
  datasetId: 7,
  number: 1,
  title: "Invented rate constants",
  equation: "hydroxyl + methane → water + methyl",
  identifier: "10.99999/demo.1",
  pointCount: 12,
  tMin: 250,
  tMax: 400,
  publishedAt: "2026-01-02T10:00:00.000Z",
  retractedAt: null,
  retractionNotice: null,
  ...over,
});

describe("feedEntries", () => {
  it("one entry per publication and one per retraction, newest first, ids stable across polls", () => {
    const entries = feedEntries(
      [
        version({ number: 2, publishedAt: "2026-03-01T00:00:00.000Z" }),
        version({ datasetId: 8, retractedAt: "2026-04-01T00:00:00.000Z", retractionNotice: "A calibration error." }),
      ],
      "https://example.org",
    );
    expect(entries.map((e) => [e.kind, e.id, e.at])).toEqual([
      ["retracted", "https://example.org/datasets/8/v1#retracted", "2026-04-01T00:00:00.000Z"],
      ["published", "https://example.org/datasets/7/v2", "2026-03-01T00:00:00.000Z"],
      ["published", "https://example.org/datasets/8/v1", "2026-01-02T10:00:00.000Z"],
    ]);
    expect(entries[0].summary).toContain("retracted — A calibration error.");
    expect(entries[1].summary).toBe(
      "hydroxyl + methane → water + methyl: 12 points over 250–400 K. It is version 2 of the dataset and replaces version 1. Identifier: 10.99999/demo.1.",
    );
  });

  it("keeps the newest entries only", () => {
    const many = Array.from({ length: FEED_ENTRIES + 5 }, (_, i) =>
      version({ datasetId: i + 1, publishedAt: new Date(Date.UTC(2026, 0, 1) + i * 60_000).toISOString() }),
    );
    const entries = feedEntries(many, "https://example.org");
    expect(entries).toHaveLength(FEED_ENTRIES);
    expect(entries[0].id).toBe(`https://example.org/datasets/${FEED_ENTRIES + 5}/v1`);
  });
});

describe("renderAtomFeed", () => {
  it("is well-formed Atom (RFC 4287) whose text shows markup as text", () => {
    const xml = renderAtomFeed({
      title: "A <b> & B: new and retracted versions",
      pageUrl: "https://example.org/reactions/X",
      feedUrl: "https://example.org/reactions/X/feed.xml",
      entries: feedEntries([version({ title: "Rates <script>alert(1)</script> ]]> end\u0000" })], "https://example.org"),
      emptySince: "1970-01-01T00:00:00.000Z",
    });
    // fast-xml-parser's validator as an outside check of well-formedness (XML 1.0).
    expect(XMLValidator.validate(xml)).toBe(true);
    const doc = new XMLParser({ ignoreAttributes: false }).parse(xml);
    expect(doc.feed["@_xmlns"]).toBe("http://www.w3.org/2005/Atom");
    expect(doc.feed.id).toBe("https://example.org/reactions/X/feed.xml");
    expect(doc.feed.updated).toBe("2026-01-02T10:00:00.000Z");
    const title = doc.feed.entry.title["#text"] as string;
    // type="html": the reader decodes the escapes once and shows the characters, never a tag.
    expect(title).toBe("Published: Rates &lt;script&gt;alert(1)&lt;/script&gt; ]]&gt; end (version 1)");
    expect(doc.feed.title).toBe("A <b> & B: new and retracted versions");
  });

  it("an empty feed is still valid and says nothing happened", () => {
    const xml = renderAtomFeed({
      title: "T",
      pageUrl: "https://e.org/p",
      feedUrl: "https://e.org/p/feed.xml",
      entries: [],
      emptySince: "1970-01-01T00:00:00.000Z",
    });
    expect(XMLValidator.validate(xml)).toBe(true);
    expect(xml).toContain("<updated>1970-01-01T00:00:00.000Z</updated>");
    expect(xml).not.toContain("<entry>");
  });
});
