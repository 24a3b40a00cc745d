/**
 * Throughput of the kinetics engine on one core: full single-dataset analyses per second
 * (2- and 3-parameter fits, Eyring, diagnostics, band, flags), one consensus over 10⁶ points and
 * one of reaction-page size (two-stage random effects with every dataset compared with the others).
 * Run with `npm run bench:kinetics`. Not a test: prints a table and the targets.
 */
import { analyseDataset, consensus, GAS_CONSTANT, type ConsensusDataset, type RatePoint } from "@/lib/kinetics";
import { seededRandom } from "@/lib/seeded-random";

/** Deterministic pseudo-random numbers so runs are comparable. */
const makeRandom = seededRandom;

function normal(rand: () => number): number {
  return Math.sqrt(-2 * Math.log(1 - rand())) * Math.cos(2 * Math.PI * rand());
}

function makeDataset(n: number, rand: () => number, offset = 0, weighted = false): RatePoint[] {
  const pts: RatePoint[] = [];
  for (let i = 0; i < n; i++) {
    const T = 250 + (750 * i) / Math.max(1, n - 1) + rand();
    const lnk = Math.log(2.5e-12) + 0.8 * Math.log(T / 298.15) - 12000 / (GAS_CONSTANT * T) + offset + 0.05 * normal(rand);
    pts.push(weighted ? { T, k: Math.exp(lnk), sigmaLnK: 0.05 } : { T, k: Math.exp(lnk) });
  }
  return pts;
}

/** Best of several timed rounds: the machine may be shared, the best round is the engine's speed. */
function timeAnalyses(n: number, rounds: number, roundMs: number): { best: number; median: number } {
  const rand = makeRandom(42 + n);
  const pool = Array.from({ length: 64 }, (_, j) => makeDataset(n, rand, 0, j % 2 === 0));
  for (let i = 0; i < 5000; i++) analyseDataset({ points: pool[i % 64], order: 2 }); // warm-up
  const rates: number[] = [];
  for (let r = 0; r < rounds; r++) {
    let count = 0;
    const start = performance.now();
    let elapsed = 0;
    while (elapsed < roundMs) {
      for (let i = 0; i < 500; i++) analyseDataset({ points: pool[(count + i) % 64], order: 2 });
      count += 500;
      elapsed = performance.now() - start;
    }
    rates.push((count / elapsed) * 1000);
  }
  rates.sort((a, b) => a - b);
  return { best: rates[rates.length - 1], median: rates[Math.floor(rates.length / 2)] };
}

/**
 * One consensus over datasets of equal size. With stored, each dataset comes with the outliers of
 * its own analysis, as a reaction page has them from the stored analyses (made before the timing);
 * without, the consensus analyses every dataset itself.
 */
function timeConsensus(totalPoints: number, datasets: number, rounds: number, stored = true): { best: number; median: number } {
  const rand = makeRandom(7);
  const per = Math.floor(totalPoints / datasets);
  const sets: ConsensusDataset[] = Array.from({ length: datasets }, (_, j) => {
    const points = makeDataset(per, rand, 0.1 * normal(rand), j % 3 === 0);
    const outliers = stored ? (analyseDataset({ points, order: 2 }).flags.find((f) => f.code === "outlier")?.points ?? []) : undefined;
    return { id: `set-${j}`, order: 2, points, outliers };
  });
  consensus(sets.slice(0, 5)); // warm-up
  const times: number[] = [];
  for (let r = 0; r < rounds; r++) {
    const start = performance.now();
    consensus(sets);
    times.push(performance.now() - start);
  }
  times.sort((a, b) => a - b);
  return { best: times[0], median: times[Math.floor(times.length / 2)] };
}

const mb = (bytes: number) => `${(bytes / 1048576).toFixed(0)} MB`;
const rows: [string, string, string, string][] = [];
const fmtRate = (v: number) => Math.round(v).toLocaleString("en");
const ten = timeAnalyses(10, 7, 400);
rows.push(["analyses/s, 10 points", fmtRate(ten.best), fmtRate(ten.median), "≥ 50,000"]);
const hundred = timeAnalyses(100, 7, 400);
rows.push(["analyses/s, 100 points", fmtRate(hundred.best), fmtRate(hundred.median), "≥ 10,000"]);
for (const datasets of [1000, 100]) {
  const c = timeConsensus(1_000_000, datasets, 3);
  rows.push([`consensus, 10⁶ points in ${datasets} datasets`, `${c.best.toFixed(0)} ms`, `${c.median.toFixed(0)} ms`, "< 2000 ms"]);
}
const fresh = timeConsensus(1_000_000, 1000, 3, false);
rows.push(["same, 1000 datasets, no stored outliers", `${fresh.best.toFixed(0)} ms`, `${fresh.median.toFixed(0)} ms`, "< 2000 ms"]);
// A reaction page: a few dozen datasets of ordinary size, every leave-one-out fit exact.
const page = timeConsensus(40 * 12, 40, 7);
rows.push(["consensus, 40 datasets × 12 points", `${page.best.toFixed(1)} ms`, `${page.median.toFixed(1)} ms`, "< 50 ms"]);
const mem = process.memoryUsage();
rows.push(["peak RSS of the process", mb(process.resourceUsage().maxRSS * 1024), "", "—"]);
rows.push(["heap used at the end", mb(mem.heapUsed), "", "—"]);

const header = ["measure", "best", "median", "target"];
const widths = header.map((h, c) => Math.max(...rows.map((r) => r[c].length), h.length));
const line = (r: string[]) => `| ${r.map((v, c) => v.padEnd(widths[c])).join(" | ")} |`;
console.log(`Arrhenia kinetics benchmark — Node ${process.version}, one thread, best and median of 7 rounds (3 for consensus)`);
console.log(line(header));
console.log(`|${widths.map((w) => "-".repeat(w + 2)).join("|")}|`);
for (const r of rows) console.log(line(r));
