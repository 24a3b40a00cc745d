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

/** The tag every kept page carries (lib/kept-pages.ts): moving it renders every page again. */
export const ALL_PAGES_TAG = "all";

/**
 * Moves the mark: every page kept in memory under an older one is rendered again at its next
 * request. Each tag moves with it (page_tag_moves, drizzle/0040: the tag's row takes a value of the
 * mark's sequence), and a page kept in the database (lib/kept-pages.ts) whose tags include one that
 * moved after its render began is rendered again too; pages none of whose tags moved stay kept.
 */
export async function movePublicPagesMark(tags: readonly string[] = [ALL_PAGES_TAG]): Promise<void> {
  const unique = [...new Set(tags)];
  if (unique.length === 0) {
    await getDb().execute(sql`select nextval('public_pages_mark')`);
    return;
  }
  await getDb().execute(sql`
    insert into page_tag_moves (tag, moved)
    select t, nextval('public_pages_mark') from unnest(array[${sql.join(
      unique.map((t) => sql`${t}`),
      sql`, `,
    )}]::text[]) as t
    on conflict (tag) do update set moved = excluded.moved`);
}

/** The most moves readTagMovesSince reports; past it, every page kept before is taken for moved. */
export const MOST_TAG_MOVES_READ = 2000;

/** The lowest mark asked for by the callers of this turn, taken by the read when it is sent. */
let lowestAsked: bigint | null = null;

/**
 * The tags that moved after the mark `since`, each with its latest move, or null when more than
 * MOST_TAG_MOVES_READ did. Callers in the same turn of the event loop share one read
 * (db/read-per-turn.ts: sent after all of them asked, so it sees every move committed before), from
 * the lowest mark any of them asked for; each then looks only at moves after its own.
 *
 * A move takes its value from the mark's sequence before its row commits: a reader may see the mark
 * moved and not yet the row. So a page is judged by the mark its render began under (or a kept row's
 * rendered_at), never re-dated to a later mark: the row is seen by a later read, and the page dropped.
 */
export function readTagMovesSince(since: string): Promise<Map<string, bigint> | null> {
  const from = BigInt(since);
  if (lowestAsked === null || from < lowestAsked) lowestAsked = from;
  return readPerTurn("page tag moves", async (db) => {
    const floor = lowestAsked ?? from;
    lowestAsked = null;
    const rows = await db.execute<{ tag: string; moved: string }>(
      sql`select tag, moved::text as moved from page_tag_moves where moved > ${floor.toString()}::bigint limit ${MOST_TAG_MOVES_READ + 1}`,
    );
    return rows.length > MOST_TAG_MOVES_READ ? null : new Map(rows.map((r) => [r.tag, BigInt(r.moved)]));
  });
}
