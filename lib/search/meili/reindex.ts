import "server-only";
import { meilisearchConfig } from "@/lib/config";
import { applyIndexSettings, meiliIndex, waitForSuccess } from "./client";
import { countSearchDocuments, listSearchDocumentIdsAfter, loadSearchDocuments } from "@/lib/search/queries";
import { MAX_TOTAL_HITS, toIndexedDocument } from "./index-settings";

/**
 * Rebuilds the Meilisearch index from PostgreSQL's search documents: settings first, then every
 * document in batches (each confirmed by the service before the next), then the index's documents
 * that no longer exist in PostgreSQL are deleted. Outbox rows are left alone: draining them after
 * this only sends current states again.
 */
export async function reindexMeilisearch({
  batchSize = 1000,
  onProgress,
}: { batchSize?: number; onProgress?: (done: number, total: number) => void } = {}): Promise<{ written: number; deleted: number }> {
  const config = meilisearchConfig();
  const { client, index } = meiliIndex(config);
  await applyIndexSettings(config);
  const total = await countSearchDocuments();
  const kept = new Set<string>();
  let last = 0;
  for (;;) {
    const ids = await listSearchDocumentIdsAfter({ after: last, limit: batchSize });
    if (!ids.length) break;
    last = ids[ids.length - 1];
    const docs = await loadSearchDocuments(ids);
    await waitForSuccess(client, index.addDocuments(docs.map(toIndexedDocument), { primaryKey: "id" }));
    for (const d of docs) kept.add(d.id);
    onProgress?.(kept.size, total);
  }
  const indexed = await index.search<{ id: string }>("", { attributesToRetrieve: ["id"], limit: MAX_TOTAL_HITS });
  const stale = indexed.hits.map((h) => String(h.id)).filter((id) => !kept.has(id));
  if (stale.length) await waitForSuccess(client, index.deleteDocuments(stale));
  return { written: kept.size, deleted: stale.length };
}
