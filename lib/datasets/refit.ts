import "server-only";
import { getSender, retryPolicy } from "@/lib/jobs/boss";
import { runAnalysisTask } from "@/lib/workers/pool";
import { ENGINE_VERSION } from "./prepare";
import {
  appendRefitAnalysis,
  getLatestAnalysisEngine,
  getLatestFitFlags,
  getRecordedEngineVersion,
  getVersionPayloadText,
  listVersionIdsNotAnalysedBy,
} from "./queries";
import { invalidatePublicCache } from "@/lib/public-cache";
import { queueWatchNotice } from "@/lib/watches/notify";

/**
 * Re-analyses one version with the current engine and stores the result as a new analysis row
 * (published versions keep their frozen points and earlier analyses; only a row is added, through
 * the one database function allowed to add it: this is the only path that may).
 * The non-kinetic checks (balance, units sanity) are carried over from the previous analysis.
 * Validation and fitting run on an analysis worker thread: the job worker shares its thread with
 * the front server (scripts/serve.ts), and a queue of re-fits after an engine change must not
 * stall every request passing through it.
 */
export async function refitVersion({ versionId }: { versionId: number }): Promise<"refitted" | "current" | "invalid"> {
  const payload = await getVersionPayloadText({ versionId });
  if (payload === null) return "invalid";
  const latest = await getLatestAnalysisEngine({ versionId });
  if (latest?.engineVersion === ENGINE_VERSION) return "current";
  const checks = latest?.checks ?? [];
  /** Appends the analysis; a public version's pages then show the newest fit (or none, when it failed), and are told so. */
  const append = async (result: Record<string, unknown> | null, error?: string) => {
    const done = await appendRefitAnalysis({ versionId, engineVersion: ENGINE_VERSION, result, checks, error });
    if (done.appended && done.invalidation) await invalidatePublicCache(done.invalidation.tags, { owed: done.invalidation.owed });
    return done.appended;
  };
  /** A failed re-fit stored as the newest analysis: the version's pages no longer show a fit. */
  const failed = async (error: string) => ((await append(null, error)) ? ("invalid" as const) : ("current" as const));
  const checked = await runAnalysisTask("checkDocument", payload, { background: true });
  if (!checked.ok) return failed(`stored document no longer validates: ${checked.errors[0].message}`);
  if (!checked.analysis.ok) return failed(checked.analysis.message);
  const result = checked.analysis.result;
  const before = await getLatestFitFlags({ versionId });
  if (!(await append(result))) return "current";
  // A re-fit that changes a public version's flags is news to those who watch it.
  const flags = Array.isArray(result.flags) ? (result.flags as { code?: unknown }[]) : [];
  const after = [...new Set(flags.map((f) => String(f.code)))].sort();
  if (before.isPublic && after.join(",") !== [...before.codes].sort().join(",")) {
    await queueWatchNotice({ versionId, event: "flags_changed", at: new Date().toISOString() });
  }
  return "refitted";
}

/** Versions whose newest analysis came from another engine version (or that have none). */
export async function listStaleVersions(): Promise<number[]> {
  return listVersionIdsNotAnalysedBy({ engineVersion: ENGINE_VERSION });
}

/**
 * Queues a re-fit of every stale version (at start-up, after an engine upgrade). Only when the
 * database records this code's engine as current: otherwise every re-fit would be refused by
 * arrhenia_append_refit_analysis after its fit had been computed (a database not migrated by this
 * code), so nothing is queued and `engineMismatch` names the database's engine.
 */
export async function enqueueStaleRefits(): Promise<{ queued: number; engineMismatch: string | null }> {
  const recorded = await getRecordedEngineVersion();
  if (recorded !== ENGINE_VERSION) return { queued: 0, engineMismatch: recorded ?? "none" };
  const ids = await listStaleVersions();
  const boss = await getSender();
  for (const versionId of ids) await boss.send("refit", { versionId }, { ...retryPolicy, singletonKey: `refit-${versionId}` });
  return { queued: ids.length, engineMismatch: null };
}
