// PURE: an EngineQuery's text and filters as a Meilisearch filter. The filter is always in array
// form (outer array = AND, an inner array = OR of conditions), and every condition is one of
//   attr = value · attr IN [v, …] · attr >= number · attr <= number
// (values are JSON literals: quoted strings, numbers, true). tests/support/meili-stand-in.ts
// parses exactly this subset.
import { SEARCH_FACETS, type ParsedQuery, type SearchFacet, type SearchFilters } from "@/lib/search/types";

export type MeiliFilter = (string | string[])[];

/** The index attribute behind each facet (lists of the document are named in the plural). */
export const FACET_ATTRIBUTES: Record<SearchFacet, string> = {
  reactionClass: "reactionClass",
  phase: "phase",
  methodCategory: "methodCategory",
  bathGas: "bathGases",
  licence: "licence",
  sourceYear: "sourceYear",
  flags: "flags",
  creator: "creators",
};

const literal = (v: string | number | boolean) => JSON.stringify(v);
const anyOf = (attr: string, values: readonly (string | number)[]) => `${attr} IN [${values.map(literal).join(", ")}]`;

/** Conditions from the understood text; `q` is what goes to the full-text search ("" for none). */
export function textPart(parsed: ParsedQuery): { q: string; filter: MeiliFilter } {
  switch (parsed.kind) {
    case "all":
      return { q: "", filter: [] };
    case "text":
      return { q: parsed.text, filter: [] };
    case "species":
      return { q: "", filter: [[anyOf("reactantKeys", parsed.inchiKeys), anyOf("productKeys", parsed.inchiKeys)]] };
    case "reaction": {
      // Each term among its side's keys; other reactants and products may be there too.
      const filter: MeiliFilter = [
        ...parsed.reactants.map((keys) => anyOf("reactantKeys", keys)),
        ...parsed.products.map((keys) => anyOf("productKeys", keys)),
      ];
      return { q: "", filter };
    }
    case "reactionKey":
      return { q: "", filter: [`reactionKey = ${literal(parsed.key)}`] };
  }
}

/** One facet's own conditions (all required); empty when the reader chose nothing in it. */
export function facetConditions(facet: SearchFacet, filters: SearchFilters): MeiliFilter {
  if (facet === "sourceYear") {
    return [
      ...(filters.yearMin !== null ? [`sourceYear >= ${filters.yearMin}`] : []),
      ...(filters.yearMax !== null ? [`sourceYear <= ${filters.yearMax}`] : []),
    ];
  }
  const values = filters[facet];
  return values.length ? [anyOf(FACET_ATTRIBUTES[facet], values)] : [];
}

/** Temperature and pressure windows (not facets: they always apply). */
function windowConditions(filters: SearchFilters): string[] {
  const out: string[] = [];
  const { tMin, tMax, pMin, pMax } = filters;
  // "Covers" needs both ends of the window; with one open end it is an overlap.
  if (filters.tCovers && tMin !== null && tMax !== null) out.push(`tMin <= ${tMin}`, `tMax >= ${tMax}`);
  else {
    if (tMin !== null) out.push(`tMax >= ${tMin}`);
    if (tMax !== null) out.push(`tMin <= ${tMax}`);
  }
  if (pMin !== null) out.push(`pMax >= ${pMin}`);
  if (pMax !== null) out.push(`pMin <= ${pMax}`);
  return out;
}

/**
 * The whole filter: listed versions only, the text's conditions, the windows and every facet's
 * condition except `without`'s (the live count of a facet applies every other facet's filter).
 */
export function buildFilter(parsed: ParsedQuery, filters: SearchFilters, without?: SearchFacet): MeiliFilter {
  const facets = SEARCH_FACETS.filter((f) => f !== without).flatMap((f) => facetConditions(f, filters));
  return ["latest = true", ...textPart(parsed).filter, ...windowConditions(filters), ...facets];
}
