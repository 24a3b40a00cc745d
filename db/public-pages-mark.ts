import { sql } from "drizzle-orm";
import { getDb } from "./client";
import { readPerTurn } from "./read-per-turn";

/**
 * The mark of the public pages' state (drizzle/0039, a sequence): every invalidation of public data
 * moves it (lib/public-cache.ts), in whichever process or script made the change, and the front
 * server's page cache (lib/html-cache.ts) serves a kept page only under the mark it was kept under.
 */

/**
 * The current mark ("0" before the first move: a new sequence's last_value is already its first
 * value, and only is_called tells whether nextval gave it); requests in the same turn of the event loop
 * share one read (db/read-per-turn.ts).
 */
export function readPublicPagesMark(): Promise<string> {
  return readPerTurn("public pages mark", async (db) => {
    const [row] = await db.execute<{ mark: string }>(
      sql`select (case when is_called then last_value else 0 end)::text as mark from public_pages_mark`,
    );
    return row?.mark ?? "none";
  });
}

/** Moves the mark: every page kept under an older one is rendered again at its next request. */
export async function movePublicPagesMark(): Promise<void> {
  await getDb().execute(sql`select nextval('public_pages_mark')`);
}
