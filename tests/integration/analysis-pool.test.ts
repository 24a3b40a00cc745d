import { monitorEventLoopDelay } from "node:perf_hooks";
import { afterEach, describe, expect, it } from "vitest";
import { prepareDepositOrThrow } from "@/lib/datasets/prepare";
import { EXAMPLE_DEPOSIT } from "@/lib/deposits";
import { AppError } from "@/lib/errors";
import { closeAnalysisPool, runAnalysisTask } from "@/lib/workers/pool";

const badDocument = () => ({ ...EXAMPLE_DEPOSIT, points: Array.from({ length: 100_000 }, () => ({ T: "x", k: -1 })) });
const bigValidDocument = () => ({
  ...EXAMPLE_DEPOSIT,
  points: Array.from({ length: 100_000 }, (_, i) => ({ T: 250 + (i % 170), k: 1e-14 * (1 + (i % 7) / 10) })),
});
const bigValidText = () => JSON.stringify(bigValidDocument());

async function refusal(promise: Promise<unknown>): Promise<AppError> {
  try {
    await promise;
  } catch (err) {
    if (err instanceof AppError) return err;
    throw err;
  }
  throw new Error("expected the task to be refused");
}

const saved = { ...process.env };
afterEach(async () => {
  for (const name of ["ANALYSIS_THREADS", "ANALYSIS_QUEUE_LIMIT", "ANALYSIS_TIMEOUT_MS"]) {
    if (saved[name] === undefined) delete process.env[name];
    else process.env[name] = saved[name];
  }
  await closeAnalysisPool();
});

describe("analysis worker pool", () => {
  it("validates a 100 000-row bad document off this thread: 422 with the first pointers and the total, event loop free", async () => {
    await runAnalysisTask("checkDocument", "{}"); // start the thread first; its start-up is not the point here
    const delay = monitorEventLoopDelay({ resolution: 10 });
    delay.enable();
    const err = await refusal(prepareDepositOrThrow(badDocument()));
    delay.disable();
    expect(err.status).toBe(422);
    expect(err.errors.slice(0, 2).map((e) => e.pointer)).toEqual(["/points/0/T", "/points/0/k"]);
    expect(err.errors.at(-1)?.message).toBe("Showing the first 200 of 200,000 problems; correct these and validate again to see the rest.");
    // Only copying the document to the worker and the errors back happens here, not the checks:
    // before, this thread was blocked for minutes. The bound leaves room for a shared machine.
    expect(delay.max / 1e6).toBeLessThan(1000);
  }, 60_000);

  it("prepares a valid 100 000-point document on the worker: stored points and the analysis", async () => {
    const prepared = await prepareDepositOrThrow(bigValidDocument());
    expect(prepared.points).toHaveLength(100_000);
    expect(prepared.points[0]).toMatchObject({
      T: 250,
      k: 1e-14,
      original: { T: 250, k: 1e-14, unitT: EXAMPLE_DEPOSIT.units.T, unitK: EXAMPLE_DEPOSIT.units.k },
    });
    expect(prepared.analysis.result).not.toBeNull();
    expect(prepared.document.license).toBe(EXAMPLE_DEPOSIT.license ?? "CC-BY-4.0");
    expect(prepared.reaction.participants.length).toBeGreaterThan(1);
  }, 60_000);

  it("answers 503 with Retry-After when more tasks wait than the queue allows", async () => {
    process.env.ANALYSIS_THREADS = "1";
    process.env.ANALYSIS_QUEUE_LIMIT = "1";
    const text = bigValidText();
    const outcomes = await Promise.allSettled(Array.from({ length: 4 }, () => runAnalysisTask("checkDocument", text)));
    const refused = outcomes.filter((o) => o.status === "rejected").map((o) => (o as PromiseRejectedResult).reason);
    expect(outcomes.filter((o) => o.status === "fulfilled").length).toBeGreaterThanOrEqual(1);
    expect(refused.length).toBeGreaterThanOrEqual(1);
    for (const err of refused) {
      expect(err).toBeInstanceOf(AppError);
      expect(err).toMatchObject({ status: 503, retryAfterSeconds: 5 });
      expect(err.message).toMatch(/busy/);
    }
  }, 120_000);

  it("stops a task that runs past the time limit with a 503, and the pool serves the next task", async () => {
    process.env.ANALYSIS_TIMEOUT_MS = "1";
    const err = await refusal(runAnalysisTask("checkDocument", bigValidText()));
    expect(err).toMatchObject({ status: 503, code: "unavailable" });
    expect(err.message).toMatch(/took longer than/);
    process.env.ANALYSIS_TIMEOUT_MS = "60000";
    const next = await runAnalysisTask("checkDocument", "{}");
    expect(next.ok).toBe(false);
  }, 60_000);

  it("runs the stateless analysis on the worker and returns input errors as data", async () => {
    const ok = await runAnalysisTask("analyse", {
      order: 2,
      points: [
        { T: 300, k: 1e-12 },
        { T: 400, k: 3e-12 },
        { T: 500, k: 6e-12 },
      ],
    });
    expect(ok.ok).toBe(true);
    const bad = await runAnalysisTask("analyse", {
      order: 2,
      points: [
        { T: 300, k: 1e-12 },
        { T: 400, k: 0 },
      ],
    });
    expect(bad).toMatchObject({ ok: false, code: "validation_failed" });
    if (!bad.ok) expect(bad.errors[0].pointer).toMatch(/^\/points\/1/);
  }, 60_000);
});
