/**
 * What the search page says about a request, in words: facet titles and value labels, the active
 * filters (each one something a reader can drop to widen the search).
 * Pure: the page, the empty-result message and the unit tests share it.
 */
import { LICENCES, METHOD_CATEGORIES, PHASES, reactionClassFor } from "@/lib/deposits/vocabulary";
import { formatNumber } from "@/lib/format";
import type { SearchFacet, SearchFilters, SearchFlag, SearchRequest, SearchSort, SearchView } from "@/lib/search/types";

export const FACET_TITLES: Record<SearchFacet, string> = {
  reactionClass: "Reaction class",
  phase: "Phase",
  methodCategory: "How the values were obtained",
  bathGas: "Bath gas",
  licence: "Licence",
  sourceYear: "Year of the source publication",
  flags: "Findings of the re-fit",
  creator: "Author",
};

export const FLAG_LABELS: Record<SearchFlag, string> = {
  outliers: "Has outlying points",
  curved: "Curved Arrhenius plot",
  unit_suspect: "Units may be wrong",
  reported_disagrees: "Authors' expression differs from the re-fit",
  none: "No findings",
};

export const SORT_LABELS: Record<SearchSort, string> = {
  relevance: "Best match",
  newest: "Newest first",
  widest: "Widest temperature range",
  points: "Most points",
};

export const VIEW_LABELS: Record<SearchView, string> = {
  datasets: "Datasets",
  reactions: "Reactions",
};

/** The label a facet value is shown with (our vocabulary's label where there is one, else the value itself). */
export function facetValueLabel(facet: SearchFacet, value: string): string {
  switch (facet) {
    case "reactionClass":
      return reactionClassFor(value)?.label ?? value;
    case "phase":
      return PHASES.find((p) => p.id === value)?.label ?? value;
    case "methodCategory":
      return METHOD_CATEGORIES.find((m) => m.id === value)?.label ?? value;
    case "flags":
      return (FLAG_LABELS as Record<string, string>)[value] ?? value;
    default:
      return value;
  }
}

/** A longer description of a facet value where the label is short (the licence's full name), else undefined. */
export function facetValueTitle(facet: SearchFacet, value: string): string | undefined {
  if (facet === "licence") return LICENCES.find((l) => l.id === value)?.label;
  if (facet === "reactionClass") return reactionClassFor(value)?.hint;
  return undefined;
}

/** The list-valued filters, which are also facets. */
export const LIST_FILTERS = ["reactionClass", "phase", "methodCategory", "bathGas", "licence", "flags", "creator"] as const;
export type ListFilter = (typeof LIST_FILTERS)[number];

/** Filters one by one: what a reader narrowed by, and what dropping it does. */
export interface ActiveFilter {
  /** Stable key of this filter (a facet value, or a window). */
  key: string;
  /** In words: "Reaction class: H-atom abstraction", "Temperature: overlaps 300–500 K". */
  words: string;
  /** The request without this filter (first page again). */
  without: SearchRequest;
}

const bound = (v: number) => formatNumber(v, 6);

/** A window in words: "300–500 K", "at least 300 K", "at most 500 K". */
export function windowWords(min: number | null, max: number | null, unit: string): string {
  const u = unit ? ` ${unit}` : "";
  if (min !== null && max !== null) return `${bound(min)}–${bound(max)}${u}`;
  if (min !== null) return `from ${bound(min)}${u}`;
  if (max !== null) return `up to ${bound(max)}${u}`;
  return "any";
}

/** The request with filters changed and the paging started again (a cursor belongs to the filters it came with). */
export function withFilters(request: SearchRequest, change: Partial<SearchFilters>): SearchRequest {
  return { ...request, filters: { ...request.filters, ...change }, cursor: null };
}

/** The request with one facet value switched on or off. */
export function withFacetValue(request: SearchRequest, facet: ListFilter, value: string, on: boolean): SearchRequest {
  const current = request.filters[facet] as string[];
  const next = on ? (current.includes(value) ? current : [...current, value]) : current.filter((v) => v !== value);
  return withFilters(request, { [facet]: next } as Partial<SearchFilters>);
}

/** The source-year facet narrows the year range (yearMin … yearMax) to one year. */
export function withYear(request: SearchRequest, year: number): SearchRequest {
  return withFilters(request, { yearMin: year, yearMax: year });
}

/** Every filter in force, in the order the page shows them, each with the request that drops it. */
export function activeFilters(request: SearchRequest): ActiveFilter[] {
  const f = request.filters;
  const out: ActiveFilter[] = [];
  for (const facet of LIST_FILTERS) {
    for (const value of f[facet] as string[]) {
      out.push({
        key: `${facet}:${value}`,
        words: `${FACET_TITLES[facet]}: ${facetValueLabel(facet, value)}`,
        without: withFacetValue(request, facet, value, false),
      });
    }
  }
  if (f.tMin !== null || f.tMax !== null) {
    out.push({
      key: "temperature",
      words: `Temperature: ${
        f.tCovers
          ? `measured over all of ${windowWords(f.tMin, f.tMax, "K")}`
          : f.tMin !== null && f.tMax !== null
            ? `measured somewhere in ${windowWords(f.tMin, f.tMax, "K")}`
            : f.tMin !== null
              ? `measured somewhere at or above ${windowWords(f.tMin, null, "K").replace(/^from /, "")}`
              : `measured somewhere at or below ${windowWords(null, f.tMax, "K").replace(/^up to /, "")}`
      }`,
      without: withFilters(request, { tMin: null, tMax: null, tCovers: false }),
    });
  }
  if (f.pMin !== null || f.pMax !== null) {
    out.push({
      key: "pressure",
      words: `Pressure: ${windowWords(f.pMin, f.pMax, "Pa")}`,
      without: withFilters(request, { pMin: null, pMax: null }),
    });
  }
  if (f.yearMin !== null || f.yearMax !== null) {
    const words = f.yearMin !== null && f.yearMin === f.yearMax ? String(f.yearMin) : windowWords(f.yearMin, f.yearMax, "");
    out.push({
      key: "year",
      words: `Source published: ${words}`,
      without: withFilters(request, { yearMin: null, yearMax: null }),
    });
  }
  return out;
}
