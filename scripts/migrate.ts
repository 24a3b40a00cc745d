// Applies the committed Drizzle migrations, then pg-boss's schema and our queues.
import { drizzle } from "drizzle-orm/postgres-js";
import { migrate } from "drizzle-orm/postgres-js/migrator";
import postgres from "postgres";
import { databaseUrl } from "@/lib/config";
import { installQueues } from "@/lib/jobs/boss";

const client = postgres(databaseUrl(), { max: 1, onnotice: () => {} });
await migrate(drizzle(client, { casing: "snake_case" }), { migrationsFolder: "drizzle" });
await client.end();
await installQueues();
console.log("[arrhenia] database migrated");
