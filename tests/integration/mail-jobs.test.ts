import { SMTPServer } from "smtp-server";
import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";

vi.mock("@/lib/auth/session", () => ({ getCurrentUser: vi.fn() }));
vi.mock("next/cache", () => ({ revalidatePath: vi.fn() }));

import { randomUUID } from "node:crypto";
import { retryJobAction } from "@/app/admin/jobs/actions";
import { getDb } from "@/db/client";
import { idleState } from "@/lib/auth/action-state";
import { getCurrentUser } from "@/lib/auth/session";
import { captureSmtpPort } from "@/lib/config";
import { applyTransition } from "@/lib/curation/transitions";
import { createDatasetDraft } from "@/lib/datasets/queries";
import { transitionVersion } from "@/lib/datasets/deposits";
import { listTroubledJobs } from "@/lib/jobs/queries";
import { startWorkers } from "@/lib/jobs/worker";
import { enqueueMail } from "@/lib/mail/queue";
import { createUser, type UserDto } from "@/lib/users/queries";
import { sql, uniqueEmail } from "./helpers";

/**
 * A relay on the capture port that counts what it accepts per recipient, refuses some addresses
 * for a while (451, temporary) and others for good (550).
 */
async function startFlakyRelay({ temporary, permanent }: { temporary: Map<string, number>; permanent: Set<string> }) {
  const delivered = new Map<string, number>();
  const attempts = new Map<string, number>();
  const server = new SMTPServer({
    authOptional: true,
    disabledCommands: ["STARTTLS", "AUTH"],
    logger: false,
    onRcptTo(address, _session, callback) {
      const to = address.address;
      attempts.set(to, (attempts.get(to) ?? 0) + 1);
      if (permanent.has(to)) return callback(Object.assign(new Error("5.1.1 mailbox unavailable"), { responseCode: 550 }));
      const refusals = temporary.get(to) ?? 0;
      if (refusals > 0) {
        temporary.set(to, refusals - 1);
        return callback(Object.assign(new Error("4.3.0 try again later"), { responseCode: 451 }));
      }
      callback();
    },
    onData(stream, session, callback) {
      stream.on("data", () => {});
      stream.on("end", () => {
        for (const r of session.envelope.rcptTo) delivered.set(r.address, (delivered.get(r.address) ?? 0) + 1);
        callback();
      });
    },
  });
  await new Promise<void>((resolve, reject) => {
    server.once("error", reject);
    server.listen(captureSmtpPort(), "127.0.0.1", () => resolve());
  });
  return { delivered, attempts, close: () => new Promise<void>((resolve) => server.close(() => resolve())) };
}

const mail = (to: string, subject: string) => ({ to, subject, text: "body", html: "<p>body</p>" });
const jobState = async (id: string) =>
  (await sql<{ state: string; retry_count: number }[]>`select state::text as state, retry_count from pgboss.job where id = ${id}`)[0];

describe("mail delivery, one job per mail", () => {
  const temporary = new Map<string, number>();
  const permanent = new Set<string>();
  let relay: Awaited<ReturnType<typeof startFlakyRelay>>;
  let workers: Awaited<ReturnType<typeof startWorkers>> | undefined;
  beforeAll(async () => {
    relay = await startFlakyRelay({ temporary, permanent });
  });
  afterAll(async () => {
    await workers?.stop();
    await relay.close();
  });

  it("a relay refusing one mail of a batch delays only that one; every mail arrives exactly once", async () => {
    const to = Array.from({ length: 5 }, (_, i) => uniqueEmail(`batch${i}`));
    temporary.set(to[2], 2); // the third is refused twice, then accepted
    // Queued before any worker runs, so the worker fetches them as one batch.
    const ids: (string | null)[] = [];
    for (const [i, address] of to.entries()) ids.push(await enqueueMail(mail(address, `Batch ${i}`)));
    workers = await startWorkers();
    await expect
      .poll(async () => (await Promise.all(ids.map((id) => jobState(id!)))).map((j) => j.state), { timeout: 30_000, interval: 250 })
      .toEqual(Array(5).fill("completed"));
    expect(to.map((a) => relay.delivered.get(a) ?? 0)).toEqual([1, 1, 1, 1, 1]);
    expect(relay.attempts.get(to[2])).toBe(3);
    expect((await jobState(ids[2]!)).retry_count).toBe(2);
  });

  it("a permanent refusal (550) is tried once and shown as failed with the relay's answer", async () => {
    workers ??= await startWorkers();
    const gone = uniqueEmail("gone");
    permanent.add(gone);
    const id = (await enqueueMail(mail(gone, "Never arrives")))!;
    await expect.poll(async () => (await jobState(id)).state, { timeout: 15_000, interval: 250 }).toBe("failed");
    // Retries come within seconds in tests (JOB_RETRY_DELAY_SECONDS=1): wait past the first one.
    await new Promise((r) => setTimeout(r, 3000));
    expect(relay.attempts.get(gone)).toBe(1);
    expect(await jobState(id)).toMatchObject({ state: "failed", retry_count: 0 });
    const shown = (await listTroubledJobs()).find((j) => j.id === id);
    expect(shown).toMatchObject({ name: "mail", state: "failed", summary: "Never arrives" });
    expect(shown!.error).toMatch(/Refused for good by the mail relay: .*550/);
  });
});

describe("jobs are queued in the transaction of the change that causes them", () => {
  let owner: UserDto, curator: UserDto;
  beforeAll(async () => {
    owner = await createUser({ email: uniqueEmail("owner"), name: "Owner", passwordHash: "x", verified: true });
    curator = await createUser({ email: uniqueEmail("curator"), name: "Curator", passwordHash: "x", role: "curator", verified: true });
  });
  const draft = () =>
    createDatasetDraft({
      ownerId: owner.id,
      title: "OH + CH4 queue test",
      payload: { title: "OH + CH4 queue test" },
      points: [{ T: 300, k: 1e-12, original: { T: 300, k: 1e-12 } }],
      analysis: { engineVersion: "test", result: { flags: [] }, checks: [] },
    });
  const mailJobsTo = async (to: string) =>
    (await sql<{ n: number }[]>`select count(*)::int as n from pgboss.job where name = 'mail' and data->>'to' = ${to}`)[0].n;

  it("a transition whose transaction rolls back queues nothing; one that commits queues its mail", async () => {
    const v = await draft();
    const to = uniqueEmail("rolled-back");
    await expect(
      applyTransition({
        versionId: v.id,
        actorId: owner.id,
        transition: "submit",
        beforeCommit: async (tx) => {
          await enqueueMail(mail(to, "Submitted"), { tx });
          throw new Error("crash after queuing");
        },
      }),
    ).rejects.toThrow("crash after queuing");
    expect(await mailJobsTo(to)).toBe(0);
    expect((await sql`select state from dataset_versions where id = ${v.id}`)[0].state).toBe("draft");

    await transitionVersion({ actor: owner, versionId: v.id, transition: "submit" });
    expect((await sql`select state from dataset_versions where id = ${v.id}`)[0].state).toBe("submitted");
    expect(await mailJobsTo(curator.email)).toBe(1);
  });

  it("a queued job is invisible to others until the transaction commits", async () => {
    const to = uniqueEmail("pending");
    await getDb().transaction(async (tx) => {
      const id = await enqueueMail(mail(to, "Later"), { tx });
      expect(id).toBeTruthy();
      expect(await mailJobsTo(to)).toBe(0);
    });
    expect(await mailJobsTo(to)).toBe(1);
  });
});

describe("retrying a job that does not exist", () => {
  it("says so instead of answering ok", async () => {
    const admin = await createUser({ email: uniqueEmail("admin"), name: "Admin", passwordHash: "x", role: "admin", verified: true });
    vi.mocked(getCurrentUser).mockResolvedValue(admin);
    const form = new FormData();
    form.set("queue", "mail");
    form.set("id", randomUUID());
    const result = await retryJobAction(idleState, form);
    expect(result).toMatchObject({ status: "error" });
    expect(result.message).toMatch(/^No job [0-9a-f-]+ in the mail queue/);
  });
});
