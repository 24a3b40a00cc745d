import { getDb, type Database as Db } from "./client";

/** Reads not yet sent, per database handle and name: requests that ask before one is sent share it. */
const unsent = new WeakMap<Db, Map<string, Promise<unknown>>>();

/**
 * `read` on the current database handle, shared by every caller that asks for `name` before it is
 * sent (in the same turn of the event loop; it is sent at the next setImmediate). The read still
 * starts after each of them asked, so what it answers is never older than their asking — the rule
 * that lets a mark of the data's state (lib/search/queries.ts, lib/public-cache.ts) decide whether
 * something kept in memory may be served — and at 32 requests at once it is one round trip, not 32.
 */
export function readPerTurn<T>(name: string, read: (db: Db) => Promise<T>): Promise<T> {
  const db = getDb();
  let reads = unsent.get(db);
  if (!reads) unsent.set(db, (reads = new Map()));
  const waiting = reads.get(name) as Promise<T> | undefined;
  if (waiting) return waiting;
  const shared = new Promise<T>((resolve, reject) =>
    setImmediate(() => {
      reads.delete(name);
      read(db).then(resolve, reject);
    }),
  );
  reads.set(name, shared);
  return shared;
}
