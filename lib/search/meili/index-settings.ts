// PURE: what the Meilisearch index holds and how it is set up (applied by `npm run search:setup`).
import type { SearchDocument } from "@/lib/search/types";

/** A search document as indexed: the contract's fields plus two derived ones the engine sorts on. */
export type IndexedDocument = SearchDocument & {
  /** Publication time in seconds since 1970 (ISO strings do not sort as numbers). */
  publishedTs: number;
  /** Width of the measured temperature range, K ("widest" sort). */
  tSpan: number;
};

export function toIndexedDocument(doc: SearchDocument): IndexedDocument {
  return {
    ...doc,
    publishedTs: Math.floor(Date.parse(doc.publishedAt) / 1000),
    tSpan: doc.tMax - doc.tMin,
  };
}

/** Largest facet and result windows the engine relies on (facet counts over every reaction, deep offsets). */
export const MAX_FACET_VALUES = 10_000;
export const MAX_TOTAL_HITS = 1_000_000;

/** The index settings; searchable attributes in weight order (an earlier attribute ranks a match higher). */
export function indexSettings(synonyms: Record<string, string[]>) {
  return {
    searchableAttributes: [
      "title",
      "equation",
      "speciesNames",
      "formulas",
      "keywords",
      "creators",
      "technique",
      "source",
      "versionIdentifier",
      "reactionKey",
      "description",
    ],
    filterableAttributes: [
      "latest",
      "retracted",
      "datasetId",
      "reactionId",
      "reactionKey",
      "reactantKeys",
      "productKeys",
      "reactionClass",
      "phase",
      "methodCategory",
      "bathGases",
      "licence",
      "sourceYear",
      "flags",
      "creators",
      "tMin",
      "tMax",
      "pMin",
      "pMax",
    ],
    sortableAttributes: ["publishedTs", "tSpan", "pointCount", "versionId"],
    // "sort" first: a chosen order (newest, widest, points) decides, as in the PostgreSQL engine;
    // relevance is asked with no sort, and then the text rules decide.
    rankingRules: ["sort", "words", "typo", "proximity", "attribute", "exactness"],
    synonyms,
    faceting: { maxValuesPerFacet: MAX_FACET_VALUES },
    pagination: { maxTotalHits: MAX_TOTAL_HITS },
  };
}

/**
 * Synonyms from the species names: every name of a species stands for each of its other names
 * ("hydroxyl" finds "OH"). Keys are lower case, as Meilisearch normalises them.
 */
export function synonymsFromNames(namesBySpecies: string[][]): Record<string, string[]> {
  const out: Record<string, string[]> = {};
  for (const names of namesBySpecies) {
    const unique = [...new Set(names.map((n) => n.trim().toLowerCase()).filter(Boolean))];
    if (unique.length < 2) continue;
    for (const name of unique) out[name] = [...new Set([...(out[name] ?? []), ...unique.filter((n) => n !== name)])];
  }
  return out;
}
