import "server-only";
import { sql } from "drizzle-orm";
import { getDb } from "@/db/client";

/** True when the database answers a trivial query within the timeout. */
export async function isDatabaseReachable(timeoutMs = 2000): Promise<boolean> {
  try {
    await Promise.race([
      getDb().execute(sql`select 1`),
      new Promise((_, reject) => setTimeout(() => reject(new Error("timeout")), timeoutMs)),
    ]);
    return true;
  } catch {
    return false;
  }
}
