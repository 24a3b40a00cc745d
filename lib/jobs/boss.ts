import { sql, type SQL } from "drizzle-orm";
import PgBoss from "pg-boss";
import type { Transaction } from "@/db/client";
import { databaseUrl, jobRetryDelaySeconds } from "@/lib/config";

/** Queue names used across the app. */
export const queues = [
  "mail",
  "register-identifier",
  "refit",
  "search-sync",
  "watch-notify",
  "watch-digest",
  "mechanism-check",
  "mechanism-check-sweep",
] as const;
export type QueueName = (typeof queues)[number];

/**
 * Queues that differ from the default policy. search-sync drains the search outbox, whose rows keep
 * their own back-off: at most one job waits ("short"), and a failed drain is not retried by pg-boss.
 */
export const queueOptions: Partial<Record<QueueName, Partial<PgBoss.Queue>>> = {
  "search-sync": { policy: "short", retryLimit: 0 },
  // The daily digest: one run waiting at most; a failed run is simply the next day's.
  "watch-digest": { policy: "short", retryLimit: 2 },
  // A check's own row counts its runs (lib/mechanisms/check-job.ts); pg-boss only retries a run that never started
  // (the database out of reach before the check was claimed), a few seconds apart. A large check may run for minutes.
  "mechanism-check": { retryLimit: 3, retryDelay: 5, retryBackoff: false, expireInSeconds: 30 * 60 } satisfies PgBoss.SendOptions,
  // Every minute: checks whose run stopped beating are queued again (or failed after three runs).
  "mechanism-check-sweep": { policy: "short", retryLimit: 0 },
};

/** Default retry policy: a relay or DOI agency that is down delays the work, never loses it. */
export const retryPolicy = {
  retryLimit: 12,
  retryDelay: jobRetryDelaySeconds(),
  retryBackoff: true,
  expireInSeconds: 300,
};

type PoolClient = { on(event: "error", listener: (err: Error) => void): void };
type OwnDb = { open?: () => Promise<void>; pool?: { on(event: "connect", listener: (client: PoolClient) => void): void } };

/**
 * A pg-boss whose every database error is logged, never thrown as uncaught. pg-boss forwards its
 * pool's 'error' events to its own; but a client the pool has lent out (or just ended) can emit
 * 'error' once more when its server process goes away (`pg_ctl -m immediate`: "Connection
 * terminated unexpectedly"), with nobody listening, which would end the process. Each client the
 * pool opens therefore gets a listener of its own, for its whole life.
 */
export function newBoss(options: PgBoss.ConstructorOptions): PgBoss {
  const boss = new PgBoss(options);
  const log = (err: unknown) => console.error("[jobs] pg-boss error", err);
  boss.on("error", log);
  const db = boss.getDb() as OwnDb;
  const open = db.open?.bind(db);
  if (open)
    db.open = async () => {
      await open();
      db.pool?.on("connect", (client) => client.on("error", log));
    };
  return boss;
}

const globalForBoss = globalThis as unknown as { arrheniaBoss?: Promise<PgBoss> };

/** A started pg-boss for sending jobs from the web app (no maintenance, no schema changes). */
export function getSender(): Promise<PgBoss> {
  globalForBoss.arrheniaBoss ??= (async () => {
    const boss = newBoss({ connectionString: databaseUrl(), supervise: false, schedule: false, migrate: false, max: 3 });
    await boss.start();
    return boss;
  })();
  return globalForBoss.arrheniaBoss;
}

/** Installs or upgrades pg-boss's own schema and creates our queues (run by the migrate script). */
export async function installQueues(connectionString = databaseUrl()): Promise<void> {
  const boss = newBoss({ connectionString, supervise: false, schedule: false, migrate: true, max: 2 });
  await boss.start();
  for (const name of queues) {
    if (!(await boss.getQueue(name))) await boss.createQueue(name, { name, ...retryPolicy, ...queueOptions[name] });
  }
  // pg-boss's own queue for scheduled (cron) jobs: its timekeeper creates it when a worker starts, as the runtime role,
  // which may not create tables, and ignores the failure — then no scheduled job (the mechanism-check sweep, the
  // daily digest) ever runs. Made here by the schema owner.
  if (!(await boss.getQueue(CRON_QUEUE))) await boss.createQueue(CRON_QUEUE);
  await boss.stop({ graceful: false, wait: true });
}

/** pg-boss's internal queue of due scheduled jobs (node_modules/pg-boss/src/timekeeper.js, QUEUES.SEND_IT). */
export const CRON_QUEUE = "__pgboss__send-it";

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
