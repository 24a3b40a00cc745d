import { afterAll, describe, expect, it } from "vitest";
import { captureSmtpPort } from "@/lib/config";
import { startWorkers } from "@/lib/jobs/worker";
import { startCaptureServer } from "@/lib/mail/capture-server";
import { enqueueMail } from "@/lib/mail/queue";
import { sql, uniqueEmail, waitForMail } from "./helpers";

const stops: (() => Promise<void>)[] = [];
afterAll(async () => {
  for (const stop of stops.reverse()) await stop();
});

describe("mail queue when the relay is down", () => {
  it("keeps the message, retries, and delivers once the relay is back", async () => {
    const workers = await startWorkers();
    stops.push(workers.stop);
    const to = uniqueEmail("patient");
    // Nothing listens on the capture port yet: delivery fails and the job waits for a retry.
    const jobId = await enqueueMail({ to, subject: "Held back", text: "body", html: "<p>body</p>" });
    expect(jobId).toBeTruthy();
    await expect
      // Mails that earlier test files left in the queue are tried first: allow for a backlog.
      .poll(async () => (await sql`select state, retry_count from pgboss.job where id = ${jobId!}`)[0], { timeout: 60_000, interval: 250 })
      .toMatchObject({ state: "retry" });

    const capture = await startCaptureServer({ sql, port: captureSmtpPort() });
    stops.push(capture.close);
    const mail = await waitForMail(to, { timeoutMs: 30_000 });
    expect(mail.subject).toBe("Held back");
    // pg-boss marks the job complete just after the handler returns: poll rather than read once.
    await expect
      .poll(async () => (await sql`select state, retry_count from pgboss.job where id = ${jobId!}`)[0], { timeout: 10_000, interval: 200 })
      .toMatchObject({ state: "completed" });
    const [job] = await sql`select retry_count from pgboss.job where id = ${jobId!}`;
    expect(job.retry_count).toBeGreaterThanOrEqual(1);
  }, 120_000);
});
