import "server-only";
import type { Meilisearch, MultiSearchQuery, SearchResponse } from "meilisearch";
import { meiliIndex } from "@/lib/search/meili/client";
import { loadReactionSummaries } from "@/lib/search/meili/documents";
import { FACET_ATTRIBUTES, buildFilter, facetConditions, textPart, type MeiliFilter } from "@/lib/search/meili/filter";
import type { IndexedDocument } from "@/lib/search/meili/index-settings";
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

/**
 * The Meilisearch engine. One multi-search per request: the page of hits; the count with every
 * filter (and the distribution of each facet the reader left alone); one query per facet the reader
 * narrowed, with every other facet's filter applied (Meilisearch counts with all filters applied);
 * for "flags", one more for datasets without any flag. The cursor is an offset into the sorted
 * matches (every sort ends with versionId, so the order is total); the reactions view asks for
 * `distinct: reactionId` and counts reactions from the reactionId distribution.
 */
export class MeilisearchEngine implements SearchEngine {
  readonly name = "meilisearch" as const;
  private readonly client: Meilisearch;
  private readonly indexUid: string;

  constructor(
    private readonly summarise: ReactionSummaries = loadReactionSummaries,
    config?: Parameters<typeof meiliIndex>[0],
  ) {
    const { client, uid } = meiliIndex(config);
    this.client = client;
    this.indexUid = uid;
  }

  async search(query: EngineQuery): Promise<SearchResult> {
    const { parsed, filters, view, limit } = query;
    const { q } = textPart(parsed);
    const offset = parseOffset(query.after);
    const sort = query.sort === "relevance" ? (q ? undefined : SORTS.newest) : SORTS[query.sort];
    const narrowed = SEARCH_FACETS.filter((f) => facetConditions(f, filters).length > 0);
    const untouched = SEARCH_FACETS.filter((f) => !narrowed.includes(f));
    const count = (filter: MeiliFilter, facets: string[]): MultiSearchQuery => ({
      indexUid: this.indexUid,
      q,
      filter,
      facets,
      page: 1,
      hitsPerPage: 0,
      matchingStrategy: "all",
    });
    const full = buildFilter(parsed, filters);
    const queries: MultiSearchQuery[] = [
      {
        indexUid: this.indexUid,
        q,
        filter: full,
        sort,
        offset,
        limit,
        matchingStrategy: "all",
        attributesToRetrieve: view === "reactions" ? ["reactionId", "reactionKey", "equation"] : [...DATASET_HIT_FIELDS],
        ...(view === "reactions" ? { distinct: "reactionId" } : {}),
      },
      count(full, [...untouched.map((f) => FACET_ATTRIBUTES[f]), ...(view === "reactions" ? ["reactionId"] : [])]),
      ...narrowed.map((f) => count(buildFilter(parsed, filters, f), [FACET_ATTRIBUTES[f]])),
      count([...buildFilter(parsed, filters, "flags"), "flags IS EMPTY"], []),
    ];
    const { results } = await this.client.multiSearch({ queries });
    const [page, total, ...rest] = results as unknown as Counted[];
    const unflagged = rest.pop()!.totalHits ?? 0;
    const distribution = (facet: SearchFacet): Record<string, number> => {
      const i = narrowed.indexOf(facet);
      return (i >= 0 ? rest[i] : total).facetDistribution?.[FACET_ATTRIBUTES[facet]] ?? {};
    };
    const facets = Object.fromEntries(
      SEARCH_FACETS.map((f) => [f, facetCounts(distribution(f), f === "flags" ? unflagged : 0)]),
    ) as Record<SearchFacet, FacetCount[]>;

    if (view === "datasets") {
      const matches = total.totalHits ?? 0;
      const hits = page.hits.map((h) => Object.fromEntries(DATASET_HIT_FIELDS.map((k) => [k, h[k]])) as DatasetHit);
      return { view, total: matches, hits, facets, nextAfter: offset + hits.length < matches ? String(offset + hits.length) : null };
    }
    const perReaction = total.facetDistribution?.reactionId ?? {};
    const reactionIds = page.hits.map((h) => h.reactionId);
    const [ranges, summaries] = await Promise.all([this.temperatureRanges(full, q, reactionIds), this.summarise(reactionIds)]);
    const hits: ReactionHit[] = page.hits.map((h) => ({
      reactionId: h.reactionId,
      reactionKey: h.reactionKey,
      equation: h.equation,
      datasetCount: perReaction[String(h.reactionId)] ?? 0,
      tMin: ranges.get(h.reactionId)?.tMin ?? 0,
      tMax: ranges.get(h.reactionId)?.tMax ?? 0,
      consensus: summaries.get(h.reactionId)?.consensus ?? null,
      spread: summaries.get(h.reactionId)?.spread ?? null,
    }));
    const matches = Object.keys(perReaction).length;
    return { view, total: matches, hits, facets, nextAfter: offset + hits.length < matches ? String(offset + hits.length) : null };
  }

  /** The temperature range each reaction's matching datasets cover together (a second query, over this page's reactions). */
  private async temperatureRanges(filter: MeiliFilter, q: string, reactionIds: number[]) {
    const ranges = new Map<number, { tMin: number; tMax: number }>();
    if (!reactionIds.length) return ranges;
    const res = await this.client.index<IndexedDocument>(this.indexUid).search(q, {
      filter: [...filter, `reactionId IN [${reactionIds.join(", ")}]`],
      attributesToRetrieve: ["reactionId", "tMin", "tMax"],
      matchingStrategy: "all",
      limit: 10_000,
    });
    for (const h of res.hits) {
      const r = ranges.get(h.reactionId);
      ranges.set(h.reactionId, { tMin: Math.min(r?.tMin ?? Infinity, h.tMin), tMax: Math.max(r?.tMax ?? -Infinity, h.tMax) });
    }
    return ranges;
  }
}

/** The cursor's offset; anything else than a whole number ≥ 0 starts at the top. */
function parseOffset(after: string | null): number {
  const n = after === null ? 0 : Number(after);
  return Number.isSafeInteger(n) && n >= 0 ? n : 0;
}

/** Counts largest first, then by value; "none" (datasets without a flag) joins the flags when there are any. */
function facetCounts(distribution: Record<string, number>, none: number): FacetCount[] {
  const counts = Object.entries(distribution).map(([value, count]) => ({ value, count }));
  if (none > 0) counts.push({ value: "none", count: none });
  return counts.filter((c) => c.count > 0).sort((x, y) => y.count - x.count || x.value.localeCompare(y.value));
}
