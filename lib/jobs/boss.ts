import { sql, type SQL } from "drizzle-orm";
import PgBoss from "pg-boss";
import type { Transaction } from "@/db/client";
import { databaseUrl, jobRetryDelaySeconds } from "@/lib/config";

/** Queue names used across the app. */
export const queues = ["mail", "register-identifier", "refit"] as const;
export type QueueName = (typeof queues)[number];

/** Default retry policy: a relay or DOI agency that is down delays the work, never loses it. */
export const retryPolicy = {
  retryLimit: 12,
  retryDelay: jobRetryDelaySeconds(),
  retryBackoff: true,
  expireInSeconds: 300,
};

const globalForBoss = globalThis as unknown as { arrheniaBoss?: Promise<PgBoss> };

/** A started pg-boss for sending jobs from the web app (no maintenance, no schema changes). */
export function getSender(): Promise<PgBoss> {
  globalForBoss.arrheniaBoss ??= (async () => {
    const boss = new PgBoss({ connectionString: databaseUrl(), supervise: false, schedule: false, migrate: false, max: 3 });
    boss.on("error", (err) => console.error("[jobs] pg-boss error", err));
    await boss.start();
    return boss;
  })();
  return globalForBoss.arrheniaBoss;
}

/** Installs or upgrades pg-boss's own schema and creates our queues (run by the migrate script). */
export async function installQueues(connectionString = databaseUrl()): Promise<void> {
  const boss = new PgBoss({ connectionString, supervise: false, schedule: false, migrate: true, max: 2 });
  await boss.start();
  for (const name of queues) {
    if (!(await boss.getQueue(name))) await boss.createQueue(name, { name, ...retryPolicy });
  }
  await boss.stop({ graceful: false, wait: true });
}

/** pg-boss's numbered-parameter SQL ($1, $2 …) as a Drizzle query with the same parameters. */
function toDrizzleSql(text: string, values: unknown[]): SQL {
  const parts = text.split(/\$(\d+)\b/);
  return sql.join(
    parts.map((part, i) => {
      if (i % 2 === 0) return sql.raw(part);
      const value = values[Number(part) - 1] ?? null;
      // pg-boss passes job data as an object for a ::jsonb parameter.
      const param =
        value !== null && typeof value === "object" && !(value instanceof Date) && !Array.isArray(value) ? JSON.stringify(value) : value;
      return sql`${param}`;
    }),
  );
}

/**
 * Lets pg-boss insert a job through an open transaction (its `db` option on `send`): the job
 * exists exactly when the change that caused it commits, so a crash in between loses nothing and
 * a rollback queues nothing.
 */
export function jobsInTransaction(tx: Transaction): PgBoss.Db {
  return {
    async executeSql(text: string, values: unknown[] = []) {
      const rows = await tx.execute(toDrizzleSql(text, values));
      return { rows: [...rows] };
    },
  };
}
