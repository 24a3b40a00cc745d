import postgres from "postgres";
import { databaseUrl, migrationDatabaseUrl } from "@/lib/config";

/**
 * Demo only: the queued demo submissions are given invented ages (hours to days), so the review
 * queue shows waiting times such as "2 d 4 h" instead of "under 1 h" for every row.
 *
 * A version under review, its snapshots and its decisions cannot be rewritten by the runtime role
 * (drizzle/0021, 0020, 0007), so this runs as the schema owner: in one transaction it sets those
 * three guards aside, moves every time stamp of each given version, its dataset and their audit events back by the
 * same amount, so their order is kept, and puts the guards back before it commits. Nothing else
 * sees the guards off: ALTER TABLE holds its lock until the commit.
 */
export async function backdateDemoSubmissions(ages: { versionId: number; hours: number }[]): Promise<boolean> {
  if (ages.length === 0) return true;
  const ownerUrl = migrationDatabaseUrl();
  if (ownerUrl === databaseUrl()) return false; // no owner connection: the demo keeps today's times
  const sql = postgres(ownerUrl, { max: 1, onnotice: () => {} });
  const guards = [
    ["dataset_versions", "dataset_versions_frozen_under_review"],
    ["submission_snapshots", "submission_snapshots_append_only"],
    ["decisions", "decisions_append_only"],
  ] as const;
  try {
    await sql.begin(async (tx) => {
      for (const [table, trigger] of guards) await tx`ALTER TABLE ${tx(table)} DISABLE TRIGGER ${tx(trigger)}`;
      for (const { versionId, hours } of ages) {
        const by = `${hours} hours`;
        await tx`UPDATE dataset_versions SET created_at = created_at - ${by}::interval, updated_at = updated_at - ${by}::interval,
          submitted_at = submitted_at - ${by}::interval WHERE id = ${versionId}`;
        await tx`UPDATE submission_snapshots SET created_at = created_at - ${by}::interval WHERE version_id = ${versionId}`;
        await tx`UPDATE decisions SET created_at = created_at - ${by}::interval WHERE version_id = ${versionId}`;
        const [{ datasetId }] = await tx<
          { datasetId: number }[]
        >`SELECT dataset_id AS "datasetId" FROM dataset_versions WHERE id = ${versionId}`;
        await tx`UPDATE datasets SET created_at = created_at - ${by}::interval, updated_at = updated_at - ${by}::interval WHERE id = ${datasetId}`;
        await tx`UPDATE audit_events SET at = at - ${by}::interval
          WHERE (subject_type = 'dataset_version' AND subject_id = ${String(versionId)}) OR (subject_type = 'dataset' AND subject_id = ${String(datasetId)})`;
      }
      for (const [table, trigger] of guards) await tx`ALTER TABLE ${tx(table)} ENABLE TRIGGER ${tx(trigger)}`;
    });
  } finally {
    await sql.end();
  }
  return true;
}
