// npm run db:privileges — prints what the app's database role (DATABASE_URL) may do, and exits
// non-zero if it could alter a frozen (published) row: superuser, owner, TRUNCATE, trigger
// switching, session_replication_role, BYPASSRLS, CREATE on a schema, or a freeze trigger missing.
import postgres from "postgres";
import { formatTable, inspectRuntimePrivileges } from "@/db/privileges";
import { databaseUrl } from "@/lib/config";

const sql = postgres(databaseUrl(), { max: 1, onnotice: () => {} });
try {
  const { role, checks, tables } = await inspectRuntimePrivileges(sql);
  console.log(`Role ${role}: table privileges\n`);
  console.log(
    formatTable(
      tables.map((t) => ({
        table: t.table,
        owner: t.owner,
        SELECT: t.select,
        INSERT: t.insert,
        UPDATE: t.update,
        DELETE: t.delete,
        TRUNCATE: t.truncate,
        REFERENCES: t.references,
        TRIGGER: t.trigger,
      })),
    ),
  );
  console.log(`\nRole ${role}: ways to alter a frozen row\n`);
  console.log(formatTable(checks.map((c) => ({ check: c.check, found: c.found, result: c.ok ? "ok" : "FAIL" }))));
  const failed = checks.filter((c) => !c.ok);
  console.log(
    failed.length
      ? `\n${failed.length} check(s) failed: role ${role} could alter published data`
      : `\nrole ${role} cannot alter published data`,
  );
  process.exitCode = failed.length ? 1 : 0;
} finally {
  await sql.end();
}
