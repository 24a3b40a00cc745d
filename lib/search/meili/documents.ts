import "server-only";
import { inArray } from "drizzle-orm";
import { getDb } from "@/db/client";
import { searchDocuments, searchReactionSummaries } from "@/db/search";
import type { ReactionHit, SearchDocument } from "@/lib/search/types";

/**
 * The current search documents of these versions, as the PostgreSQL engine keeps them (written in
 * the transaction of each change, lib/search/documents.ts): Meilisearch receives exactly what
 * PostgreSQL searches. A version without a row is no longer public.
 */
export async function loadSearchDocuments(versionIds: number[]): Promise<SearchDocument[]> {
  if (!versionIds.length) return [];
  const rows = await getDb()
    .select({
      versionId: searchDocuments.versionId,
      datasetId: searchDocuments.datasetId,
      versionNumber: searchDocuments.versionNumber,
      latest: searchDocuments.latest,
      retracted: searchDocuments.retracted,
      versionIdentifier: searchDocuments.versionIdentifier,
      title: searchDocuments.title,
      description: searchDocuments.description,
      keywords: searchDocuments.keywords,
      creators: searchDocuments.creators,
      technique: searchDocuments.technique,
      source: searchDocuments.source,
      sourceYear: searchDocuments.sourceYear,
      reactionId: searchDocuments.reactionId,
      reactionKey: searchDocuments.reactionKey,
      equation: searchDocuments.equation,
      reactantKeys: searchDocuments.reactantKeys,
      productKeys: searchDocuments.productKeys,
      speciesNames: searchDocuments.speciesNames,
      formulas: searchDocuments.formulas,
      reactionClass: searchDocuments.reactionClass,
      phase: searchDocuments.phase,
      methodCategory: searchDocuments.methodCategory,
      bathGases: searchDocuments.bathGases,
      licence: searchDocuments.licence,
      tMin: searchDocuments.tMin,
      tMax: searchDocuments.tMax,
      pMin: searchDocuments.pMin,
      pMax: searchDocuments.pMax,
      pointCount: searchDocuments.pointCount,
      flags: searchDocuments.flags,
      ea: searchDocuments.ea,
      a: searchDocuments.a,
      aUnit: searchDocuments.aUnit,
      publishedAt: searchDocuments.publishedAt,
    })
    .from(searchDocuments)
    .where(inArray(searchDocuments.versionId, versionIds));
  return rows.map((r) => ({
    ...r,
    id: String(r.versionId),
    flags: r.flags as SearchDocument["flags"],
    publishedAt: r.publishedAt.toISOString(),
  }));
}

/** The reactions view's consensus and spread, kept in PostgreSQL beside the documents. */
export async function loadReactionSummaries(reactionIds: number[]): Promise<Map<number, Pick<ReactionHit, "consensus" | "spread">>> {
  if (!reactionIds.length) return new Map();
  const rows = await getDb()
    .select({
      reactionId: searchReactionSummaries.reactionId,
      consensus: searchReactionSummaries.consensus,
      spread: searchReactionSummaries.spread,
    })
    .from(searchReactionSummaries)
    .where(inArray(searchReactionSummaries.reactionId, reactionIds));
  return new Map(rows.map((r) => [r.reactionId, { consensus: (r.consensus as ReactionHit["consensus"]) ?? null, spread: r.spread }]));
}
