/**
 * What the CPU priority of the analysis threads costs a submission on a busy machine: one worker
 * thread validates a 1.7 MB document of 100 000 bad points ({"T":"x","k":-1}) once, then ten at
 * once, at nice 10 and at normal priority, while this thread measures its own timer lag (what
 * every other request would wait). Prints a table with the load average beside each row.
 * Run with `npm run bench:pool`; BENCH_NICES (default "10,0,10,0") chooses the rows.
 */
import os from "node:os";
import { Piscina } from "piscina";
import { analysisWorkerFile } from "@/lib/workers/pool";

const doc = JSON.stringify({ title: "bench", points: Array.from({ length: 100_000 }, () => ({ T: "x", k: -1 })) });
const rows: Record<string, string>[] = [];
for (const nice of (process.env.BENCH_NICES ?? "10,0,10,0").split(",").map(Number)) {
  const pool = new Piscina({ filename: analysisWorkerFile(), minThreads: 1, maxThreads: 1, niceIncrement: nice });
  await pool.run({ name: "checkDocument", input: '{"title":"warm-up"}' });
  const lags: number[] = [];
  let last = performance.now();
  const tick = setInterval(() => {
    const now = performance.now();
    lags.push(now - last - 10);
    last = now;
  }, 10);
  const t0 = performance.now();
  await pool.run({ name: "checkDocument", input: doc });
  const one = performance.now() - t0;
  const t1 = performance.now();
  await Promise.all(Array.from({ length: 10 }, () => pool.run({ name: "checkDocument", input: doc })));
  const ten = performance.now() - t1;
  clearInterval(tick);
  rows.push({
    nice: String(nice),
    "one document (ms)": one.toFixed(0),
    "ten at once, last (ms)": ten.toFixed(0),
    "timer lag here, max (ms)": Math.max(...lags).toFixed(0),
    "load average (1/5/15 min)": os
      .loadavg()
      .map((l) => l.toFixed(2))
      .join(" "),
  });
  await pool.destroy();
}
console.table(rows);
