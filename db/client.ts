import "server-only";
import { drizzle } from "drizzle-orm/postgres-js";
import postgres from "postgres";
import * as schema from "./schema";
import { databaseUrl, dbPoolSize } from "@/lib/config";

type Db = ReturnType<typeof createDb>;

function createDb() {
  const client = postgres(databaseUrl(), { max: dbPoolSize(), onnotice: () => {} });
  return drizzle(client, { schema, casing: "snake_case" });
}

// One pool per process; survives hot reloads in development.
const globalForDb = globalThis as unknown as { arrheniaDb?: Db };

export function getDb(): Db {
  globalForDb.arrheniaDb ??= createDb();
  return globalForDb.arrheniaDb;
}

export type Database = Db;
export type Transaction = Parameters<Parameters<Db["transaction"]>[0]>[0];
