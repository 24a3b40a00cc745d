/**
 * The contract of search: what a reader asks for, what an engine is given, and what comes back.
 * Both engines (PostgreSQL, the default; Meilisearch when MEILISEARCH_URL is set) implement
 * `SearchEngine` over the same `SearchDocument`s and must return the same hits for the same
 * `EngineQuery` (tests/integration/search-conformance.ts, run by search-postgres.test.ts and search-meili.test.ts).
 *
 * Only published and retracted versions ever become search documents; drafts, submissions and
 * declined datasets never reach an engine, so no engine can leak them (not even in facet counts).
 */

export const SEARCH_VIEWS = ["datasets", "reactions"] as const;
export type SearchView = (typeof SEARCH_VIEWS)[number];

export const SEARCH_SORTS = ["relevance", "newest", "widest", "points"] as const;
export type SearchSort = (typeof SEARCH_SORTS)[number];

/** Flags a reader can filter on; "none" = a dataset with none of the others. */
export const SEARCH_FLAGS = ["outliers", "curved", "unit_suspect", "reported_disagrees", "none"] as const;
export type SearchFlag = (typeof SEARCH_FLAGS)[number];

/** Facets with live counts, in the order the page shows them. */
export const SEARCH_FACETS = ["reactionClass", "phase", "methodCategory", "bathGas", "licence", "sourceYear", "flags", "creator"] as const;
export type SearchFacet = (typeof SEARCH_FACETS)[number];

/** Filters; every list is "any of", lists of different facets combine with "and". Temperatures in K, pressures in Pa. */
export interface SearchFilters {
  reactionClass: string[];
  phase: string[];
  methodCategory: string[];
  bathGas: string[];
  licence: string[];
  flags: SearchFlag[];
  creator: string[];
  /** Temperature window: datasets whose measured range overlaps [tMin, tMax] (either bound may be open). */
  tMin: number | null;
  tMax: number | null;
  /** When true, the measured range must cover the whole window instead of overlapping it. */
  tCovers: boolean;
  pMin: number | null;
  pMax: number | null;
  yearMin: number | null;
  yearMax: number | null;
}

/** A validated request (from the URL of /search or the query string of GET /api/v1/search). */
export interface SearchRequest {
  /** As typed, trimmed; "" = everything. At most 500 characters. */
  q: string;
  view: SearchView;
  filters: SearchFilters;
  sort: SearchSort;
  /** Opaque, tamper-evident cursor from a previous answer's `nextCursor`, or null for the first page. */
  cursor: string | null;
  /** 1…100, default 20. */
  limit: number;
}

/**
 * The text, understood. A species term is resolved (name, synonym, Hill formula, SMILES, InChI or
 * InChIKey → the InChIKeys it may mean) before any engine sees it, from the species tables.
 */
export type ParsedQuery =
  | { kind: "all" }
  | { kind: "text"; text: string }
  /** One species: datasets whose reaction has it on either side. Several keys = a name shared by several structures. */
  | { kind: "species"; term: string; inchiKeys: string[] }
  /**
   * A reaction pattern: every reactant term must be among the reactants (any order); every product
   * term among the products; `otherReactants` = "*" was written ("OH + *"). Each inner array holds
   * the InChIKeys one term may mean.
   */
  | { kind: "reaction"; reactants: string[][]; products: string[][]; otherReactants: boolean }
  /** A reaction key typed or pasted as such. */
  | { kind: "reactionKey"; key: string };

/** What an engine is asked: the parsed text plus the reader's filters, sort and page. */
export interface EngineQuery {
  parsed: ParsedQuery;
  view: SearchView;
  filters: SearchFilters;
  sort: SearchSort;
  /** Decoded cursor (engine-specific position), null for the first page. */
  after: string | null;
  limit: number;
}

/** One published or retracted dataset version, as both engines index it. Numbers in canonical units (K, Pa, J mol⁻¹). */
export interface SearchDocument {
  /** String form of versionId (Meilisearch's primary key). */
  id: string;
  versionId: number;
  datasetId: number;
  versionNumber: number;
  /** True for the newest public version of its dataset; only those are listed (older ones stay reachable from it). */
  latest: boolean;
  retracted: boolean;
  versionIdentifier: string | null;
  title: string;
  description: string;
  keywords: string[];
  creators: string[];
  technique: string;
  /** The source publication as one line (formatted reference and/or DOI), "" when none. */
  source: string;
  sourceYear: number | null;
  reactionId: number;
  reactionKey: string;
  equation: string;
  reactantKeys: string[];
  productKeys: string[];
  /** Every name (published names and synonyms) and Hill formula of the reaction's species. */
  speciesNames: string[];
  formulas: string[];
  reactionClass: string;
  phase: string;
  methodCategory: string;
  bathGases: string[];
  licence: string;
  tMin: number;
  tMax: number;
  pMin: number | null;
  pMax: number | null;
  pointCount: number;
  flags: SearchFlag[];
  /** Re-fit (Arrhenius) activation energy in J mol⁻¹ and A in the canonical unit for the reaction's order; null if not fitted. */
  ea: number | null;
  a: number | null;
  /** The canonical unit A is in, in the files' ASCII spelling ("cm3 molecule-1 s-1"; pages show unitLabel of it). */
  aUnit: string | null;
  /** ISO 8601. */
  publishedAt: string;
}

/** A row of the datasets view. */
export type DatasetHit = Pick<
  SearchDocument,
  | "versionId"
  | "datasetId"
  | "versionNumber"
  | "versionIdentifier"
  | "retracted"
  | "title"
  | "equation"
  | "reactionKey"
  | "reactionClass"
  | "methodCategory"
  | "tMin"
  | "tMax"
  | "pointCount"
  | "ea"
  | "a"
  | "aUnit"
  | "flags"
  | "creators"
  | "publishedAt"
>;

/** A row of the reactions view. */
export interface ReactionHit {
  reactionId: number;
  reactionKey: string;
  equation: string;
  /** Matching datasets that count as evidence (their listed version is published, not retracted). */
  datasetCount: number;
  /** Matching datasets whose listed version is retracted: found and shown, never counted as evidence. */
  retractedCount: number;
  /** The temperatures the counted datasets cover together; null when every match is retracted. */
  tMin: number | null;
  tMax: number | null;
  /** The consensus expression over the reader's default selection, null with fewer than two datasets. */
  consensus: {
    model: "arrhenius" | "modified_arrhenius";
    a: number;
    n: number;
    ea: number;
    aUnit: string;
    tMin: number;
    tMax: number;
  } | null;
  /**
   * Largest/smallest k of the datasets' own preferred fits (the model each analysis prefers) at the
   * middle of their common range in 1/T, as a factor ≥ 1; null with fewer than two. Over every published
   * dataset of the reaction (the search's filters do not narrow it, as they do not narrow the consensus);
   * retracted ones never count.
   */
  spread: number | null;
}

export interface FacetCount {
  value: string;
  count: number;
}

export interface SearchResult {
  view: SearchView;
  /** Total matches (datasets or reactions), before paging. */
  total: number;
  hits: DatasetHit[] | ReactionHit[];
  /** Counts over the matches with every other facet's filter applied ("live" counts). */
  facets: Record<SearchFacet, FacetCount[]>;
  /** Engine-specific position after the last hit, null on the last page. */
  nextAfter: string | null;
}

/** A search engine. The PostgreSQL engine writes its documents in the publishing transaction; Meilisearch is fed from an outbox. */
export interface SearchEngine {
  readonly name: "postgres" | "meilisearch";
  search(query: EngineQuery): Promise<SearchResult>;
}

/** What GET /api/v1/search answers, and what the /search page renders first (lib/search searchAnswer). */
export interface SearchAnswer {
  query: SearchRequest;
  /** What the text was understood as, in words ("Species: methane (CH4)"). */
  parsed: string;
  /** The same as the engines take it. */
  understood: ParsedQuery;
  total: number;
  hits: DatasetHit[] | ReactionHit[];
  facets: Record<SearchFacet, FacetCount[]>;
  nextCursor: string | null;
  caution: string;
}
