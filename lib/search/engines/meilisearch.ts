import "server-only";
import type { Meilisearch, MultiSearchQuery, SearchResponse } from "meilisearch";
import { meiliIndex } from "@/lib/search/meili/client";
import { loadReactionSummaries } from "@/lib/search/queries";
import { FACET_ATTRIBUTES, buildFilter, facetConditions, textPart, type MeiliFilter } from "@/lib/search/meili/filter";
import { MAX_TOTAL_HITS, type IndexedDocument } from "@/lib/search/meili/index-settings";
import {
  SEARCH_FACETS,
  type DatasetHit,
  type EngineQuery,
  type FacetCount,
  type ReactionHit,
  type SearchEngine,
  type SearchFacet,
  type SearchResult,
  type SearchSort,
} from "@/lib/search/types";

const DATASET_HIT_FIELDS = [
  "versionId",
  "datasetId",
  "versionNumber",
  "versionIdentifier",
  "retracted",
  "title",
  "equation",
  "reactionKey",
  "reactionClass",
  "methodCategory",
  "tMin",
  "tMax",
  "pointCount",
  "ea",
  "a",
  "aUnit",
  "flags",
  "creators",
  "publishedAt",
] as const satisfies readonly (keyof DatasetHit)[];

/** Sort keys; the last one (versionId) makes every order total, so pages never overlap. */
const SORTS: Record<Exclude<SearchSort, "relevance">, string[]> = {
  newest: ["publishedTs:desc", "versionId:desc"],
  widest: ["tSpan:desc", "versionId:desc"],
  points: ["pointCount:desc", "versionId:desc"],
};

/** What a reaction row needs beyond what the index holds (consensus and spread come from PostgreSQL). */
export type ReactionSummaries = (reactionIds: number[]) => Promise<Map<number, Pick<ReactionHit, "consensus" | "spread">>>;

type Counted = SearchResponse<IndexedDocument> & { totalHits?: number };

const emptyFacets = () => Object.fromEntries(SEARCH_FACETS.map((f) => [f, []])) as unknown as Record<SearchFacet, FacetCount[]>;

/**
 * The Meilisearch engine. One multi-search per request: the page of hits; the count with every
 * filter (and the distribution of each facet the reader left alone); one query per facet the reader
 * narrowed, with every other facet's filter applied (Meilisearch counts with all filters applied).
 * The cursor is an offset into the sorted matches (every sort ends with versionId, so the order is
 * total and pages neither overlap nor skip). The reactions view, as the PostgreSQL engine orders it:
 * by relevance or newest through `distinct: reactionId` (a reaction ranks as its best dataset),
 * and by widest range or most points (over all its matching datasets, which Meilisearch cannot
 * add up) by grouping every match here; reactions are counted from the reactionId distribution.
 */
export class MeilisearchEngine implements SearchEngine {
  readonly name = "meilisearch" as const;

  constructor(
    private readonly summarise: ReactionSummaries = loadReactionSummaries,
    private readonly config?: Parameters<typeof meiliIndex>[0],
  ) {}

  async search(query: EngineQuery): Promise<SearchResult> {
    const { parsed, filters, view, limit } = query;
    const { q } = textPart(parsed);
    // Text without a word in it ("%_\\") matches nothing (Meilisearch would take it as "everything").
    if (parsed.kind === "text" && !/[\p{L}\p{N}]/u.test(parsed.text))
      return { view, total: 0, hits: [], facets: emptyFacets(), nextAfter: null };
    const { client, uid } = meiliIndex(this.config);
    const offset = parseOffset(query.after);
    const sort = query.sort === "relevance" ? (q ? undefined : SORTS.newest) : SORTS[query.sort];
    const narrowed = SEARCH_FACETS.filter((f) => facetConditions(f, filters).length > 0);
    const untouched = SEARCH_FACETS.filter((f) => !narrowed.includes(f));
    const base = { indexUid: uid, q, matchingStrategy: "all" } as const;
    const count = (filter: MeiliFilter, facets: string[]): MultiSearchQuery => ({ ...base, filter, facets, page: 1, hitsPerPage: 0 });
    const full = buildFilter(parsed, filters);
    const grouped = view === "reactions" && (query.sort === "widest" || query.sort === "points");
    const pageQuery: MultiSearchQuery = grouped
      ? {
          ...base,
          filter: full,
          attributesToRetrieve: ["reactionId", "reactionKey", "equation", "tMin", "tMax", "pointCount", "retracted"],
          limit: MAX_TOTAL_HITS,
        }
      : view === "reactions"
        ? {
            ...base,
            filter: full,
            sort,
            offset,
            limit,
            distinct: "reactionId",
            attributesToRetrieve: ["reactionId", "reactionKey", "equation"],
          }
        : { ...base, filter: full, sort, offset, limit, attributesToRetrieve: [...DATASET_HIT_FIELDS] };
    const queries = [
      pageQuery,
      count(full, [...untouched.map((f) => FACET_ATTRIBUTES[f]), ...(view === "reactions" ? ["reactionId"] : [])]),
      ...narrowed.map((f) => count(buildFilter(parsed, filters, f), [FACET_ATTRIBUTES[f]])),
      // The reactions view counts retracted matches apart: they are shown, never evidence.
      ...(view === "reactions" ? [count([...full, "retracted = true"], ["reactionId"])] : []),
    ];
    const { results } = await client.multiSearch({ queries });
    const [page, total, ...rest] = results as unknown as Counted[];
    const perFacet = rest.slice(0, narrowed.length);
    const retractedPerReaction = view === "reactions" ? (rest[narrowed.length]?.facetDistribution?.reactionId ?? {}) : {};
    const distribution = (facet: SearchFacet): Record<string, number> => {
      const i = narrowed.indexOf(facet);
      return (i >= 0 ? perFacet[i] : total).facetDistribution?.[FACET_ATTRIBUTES[facet]] ?? {};
    };
    const facets = Object.fromEntries(SEARCH_FACETS.map((f) => [f, facetCounts(distribution(f))])) as Record<SearchFacet, FacetCount[]>;
    const next = (shown: number, matches: number) => (offset + shown < matches ? String(offset + shown) : null);

    if (view === "datasets") {
      const matches = total.totalHits ?? 0;
      const hits = page.hits.map((h) => Object.fromEntries(DATASET_HIT_FIELDS.map((k) => [k, h[k]])) as DatasetHit);
      return { view, total: matches, hits, facets, nextAfter: next(hits.length, matches) };
    }
    const perReaction = total.facetDistribution?.reactionId ?? {};
    const matches = Object.keys(perReaction).length;
    const rows: Pick<Matched, "reactionId" | "reactionKey" | "equation">[] = grouped
      ? groupByReaction(page.hits, query.sort as "widest" | "points").slice(offset, offset + limit)
      : page.hits;
    const reactionIds = rows.map((h) => h.reactionId);
    const [ranges, summaries] = await Promise.all([
      grouped ? new Map((rows as Grouped[]).map((r) => [r.reactionId, r])) : this.temperatureRanges(client, uid, full, q, reactionIds),
      this.summarise(reactionIds),
    ]);
    const hits: ReactionHit[] = rows.map((h) => ({
      reactionId: h.reactionId,
      reactionKey: h.reactionKey,
      equation: h.equation,
      datasetCount: (perReaction[String(h.reactionId)] ?? 0) - (retractedPerReaction[String(h.reactionId)] ?? 0),
      retractedCount: retractedPerReaction[String(h.reactionId)] ?? 0,
      tMin: ranges.get(h.reactionId)?.tMin ?? null,
      tMax: ranges.get(h.reactionId)?.tMax ?? null,
      consensus: summaries.get(h.reactionId)?.consensus ?? null,
      spread: summaries.get(h.reactionId)?.spread ?? null,
    }));
    return { view, total: matches, hits, facets, nextAfter: next(hits.length, matches) };
  }

  /** The temperature range each reaction's matching datasets that count (not retracted) cover together (a second query, over this page's reactions). */
  private async temperatureRanges(client: Meilisearch, uid: string, filter: MeiliFilter, q: string, reactionIds: number[]) {
    const ranges = new Map<number, { tMin: number | null; tMax: number | null }>();
    if (!reactionIds.length) return ranges;
    const res = await client.index<IndexedDocument>(uid).search(q, {
      filter: [...filter, `reactionId IN [${reactionIds.join(", ")}]`, "retracted = false"],
      attributesToRetrieve: ["reactionId", "tMin", "tMax"],
      matchingStrategy: "all",
      limit: MAX_TOTAL_HITS,
    });
    for (const h of res.hits) {
      const r = ranges.get(h.reactionId);
      ranges.set(h.reactionId, { tMin: Math.min(r?.tMin ?? Infinity, h.tMin), tMax: Math.max(r?.tMax ?? -Infinity, h.tMax) });
    }
    return ranges;
  }
}

/** The engine of the configuration (MEILISEARCH_URL, MEILISEARCH_API_KEY, MEILISEARCH_INDEX), read at each search. */
export const meilisearchEngine = new MeilisearchEngine();

type Matched = Pick<IndexedDocument, "reactionId" | "reactionKey" | "equation" | "tMin" | "tMax" | "pointCount" | "retracted">;
type Grouped = Pick<Matched, "reactionId" | "reactionKey" | "equation" | "pointCount"> & { tMin: number | null; tMax: number | null };

/**
 * Reactions of all matches, ordered as the PostgreSQL engine orders them: widest range, or most
 * points, of the datasets that count (retracted ones are no evidence; -1 / 0 when all are); then reactionId.
 */
function groupByReaction(matches: Matched[], sort: "widest" | "points"): Grouped[] {
  const groups = new Map<number, Grouped>();
  for (const m of matches) {
    const g = groups.get(m.reactionId) ?? {
      reactionId: m.reactionId,
      reactionKey: m.reactionKey,
      equation: m.equation,
      tMin: null,
      tMax: null,
      pointCount: 0,
    };
    if (!m.retracted) {
      g.tMin = Math.min(g.tMin ?? Infinity, m.tMin);
      g.tMax = Math.max(g.tMax ?? -Infinity, m.tMax);
      g.pointCount += m.pointCount;
    }
    groups.set(m.reactionId, g);
  }
  const key = (g: Grouped) => (sort === "widest" ? (g.tMin === null || g.tMax === null ? -1 : g.tMax - g.tMin) : g.pointCount);
  return [...groups.values()].sort((x, y) => key(y) - key(x) || y.reactionId - x.reactionId);
}

/** The cursor's offset; anything else than a whole number ≥ 0 starts at the top. */
function parseOffset(after: string | null): number {
  const n = after === null ? 0 : Number(after);
  return Number.isSafeInteger(n) && n >= 0 ? n : 0;
}

/** Most values listed per facet, as the PostgreSQL engine lists them: largest count first, then by value. */
const FACET_VALUES = 50;

function facetCounts(distribution: Record<string, number>): FacetCount[] {
  return Object.entries(distribution)
    .map(([value, count]) => ({ value, count }))
    .filter((c) => c.count > 0)
    .sort((x, y) => y.count - x.count || (x.value < y.value ? -1 : x.value > y.value ? 1 : 0))
    .slice(0, FACET_VALUES);
}
