import "server-only";
import { AsyncLocalStorage } from "node:async_hooks";
import { drizzle } from "drizzle-orm/postgres-js";
import postgres from "postgres";
import { withConnectionRetry } from "./retry";
import * as schema from "./schema";
import { databaseUrl, dbPoolSize } from "@/lib/config";

type Db = ReturnType<typeof createDb>;

/** Seconds before a closed pooled connection reconnects: 0.05, 0.1, 0.2 … up to 1, with jitter. */
function reconnectDelaySeconds(failures: number): number {
  return Math.min(0.05 * 2 ** failures, 1) * (0.5 + Math.random() / 2);
}

function createDb() {
  const client = postgres(databaseUrl(), {
    max: dbPoolSize(),
    onnotice: () => {},
    // A database restart or a dead peer must not leave broken connections in the pool: give up
    // on a connection attempt after 3 s (db/retry.ts then tries a fresh one; a 10 s limit let a
    // request stall 10 s after a restart), close idle ones after a minute and every one after
    // 15 minutes, and let TCP keep-alive (probes after 5 s idle) notice a peer that vanished.
    connect_timeout: 3,
    // The driver's default reconnect delay grows with a failure count shared by the whole pool
    // (3^n / 100 s, up to 20 s): a restart closes every connection at once, so queries parked on a
    // reconnecting connection waited 10-20 s after the server was back. Cap it at one second.
    backoff: reconnectDelaySeconds,
    idle_timeout: 60,
    max_lifetime: 15 * 60,
    keep_alive: 5,
  });
  return drizzle(withConnectionRetry(client), { schema, casing: "snake_case" });
}

// One pool per process; survives hot reloads in development.
const globalForDb = globalThis as unknown as { arrheniaDb?: Db };

const scopedDb = new AsyncLocalStorage<Db>();

export function getDb(): Db {
  const scoped = scopedDb.getStore();
  if (scoped) return scoped;
  globalForDb.arrheniaDb ??= createDb();
  return globalForDb.arrheniaDb;
}

/** A database handle on another connection (same schema and naming), e.g. the schema owner's for the demo seed. */
export function databaseOn(client: postgres.Sql): Db {
  return drizzle(client, { schema, casing: "snake_case" }) as unknown as Db;
}

/**
 * Runs `work` with every getDb() inside it answering `db`. Only the demo seed uses it, to record
 * its queued submissions through the ordinary lifecycle on the schema owner's connection.
 */
export function withDatabase<T>(db: Db, work: () => Promise<T>): Promise<T> {
  return scopedDb.run(db, work);
}

export type Database = Db;
export type Transaction = Parameters<Parameters<Db["transaction"]>[0]>[0];
