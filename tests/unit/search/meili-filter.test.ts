import { describe, expect, it } from "vitest";
import { buildFilter, facetConditions, textPart } from "@/lib/search/meili/filter";
import { indexSettings, synonymsFromNames, toIndexedDocument } from "@/lib/search/meili/index-settings";
import { configProblems, meilisearchConfig, searchEngineName } from "@/lib/config";
import { EMPTY_FILTERS } from "@/lib/search/params";
import type { SearchDocument } from "@/lib/search/types";
import { parseCondition } from "../../support/meili-stand-in";

const none = EMPTY_FILTERS;

describe("Meilisearch filters", () => {
  it("lists only the newest public version of each dataset when nothing is asked", () => {
    expect(buildFilter({ kind: "all" }, none)).toEqual(["latest = true"]);
    expect(textPart({ kind: "text", text: "flash photolysis" })).toEqual({ q: "flash photolysis", filter: [] });
  });

  it("puts a species on either side (one OR group) and each reaction term on its own side", () => {
    expect(buildFilter({ kind: "species", term: "OH", inchiKeys: ["K1", "K2"] }, none)).toEqual([
      "latest = true",
      ['reactantKeys IN ["K1", "K2"]', 'productKeys IN ["K1", "K2"]'],
    ]);
    expect(textPart({ kind: "reaction", reactants: [["A"], ["B", "C"]], products: [["D"]], otherReactants: true }).filter).toEqual([
      'reactantKeys IN ["A"]',
      'reactantKeys IN ["B", "C"]',
      'productKeys IN ["D"]',
    ]);
  });

  it("quotes values as JSON, so a quote or a backslash in a value cannot end the literal", () => {
    const [cond] = facetConditions("creator", { ...none, creator: ['O"Brien\\, A'] });
    expect(cond).toBe('creators IN ["O\\"Brien\\\\, A"]');
    expect(parseCondition(cond as string)({ id: "1", creators: ['O"Brien\\, A'] })).toBe(true);
  });

  it("reads a temperature window as an overlap, or as cover when both ends are given and cover is asked", () => {
    expect(buildFilter({ kind: "all" }, { ...none, tMin: 300, tMax: 400 })).toEqual(["latest = true", "tMax >= 300", "tMin <= 400"]);
    expect(buildFilter({ kind: "all" }, { ...none, tMin: 300, tMax: 400, tCovers: true })).toEqual([
      "latest = true",
      "tMin <= 300",
      "tMax >= 400",
    ]);
    // One open end: cover is the same as overlap there (as in the PostgreSQL engine).
    expect(buildFilter({ kind: "all" }, { ...none, tMin: 300, tCovers: true })).toEqual(["latest = true", "tMax >= 300"]);
  });

  it("leaves out the facet being counted, keeps every other one", () => {
    const filters = { ...none, reactionClass: ["addition"], flags: ["none" as const], yearMin: 2000 };
    const all = buildFilter({ kind: "all" }, filters);
    expect(all).toEqual(["latest = true", 'reactionClass IN ["addition"]', "sourceYear >= 2000", 'flags IN ["none"]']);
    expect(buildFilter({ kind: "all" }, filters, "reactionClass")).toEqual(["latest = true", "sourceYear >= 2000", 'flags IN ["none"]']);
  });
});

describe("Meilisearch index settings", () => {
  it("makes every name of a species a synonym of its other names, in lower case", () => {
    expect(synonymsFromNames([["OH", "hydroxyl radical", "Hydroxyl"], ["methane"]])).toEqual({
      oh: ["hydroxyl radical", "hydroxyl"],
      "hydroxyl radical": ["oh", "hydroxyl"],
      hydroxyl: ["oh", "hydroxyl radical"],
    });
  });

  it("can filter on every facet attribute and sort on every sort key", () => {
    const s = indexSettings({});
    for (const a of ["reactionClass", "phase", "methodCategory", "bathGases", "licence", "sourceYear", "flags", "creators"])
      expect(s.filterableAttributes).toContain(a);
    expect(s.sortableAttributes).toEqual(["publishedTs", "tSpan", "pointCount", "versionId"]);
    expect(s.rankingRules[0]).toBe("sort");
  });

  it("indexes the publication time as seconds and the width of the range", () => {
    const doc = { publishedAt: "2026-01-02T03:04:05.000Z", tMin: 250, tMax: 400 } as SearchDocument;
    expect(toIndexedDocument(doc)).toMatchObject({ publishedTs: 1767323045, tSpan: 150 });
  });
});

describe("Meilisearch configuration", () => {
  it("is off unless MEILISEARCH_URL is set; SEARCH_ENGINE=meilisearch without it is a configuration problem", () => {
    const saved = { ...process.env };
    try {
      delete process.env.MEILISEARCH_URL;
      delete process.env.SEARCH_ENGINE;
      expect(meilisearchConfig()).toBeNull();
      expect(searchEngineName()).toBe("postgres");
      expect(configProblems({ SEARCH_ENGINE: "meilisearch" })).toEqual(["SEARCH_ENGINE is meilisearch but MEILISEARCH_URL is not set"]);
      Object.assign(process.env, { MEILISEARCH_URL: "http://127.0.0.1:7700/", MEILISEARCH_API_KEY: "k" });
      expect(meilisearchConfig()).toEqual({ host: "http://127.0.0.1:7700", apiKey: "k", index: "datasets" });
      process.env.SEARCH_ENGINE = "postgres";
      expect(searchEngineName()).toBe("postgres");
    } finally {
      process.env = saved;
    }
  });
});
