import "server-only";
import { sql } from "drizzle-orm";
import { getDb } from "@/db/client";
import { recordAuditEvent } from "@/lib/audit/record";
import { AppError } from "@/lib/errors";
import { getSender, queues, type QueueName } from "./boss";

export interface QueueCounts {
  name: string;
  created: number;
  retry: number;
  active: number;
  completed: number;
  failed: number;
  cancelled: number;
}

/** Jobs per queue and state, from pg-boss's own table. */
export async function getQueueCounts(): Promise<QueueCounts[]> {
  const rows = await getDb().execute<{ name: string; state: string; n: number }>(
    sql`select name, state::text as state, count(*)::int as n from pgboss.job group by name, state`,
  );
  return queues.map((name) => {
    const c: QueueCounts = { name, created: 0, retry: 0, active: 0, completed: 0, failed: 0, cancelled: 0 };
    for (const r of rows) if (r.name === name && r.state in c) (c as unknown as Record<string, number>)[r.state] = Number(r.n);
    return c;
  });
}

export interface JobRow {
  id: string;
  name: string;
  state: string;
  retryCount: number;
  retryLimit: number;
  createdOn: Date;
  startAfter: Date;
  summary: string;
  error: string | null;
}

/** Jobs that failed for good or are waiting to retry, newest first (what an admin acts on). */
export async function listTroubledJobs({ limit = 50 }: { limit?: number } = {}): Promise<JobRow[]> {
  const rows = await getDb().execute<{
    id: string;
    name: string;
    state: string;
    retry_count: number;
    retry_limit: number;
    created_on: Date;
    start_after: Date;
    summary: string | null;
    error: string | null;
  }>(sql`
    select id::text, name, state::text as state, retry_count, retry_limit, created_on, start_after,
           coalesce(data->>'subject', data->>'identifier', data->>'versionId', 'mechanism check ' || (data->>'checkId')) as summary,
           coalesce(output->>'message', output::text) as error
    from pgboss.job where state in ('failed', 'retry') order by created_on desc limit ${limit}`);
  return rows.map((r) => ({
    id: r.id,
    name: r.name,
    state: r.state,
    retryCount: r.retry_count,
    retryLimit: r.retry_limit,
    createdOn: new Date(r.created_on),
    startAfter: new Date(r.start_after),
    summary: r.summary ?? "",
    error: r.error,
  }));
}

/** Puts a failed job back in its queue, on the record; an unknown job or one not failed says so. */
export async function retryJob({ actorId, queue, id }: { actorId: number; queue: QueueName; id: string }) {
  const [job] = await getDb().execute<{ state: string }>(
    sql`select state::text as state from pgboss.job where name = ${queue} and id = ${id}::uuid`,
  );
  if (!job) throw new AppError("not_found", `No job ${id} in the ${queue} queue (it may have been removed after its retention period)`);
  if (job.state !== "failed") throw new AppError("conflict", `Job ${id} is ${job.state}, not failed: only a failed job can be retried`);
  const boss = await getSender();
  await boss.retry(queue, id);
  await recordAuditEvent(getDb(), { actorId, action: "job.retried", subjectType: "job", subjectId: id, details: { queue } });
}

/** Leaves a job no retries, so the next failure is final (a mail the relay refused for good). */
export async function endJobRetries({ queue, id }: { queue: QueueName; id: string }): Promise<void> {
  await getDb().execute(sql`update pgboss.job set retry_limit = retry_count where name = ${queue} and id = ${id}`);
}
