// npm run refit: re-fits every version whose newest analysis came from another engine version,
// with a progress bar. Safe to interrupt and run again (finished versions are current).
import { Presets, SingleBar } from "cli-progress";
import { ENGINE_VERSION } from "@/lib/datasets/prepare";
import { listStaleVersions, refitVersion } from "@/lib/datasets/refit";

const ids = await listStaleVersions();
console.log(`[arrhenia] engine ${ENGINE_VERSION}: ${ids.length} version(s) to re-fit`);
const bar = new SingleBar(
  { format: "  {bar} {value}/{total} versions | {refitted} re-fitted, {invalid} not fittable", hideCursor: true },
  Presets.shades_classic,
);
const counts = { refitted: 0, current: 0, invalid: 0 };
bar.start(ids.length, 0, counts);
for (const versionId of ids) {
  counts[await refitVersion({ versionId })]++;
  bar.increment(1, counts);
}
bar.stop();
console.log(
  `[arrhenia] done: ${counts.refitted} re-fitted, ${counts.current} already current, ${counts.invalid} could not be fitted (their analysis records why)`,
);
process.exit(0);
