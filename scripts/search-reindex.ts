// npm run search:reindex: rebuilds every search document of the PostgreSQL engine (and the reactions
// view's summaries) from the stored versions, with a progress bar. Safe to interrupt and run again.
import { Presets, SingleBar } from "cli-progress";
import { rebuildSearchDocuments } from "@/lib/search/documents";

const bar = new SingleBar({ format: "  {bar} {value}/{total} versions", hideCursor: true }, Presets.shades_classic);
let started = false;
const startedAt = Date.now();
const n = await rebuildSearchDocuments({
  onProgress: (done, total) => {
    if (!started) bar.start(total, 0);
    started = true;
    bar.update(done);
  },
});
if (started) bar.stop();
console.log(`[arrhenia] search documents rebuilt for ${n} version(s) in ${((Date.now() - startedAt) / 1000).toFixed(1)} s`);
process.exit(0);
