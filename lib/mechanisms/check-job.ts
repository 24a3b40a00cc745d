import "server-only";
import { AppError } from "@/lib/errors";
import { isDatabaseOutage } from "@/lib/jobs/outage";
import { runAnalysisTask } from "@/lib/workers/pool";
import type { CheckProgress } from "./progress";
import { beatMechanismCheck, claimMechanismCheck, failMechanismCheck, finishMechanismCheck, type MechanismCheckJob } from "./queries";
import { buildReport } from "./run-check";

/** Seconds between heartbeats of a running check (well inside HEARTBEAT_STALE_SECONDS). */
const HEARTBEAT_SECONDS = 15;
/** Progress is written at most this often (and at every change of stage). */
const PROGRESS_EVERY_MS = 500;

/**
 * One run of a queued check (the `mechanism-check` job): claimed (a job handed out twice runs it once), its stored text
 * read again on a worker thread as the format it was sent in, matched and judged with the owner's choices as they
 * are now, the progress and a heartbeat written to its row as it goes, then the report. A check that cannot be
 * finished is failed with the reason in words; when the database is out of reach the run is left `running` and the
 * sweep (sweepStalledMechanismChecks) queues it again once its heartbeat is stale.
 */
export async function runMechanismCheckJob({ checkId }: MechanismCheckJob): Promise<"done" | "failed" | "skipped"> {
  const check = await claimMechanismCheck({ id: checkId });
  if (!check) return "skipped";
  let written: CheckProgress | null = null;
  let writtenAt = 0;
  const onProgress = async (progress: CheckProgress) => {
    const now = Date.now();
    if (written?.stage === progress.stage && progress.done < progress.total && now - writtenAt < PROGRESS_EVERY_MS) return;
    written = progress;
    writtenAt = now;
    await beatMechanismCheck({ id: checkId, progress });
  };
  const heartbeat = setInterval(() => {
    beatMechanismCheck({ id: checkId }).catch((err) => console.error(`[jobs] mechanism check ${checkId}: heartbeat not written`, err));
  }, HEARTBEAT_SECONDS * 1000);
  heartbeat.unref?.();
  try {
    await onProgress({ stage: "reading", done: 0, total: 1 });
    const bytes = new TextEncoder().encode(check.source);
    const read = await runAnalysisTask(
      "readMechanism",
      {
        bytes,
        json: false,
        window: { Tmin: check.windowTmin, Tmax: check.windowTmax },
        format: check.format === "cantera-yaml" || check.format === "plain-text" ? check.format : "auto",
      },
      { transfer: [bytes.buffer as ArrayBuffer] },
    );
    if (!read.ok) throw new AppError(read.code, read.message, read.errors);
    const report = await buildReport({ ownerId: check.ownerId, mechanism: read.mechanism, window: read.window, onProgress });
    await onProgress({ stage: "storing", done: 0, total: 1 });
    await finishMechanismCheck({ id: checkId, report: report as unknown as Record<string, unknown> });
    return "done";
  } catch (err) {
    if (isDatabaseOutage(err)) throw err;
    console.error(`[jobs] mechanism check ${checkId} failed`, err);
    const reason =
      err instanceof AppError && err.status < 500
        ? err.message
        : err instanceof AppError && err.code === "unavailable"
          ? `${err.message} (the check stopped; start it again from its page)`
          : "The check failed on our side; the error has been logged. Start it again from its page, and if it fails again, tell us.";
    await failMechanismCheck({ id: checkId, error: reason });
    return "failed";
  } finally {
    clearInterval(heartbeat);
  }
}
