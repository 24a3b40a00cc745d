import postgres from "postgres";
import { databaseOn, withDatabase } from "@/db/client";
import { databaseUrl, migrationDatabaseUrl } from "@/lib/config";

/**
 * Demo only: the queued demo submissions get an invented history (hours to days old), so the
 * review queue shows waiting times such as "2 d 4 h" instead of "under 1 h" for every row.
 *
 * The history is recorded, not rewritten: `work` (deposit and lifecycle steps through the ordinary
 * code) runs on one connection of the schema owner, and before each step `at(hoursAgo)` sets that
 * session's `arrhenia.recorded_at`, which arrhenia_recorded_at() (drizzle/0026) honours for the
 * owner only. Every row is written once with its historical time, through every guard and trigger;
 * nothing is switched off and nothing already recorded is changed.
 *
 * Without an owner connection (no MIGRATION_DATABASE_URL) `work` runs as usual at today's times
 * and the answer is false.
 */
export async function recordDemoHistory<T>(
  work: (at: (hoursAgo: number) => Promise<void>) => Promise<T>,
): Promise<{ value: T; dated: boolean }> {
  const ownerUrl = migrationDatabaseUrl();
  if (ownerUrl === databaseUrl()) return { value: await work(async () => {}), dated: false };
  // One connection, so the session setting holds for every statement and transaction of `work`.
  const client = postgres(ownerUrl, { max: 1, onnotice: () => {} });
  const base = Date.now();
  const at = async (hoursAgo: number) => {
    await client`select set_config('arrhenia.recorded_at', ${new Date(base - hoursAgo * 3_600_000).toISOString()}, false)`;
  };
  try {
    const value = await withDatabase(databaseOn(client), () => work(at));
    return { value, dated: true };
  } finally {
    await client.end();
  }
}
