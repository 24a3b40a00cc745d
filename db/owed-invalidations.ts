import { sql } from "drizzle-orm";
import { getDb, type Transaction } from "./client";

/**
 * Invalidations owed to the public pages (owed_invalidations, drizzle/0041): written in the
 * transaction of the change, deleted once its tags moved (lib/public-cache.ts invalidatePublicCache).
 */

/** Records, in the change's transaction, the tags it invalidates once committed; the owed row's id. */
export async function oweInvalidation(tx: Transaction, tags: Iterable<string>): Promise<number> {
  const unique = [...new Set(tags)];
  const [row] = await tx.execute<{ id: number }>(sql`
    insert into owed_invalidations (tags) values (array[${sql.join(
      unique.map((t) => sql`${t}`),
      sql`, `,
    )}]::text[]) returning id`);
  return Number(row.id);
}

/** The invalidation is done: its row goes. */
export async function settleOwedInvalidation(id: number): Promise<void> {
  await getDb().execute(sql`delete from owed_invalidations where id = ${id}`);
}

/** Invalidations still owed `olderThanSeconds` after their change committed (their move was lost), oldest first. */
export async function listOverdueInvalidations({ olderThanSeconds, limit = 100 }: { olderThanSeconds: number; limit?: number }) {
  const rows = await getDb().execute<{ id: number; tags: string[] }>(sql`
    select id, tags from owed_invalidations where created_at < now() - make_interval(secs => ${olderThanSeconds})
    order by id limit ${limit}`);
  return rows.map((r) => ({ id: Number(r.id), tags: r.tags }));
}
