import { databaseUrl, meilisearchConfig } from "@/lib/config";
import { AppError } from "@/lib/errors";
import type { IdentifierJob } from "@/lib/identifiers/queue";
import { refitVersion } from "@/lib/datasets/refit";
import { registerIdentifier } from "@/lib/identifiers/register";
import { SEARCH_SYNC_QUEUE, drainSearchOutbox } from "@/lib/search/outbox";
import { deliverMail, isPermanentDeliveryFailure } from "@/lib/mail/transport";
import type { MailMessage } from "@/lib/mail/templates";
import {
  notifyWatchers,
  sendWatchDigests,
  WATCH_DIGEST_CRON,
  WATCH_DIGEST_QUEUE,
  WATCH_NOTIFY_QUEUE,
  type WatchJob,
} from "@/lib/watches/notify";
import { runMechanismCheckJob } from "@/lib/mechanisms/check-job";
import { MECHANISM_CHECK_QUEUE, sweepStalledMechanismChecks, type MechanismCheckJob } from "@/lib/mechanisms/queries";
import { newBoss } from "./boss";

const MECHANISM_CHECK_SWEEP_QUEUE = "mechanism-check-sweep";
import { endJobRetries } from "./queries";

/**
 * Starts the background workers (one process is enough; several are safe: pg-boss hands each job
 * to one worker). A handler that throws leaves the job to be retried with backoff.
 */
export async function startWorkers(): Promise<{ stop: () => Promise<void> }> {
  const boss = newBoss({ connectionString: databaseUrl(), migrate: false, max: 4 });
  await boss.start();
  await boss.work<MailMessage>("mail", { pollingIntervalSeconds: 1, batchSize: 5 }, async (jobs) => {
    // Each mail is settled on its own as soon as it is sent or refused: a failure never makes
    // pg-boss fail, and later resend, the mails of the batch that went out.
    for (const job of jobs) {
      try {
        await deliverMail(job.data);
        await boss.complete("mail", job.id);
      } catch (err) {
        const message = err instanceof Error ? err.message : String(err);
        if (isPermanentDeliveryFailure(err)) {
          // The relay will refuse it again: no retries left, so pg-boss marks it failed for good.
          await endJobRetries({ queue: "mail", id: job.id });
          await boss.fail("mail", job.id, { message: `Refused for good by the mail relay: ${message}` });
        } else {
          await boss.fail("mail", job.id, { message });
        }
      }
    }
  });
  await boss.work<IdentifierJob>("register-identifier", { pollingIntervalSeconds: 1 }, async ([job]) => {
    try {
      await registerIdentifier(job.data.identifier, { refresh: job.data.refresh });
    } catch (err) {
      // No registration row means nothing to register: retrying would fail the same way.
      if (err instanceof AppError && err.code === "not_found") return console.error(`[jobs] ${err.message}; job dropped`);
      throw err;
    }
  });
  await boss.work<{ versionId: number }>("refit", { pollingIntervalSeconds: 2 }, async ([job]) => {
    await refitVersion({ versionId: job.data.versionId });
  });
  // The search outbox: drained when a change is recorded, and every minute for rows waiting their back-off.
  await boss.work(SEARCH_SYNC_QUEUE, { pollingIntervalSeconds: 1 }, async () => {
    const outcome = await drainSearchOutbox();
    if (outcome.error) console.error(`[jobs] search index not reached (${outcome.postponed} change(s) wait their retry): ${outcome.error}`);
  });
  // Watches: each event told to its watchers as it happens; the day's notices of digest readers once a day.
  await boss.work<WatchJob>(WATCH_NOTIFY_QUEUE, { pollingIntervalSeconds: 1 }, async ([job]) => {
    await notifyWatchers(job.data);
  });
  await boss.work(WATCH_DIGEST_QUEUE, { pollingIntervalSeconds: 5 }, async () => {
    await sendWatchDigests();
  });
  // Mechanism checks: each run on the analysis threads of this process; every minute, runs whose server stopped are
  // queued again (lib/mechanisms/check-job.ts, sweepStalledMechanismChecks).
  await boss.work<MechanismCheckJob>(MECHANISM_CHECK_QUEUE, { pollingIntervalSeconds: 1 }, async ([job]) => {
    await runMechanismCheckJob(job.data);
  });
  await boss.work(MECHANISM_CHECK_SWEEP_QUEUE, { pollingIntervalSeconds: 5 }, async () => {
    const { queued, failed } = await sweepStalledMechanismChecks();
    if (queued.length || failed.length)
      console.error(
        `[jobs] mechanism checks that stopped: queued again ${queued.join(", ") || "none"}; given up ${failed.join(", ") || "none"}`,
      );
  });
  await boss.schedule(MECHANISM_CHECK_SWEEP_QUEUE, "* * * * *", {}, { tz: "UTC" });
  await boss.schedule(WATCH_DIGEST_QUEUE, WATCH_DIGEST_CRON, {}, { tz: "UTC" });
  if (meilisearchConfig()) await boss.schedule(SEARCH_SYNC_QUEUE, "* * * * *");
  else await boss.unschedule(SEARCH_SYNC_QUEUE);
  return { stop: () => boss.stop({ graceful: true, wait: true, timeout: 5000 }) };
}
