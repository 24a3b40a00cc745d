import { describe, expect, it, vi } from "vitest";

vi.mock("@/lib/auth/session", () => ({ getCurrentUser: vi.fn() }));
vi.mock("next/cache", () => ({ revalidatePath: vi.fn() }));

import { retryJobAction } from "@/app/admin/jobs/actions";
import { idleState } from "@/lib/auth/action-state";
import { getCurrentUser } from "@/lib/auth/session";
import { getSender } from "@/lib/jobs/boss";
import { getQueueCounts, listTroubledJobs } from "@/lib/jobs/queries";
import { createUser } from "@/lib/users/queries";
import { sql, uniqueEmail } from "./helpers";

describe("failed jobs are visible to admins and can be retried", () => {
  it("lists a failed job with its error; only an admin can queue it again", async () => {
    const boss = await getSender();
    const id = await boss.send("refit", { versionId: -1 }, { retryLimit: 0 });
    await sql`update pgboss.job set state = 'failed', output = '{"message": "stored document no longer validates"}'::jsonb where id = ${id!}`;
    const troubled = await listTroubledJobs();
    expect(troubled.find((j) => j.id === id)).toMatchObject({
      name: "refit",
      state: "failed",
      error: "stored document no longer validates",
    });
    expect((await getQueueCounts()).find((c) => c.name === "refit")!.failed).toBeGreaterThanOrEqual(1);

    const form = new FormData();
    form.set("queue", "refit");
    form.set("id", id!);
    const researcher = await createUser({ email: uniqueEmail("r"), name: "R", passwordHash: "x", verified: true });
    vi.mocked(getCurrentUser).mockResolvedValue(researcher);
    expect(await retryJobAction(idleState, form)).toMatchObject({ status: "error", message: "Your role does not allow this" });
    const admin = await createUser({ email: uniqueEmail("a"), name: "A", passwordHash: "x", role: "admin", verified: true });
    vi.mocked(getCurrentUser).mockResolvedValue(admin);
    expect(await retryJobAction(idleState, form)).toMatchObject({ status: "ok" });
    const [job] = await sql`select state from pgboss.job where id = ${id!}`;
    expect(job.state).toBe("retry");
    const [audit] = await sql`select count(*)::int as n from audit_events where action = 'job.retried' and subject_id = ${id!}`;
    expect(audit.n).toBe(1);
  });
});
