import { describe, expect, it } from "vitest";
import { searchKey } from "@/components/search/search-answer";
import { checkWindows, windowValue } from "@/components/search/search-windows";
import { activeFilters, facetValueLabel, withFacetValue, withFilters, withYear } from "@/components/search/search-words";
import { suggestionCountWords, suggestionHref, suggestionsOf } from "@/components/search/suggestions";
import { DEFAULT_REQUEST, parseSearchParams, toSearchParams } from "@/lib/search/params";
import type { SearchRequest } from "@/lib/search/types";

const base: SearchRequest = { ...DEFAULT_REQUEST, q: "methane", cursor: "abc" };

describe("facet labels", () => {
  it("use our vocabulary's labels, the value itself when there is none", () => {
    expect(facetValueLabel("reactionClass", "hydrogen-abstraction")).toBe("H-atom abstraction");
    // A retired class id reads as the current class.
    expect(facetValueLabel("reactionClass", "h_abstraction")).toBe("H-atom abstraction");
    expect(facetValueLabel("methodCategory", "theory")).toBe("Calculated");
    expect(facetValueLabel("phase", "gas")).toBe("Gas phase");
    expect(facetValueLabel("flags", "none")).toBe("No findings");
    expect(facetValueLabel("bathGas", "He")).toBe("He");
    expect(facetValueLabel("reactionClass", "unknown-thing")).toBe("unknown-thing");
  });
});

describe("changing the request", () => {
  it("switching a facet value on and off starts from the first page again", () => {
    const on = withFacetValue(base, "reactionClass", "addition", true);
    expect(on.filters.reactionClass).toEqual(["addition"]);
    expect(on.cursor).toBeNull();
    expect(withFacetValue(on, "reactionClass", "addition", true).filters.reactionClass).toEqual(["addition"]);
    expect(withFacetValue(on, "reactionClass", "addition", false).filters.reactionClass).toEqual([]);
    expect(base.filters.reactionClass).toEqual([]);
  });

  it("a source year narrows the year range to that year", () => {
    expect(withYear(base, 2004).filters).toMatchObject({ yearMin: 2004, yearMax: 2004 });
  });

  it("lists every filter in force with the request that drops it, and the URL round-trips", () => {
    const r = withFilters(base, {
      reactionClass: ["addition"],
      flags: ["curved"],
      tMin: 300,
      tMax: 500,
      tCovers: true,
      pMax: 1000,
      yearMin: 1990,
    });
    const active = activeFilters(r);
    expect(active.map((a) => a.words)).toEqual([
      "Reaction class: Addition",
      "Findings of the re-fit: Curved Arrhenius plot",
      "Temperature: measured over all of 300–500 K",
      "Pressure: up to 1000 Pa",
      "Source published: from 1990",
    ]);
    const withoutT = active.find((a) => a.key === "temperature")!.without;
    expect(withoutT.filters).toMatchObject({ tMin: null, tMax: null, tCovers: false, pMax: 1000 });
    // The page's links are built from the same rules the API reads them with.
    const again = parseSearchParams(toSearchParams(r));
    expect(again.ok && again.request).toEqual(r);
  });
});

describe("the windows' own checks", () => {
  const empty = { tMin: "", tMax: "", pMin: "", pMax: "", yearMin: "", yearMax: "" };
  it("refuse a minimum above its maximum beside the maximum", () => {
    const m = checkWindows({ ...empty, tMin: "500", tMax: "300" }, false);
    expect([...m.keys()]).toEqual(["tMax"]);
    expect(m.get("tMax")![0]).toMatch(/below the lower end/);
  });
  it("refuse negative, non-numeric and fractional-year bounds, and 'whole window' without both ends", () => {
    const m = checkWindows({ ...empty, tMin: "-3", pMin: "abc", yearMin: "1999.5" }, true);
    expect([...m.keys()].sort()).toEqual(["pMin", "tCovers", "tMin", "yearMin"]);
  });
  it("pass plain numbers and empty fields", () => {
    expect(checkWindows({ ...empty, tMin: "300", tMax: "1e3", yearMax: "2020" }, true).size).toBe(0);
    expect(windowValue(" ")).toBeNull();
    expect(windowValue("0x10")).toBeNaN();
  });
});

describe("the query key", () => {
  it("is the normalised request for a valid URL, and keeps refused values as given", () => {
    expect(searchKey(new URLSearchParams("tMax=500&q=methane&utm=x&view=datasets"))).toBe("q=methane&tMax=500");
    expect(searchKey(new URLSearchParams("tMin=abc&utm=x"))).toBe("tMin=abc");
  });
});

describe("suggestions", () => {
  it("lead to their own pages, carry their own counts and are counted in words", () => {
    const list = suggestionsOf({
      species: [{ inchiKey: "TUJKJAMUKRIRHC-UHFFFAOYSA-N", name: "OH", formula: "HO", matched: "hydroxyl radical", datasetCount: 4 }],
      reactions: [{ reactionId: 3, reactionKey: "A-B>>C", equation: "OH + CH4 → H2O + CH3", datasetCount: 1 }],
    });
    expect(list).toEqual([
      {
        kind: "species",
        label: "OH",
        detail: "HO, also “hydroxyl radical”, 4 datasets",
        q: "OH",
        href: "/species/TUJKJAMUKRIRHC-UHFFFAOYSA-N",
      },
      { kind: "reaction", label: "OH + CH4 → H2O + CH3", detail: "1 dataset", q: "OH + CH4 → H2O + CH3", href: "/reactions/A-B~C" },
    ]);
    // A species opens its page, a reaction its page by key (never the numeric alias, which redirects).
    expect(suggestionHref(list[0])).toBe("/species/TUJKJAMUKRIRHC-UHFFFAOYSA-N");
    expect(suggestionHref(list[1])).toBe("/reactions/A-B~C");
    expect(suggestionCountWords(list)).toBe("2 suggestions: 1 species and 1 reaction. Up and down arrows to choose.");
    expect(suggestionCountWords([])).toMatch(/^No suggestions/);
  });
});
