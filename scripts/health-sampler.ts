/**
 * Samples GET /api/health back to back from a thread of its own until a promise settles: the
 * latency of each answer, its status, and the database round trip the server measured inside it.
 * On the caller's thread, sending large uploads (or serialising them for Playwright's driver)
 * would delay the health requests and blame the server for the client's own work. Used by
 * `npm run bench:server` and tests/e2e/deposit-load.spec.ts.
 */
import { Worker } from "node:worker_threads";

export interface HealthSample {
  /** Request to full answer, ms. */
  ms: number;
  status: number;
  /** `databaseLatencyMs` of the answer (NaN when absent). */
  databaseMs: number;
}

const SAMPLER = `
const { parentPort, workerData } = require("node:worker_threads");
let stopped = false;
parentPort.once("message", () => (stopped = true));
(async () => {
  const samples = [];
  while (!stopped) {
    const started = performance.now();
    const res = await fetch(workerData.url, { cache: "no-store" });
    const body = await res.json().catch(() => ({}));
    samples.push({ ms: performance.now() - started, status: res.status, databaseMs: body.databaseLatencyMs ?? NaN });
    await new Promise((r) => setTimeout(r, workerData.pauseMs));
  }
  parentPort.postMessage(samples);
})();
`;

/** GET `url` (the health endpoint) with `pauseMs` between answers until `until` settles. */
export async function sampleHealth(url: string, until: Promise<unknown>, pauseMs = 10): Promise<HealthSample[]> {
  const sampler = new Worker(SAMPLER, { eval: true, workerData: { url, pauseMs } });
  const samples = new Promise<HealthSample[]>((resolve, reject) => {
    sampler.once("message", resolve);
    sampler.once("error", reject);
  });
  await until.catch(() => {});
  sampler.postMessage("stop");
  const result = await samples;
  await sampler.terminate();
  return result;
}
