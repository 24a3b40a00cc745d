// npm run search:reindex: rebuilds every search document of the configured engine, with a progress
// bar. PostgreSQL (the default): the search documents and the reactions view's summaries, from the
// stored versions. Meilisearch (SEARCH_ENGINE=meilisearch or MEILISEARCH_URL set): the index, in
// batches, from PostgreSQL's documents (any public version still without one is built first).
// Safe to interrupt and run again.
import { Presets, SingleBar } from "cli-progress";
import { searchEngineName } from "@/lib/config";
import { rebuildSearchDocuments } from "@/lib/search/documents";
import { reindexMeilisearch } from "@/lib/search/meili/reindex";

const engine = searchEngineName();
const bar = new SingleBar(
  { format: `  {bar} {value}/{total} ${engine === "postgres" ? "versions" : "documents"}`, hideCursor: true },
  Presets.shades_classic,
);
let started = false;
const onProgress = (done: number, total: number) => {
  if (!started) bar.start(total, 0);
  started = true;
  bar.update(done);
};
const startedAt = Date.now();
const seconds = () => ((Date.now() - startedAt) / 1000).toFixed(1);
if (engine === "postgres") {
  const n = await rebuildSearchDocuments({ onProgress });
  if (started) bar.stop();
  console.log(`[arrhenia] search documents rebuilt for ${n} version(s) in ${seconds()} s`);
} else {
  const missing = await rebuildSearchDocuments({ onlyMissing: true });
  if (missing) console.log(`[arrhenia] ${missing} public version(s) had no search document yet: built`);
  const { written, deleted } = await reindexMeilisearch({ onProgress });
  if (started) bar.stop();
  console.log(`[arrhenia] Meilisearch index rebuilt: ${written} document(s) written, ${deleted} stale one(s) deleted, in ${seconds()} s`);
}
process.exit(0);
