import PgBoss from "pg-boss";
import { databaseUrl } from "@/lib/config";

/** Queue names used across the app. */
export const queues = ["mail", "register-identifier", "refit"] as const;
export type QueueName = (typeof queues)[number];

/** Default retry policy: a relay or DOI agency that is down delays the work, never loses it. */
export const retryPolicy = {
  retryLimit: 12,
  retryDelay: Number(process.env.JOB_RETRY_DELAY_SECONDS ?? 15),
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
