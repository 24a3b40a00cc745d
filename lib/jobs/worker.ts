import PgBoss from "pg-boss";
import { databaseUrl } from "@/lib/config";
import { deliverMail } from "@/lib/mail/transport";
import type { MailMessage } from "@/lib/mail/templates";

/**
 * Starts the background workers (one process is enough; several are safe: pg-boss hands each job
 * to one worker). A handler that throws leaves the job to be retried with backoff.
 */
export async function startWorkers(): Promise<{ stop: () => Promise<void> }> {
  const boss = new PgBoss({ connectionString: databaseUrl(), migrate: false, max: 4 });
  boss.on("error", (err) => console.error("[jobs] pg-boss error", err));
  await boss.start();
  await boss.work<MailMessage>("mail", { pollingIntervalSeconds: 1, batchSize: 5 }, async (jobs) => {
    for (const job of jobs) await deliverMail(job.data);
  });
  return { stop: () => boss.stop({ graceful: true, wait: true, timeout: 5000 }) };
}
