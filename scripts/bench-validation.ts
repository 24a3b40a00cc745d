/**
 * Cost of validating a deposit document as its points grow: every point valid, and every point
 * bad in two fields ({"T":"x","k":-1}, two errors a row). The time per point should stay flat
 * (linear scaling) and the errors returned stay at the cap. Run with `npm run bench:validation`.
 * Not a test: prints a table.
 */
import { EXAMPLE_DEPOSIT } from "@/lib/deposits/example";
import { validateDeposit } from "@/lib/deposits/validate";

const sizes = (process.env.BENCH_SIZES ?? "1000,5000,20000,50000,100000").split(",").map(Number);

function documentWith(points: unknown[]): unknown {
  return { ...structuredClone(EXAMPLE_DEPOSIT), points };
}

function goodPoints(n: number): unknown[] {
  return Array.from({ length: n }, (_, i) => ({ T: 250 + (i % 500), k: 1e-12 * (1 + (i % 7)) }));
}

function badPoints(n: number): unknown[] {
  return Array.from({ length: n }, () => ({ T: "x", k: -1 }));
}

/** Best of three: the machine is shared, the best round is the validator's speed. */
function time(doc: unknown): { ms: number; errors: number; total: string } {
  let best = Infinity;
  let result = validateDeposit(doc);
  for (let r = 0; r < 3; r++) {
    const t0 = performance.now();
    result = validateDeposit(doc);
    best = Math.min(best, performance.now() - t0);
  }
  const errors = result.ok ? [] : result.errors;
  const summary = errors.find((e) => e.pointer === "" && /^Showing the first/.test(e.message));
  const total = summary ? (/of ([\d,]+) problems/.exec(summary.message)?.[1] ?? "?") : String(errors.length);
  return { ms: best, errors: errors.length, total };
}

validateDeposit(documentWith(goodPoints(100))); // warm-up
const rows: string[][] = [["points", "kind", "errors returned", "problems found", "ms", "µs / point"]];
for (const n of sizes) {
  for (const [kind, make] of [
    ["valid", goodPoints],
    ["bad", badPoints],
  ] as const) {
    const { ms, errors, total } = time(documentWith(make(n)));
    rows.push([String(n), kind, String(errors), total, ms.toFixed(1), ((ms * 1000) / n).toFixed(2)]);
  }
}
const widths = rows[0].map((_, c) => Math.max(...rows.map((r) => r[c].length)));
for (const r of rows) console.log(r.map((cell, c) => cell.padStart(widths[c])).join("  "));
