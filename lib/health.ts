import "server-only";
import { sql } from "drizzle-orm";
import { getDb } from "@/db/client";

export interface DatabaseHealth {
  ok: boolean;
  /** Time of one round trip through the app's own pool (what every request waits on). */
  latencyMs: number;
}

/**
 * Sends a query through the same pool the app's requests use, so a pool holding broken
 * connections shows here as a failure or a timeout rather than as "ok".
 */
export async function checkDatabase(timeoutMs = 2000): Promise<DatabaseHealth> {
  const started = performance.now();
  let timer: ReturnType<typeof setTimeout> | undefined;
  try {
    const rows = await Promise.race([
      getDb().execute<{ ok: number }>(sql`select 1 as ok`),
      new Promise<never>((_, reject) => {
        timer = setTimeout(() => reject(new Error("timeout")), timeoutMs);
      }),
    ]);
    return { ok: Number(rows[0]?.ok) === 1, latencyMs: Math.round(performance.now() - started) };
  } catch {
    return { ok: false, latencyMs: Math.round(performance.now() - started) };
  } finally {
    clearTimeout(timer);
  }
}
