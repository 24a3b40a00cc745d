// Applies the committed Drizzle migrations, then pg-boss's schema and our queues, as the schema
// owner (MIGRATION_DATABASE_URL), records the current engine version; then grants the runtime role (DATABASE_URL's user) row access only.
import { drizzle } from "drizzle-orm/postgres-js";
import { migrate } from "drizzle-orm/postgres-js/migrator";
import postgres from "postgres";
import { databaseUrl, migrationDatabaseUrl } from "@/lib/config";
import { ENGINE_VERSION } from "@/lib/datasets/prepare";
import { installQueues } from "@/lib/jobs/boss";
import { grantRuntimeRole } from "@/db/privileges";
import { rebuildSearchDocuments, rebuildStaleComparisonBases } from "@/lib/search/documents";
import { drawMissingSpeciesDrawings } from "@/lib/species/drawings";

const ownerUrl = migrationDatabaseUrl();
const client = postgres(ownerUrl, { max: 1, onnotice: () => {} });
await migrate(drizzle(client, { casing: "snake_case" }), { migrationsFolder: "drizzle" });
await installQueues(ownerUrl);
// The one engine version re-fits may append analyses for (drizzle/0013); only this owner may write it.
await client`insert into arrhenia_engine (only_row, engine_version) values (true, ${ENGINE_VERSION})
  on conflict (only_row) do update set engine_version = excluded.engine_version, recorded_at = now()
  where arrhenia_engine.engine_version is distinct from excluded.engine_version`;
console.log(`[arrhenia] current engine version: ${ENGINE_VERSION}`);
const runtimeRole = decodeURIComponent(new URL(databaseUrl()).username);
if (runtimeRole && runtimeRole !== decodeURIComponent(new URL(ownerUrl).username)) {
  await grantRuntimeRole(client, runtimeRole);
  console.log(`[arrhenia] runtime role ${runtimeRole}: row privileges granted`);
} else {
  console.warn("[arrhenia] the app and the migrations use one role: set MIGRATION_DATABASE_URL to the schema owner (see README)");
}
await client.end();
// Public versions without a search document (a database from before search documents): built as the runtime role, as the app would.
const built = await rebuildSearchDocuments({ onlyMissing: true });
if (built) console.log(`[arrhenia] search documents built for ${built} version(s)`);
// Reactions whose kept comparison basis (for mechanism checks) or kept consensus (for their page) is missing or of another engine version.
const rebased = await rebuildStaleComparisonBases({
  onProgress: (done, total) => done % 2000 === 0 && console.log(`[arrhenia]   ${done}/${total} reaction summaries`),
});
if (rebased) console.log(`[arrhenia] comparison bases and kept consensus written for ${rebased} reaction(s)`);
// Species not yet drawn at the public pages' sizes by this RDKit (lib/species/drawings.ts): drawn now, not on a reader's page.
const drawn = await drawMissingSpeciesDrawings({
  onProgress: (done, total) => done % 1000 === 0 && console.log(`[arrhenia]   ${done}/${total} species drawings`),
});
if (drawn) console.log(`[arrhenia] ${drawn} species drawing(s) made`);
console.log("[arrhenia] database migrated");
// The app's pool (getDb) would keep the process alive until its idle timeout.
process.exit(0);
