import "server-only";
import { and, desc, eq, inArray, or, sql } from "drizzle-orm";
import { auditEvents } from "@/db/audit";
import { getDb } from "@/db/client";
import { datasetMembers, datasets, datasetVersions } from "@/db/datasets";
import { users } from "@/db/users";
import { can } from "@/lib/auth/permissions";
import { AppError } from "@/lib/errors";
import type { UserDto } from "@/lib/users/queries";

/** The newest events shown on one page of the trail. */
export const AUDIT_PAGE_SIZE = 300;

export interface AuditEntry {
  id: number;
  at: Date;
  actor: string | null;
  action: string;
  /** The version the event is about (its number), or null for the dataset as a whole. */
  versionNumber: number | null;
  details: Record<string, unknown>;
}

/**
 * Who may read a dataset's audit trail: its members (owner, editor, viewer), curators and admins.
 * Anyone else, signed in or not, is told nothing (404), as for a draft they may not see.
 */
export async function canReadAuditTrail({ datasetId, viewer }: { datasetId: number; viewer: UserDto | null }): Promise<boolean> {
  if (!viewer) return false;
  if (can(viewer.role, "dataset.review")) return true;
  const [member] = await getDb()
    .select({ role: datasetMembers.role })
    .from(datasetMembers)
    .where(and(eq(datasetMembers.datasetId, datasetId), eq(datasetMembers.userId, viewer.id)));
  return Boolean(member);
}

/** Every audited event of a dataset and its versions, newest first (404 unless the viewer may read it). */
export async function getDatasetAuditTrailOrThrow({ datasetId, viewer }: { datasetId: number; viewer: UserDto | null }) {
  const db = getDb();
  const [dataset] = await db.select({ id: datasets.id }).from(datasets).where(eq(datasets.id, datasetId));
  if (!dataset || !(await canReadAuditTrail({ datasetId, viewer }))) throw new AppError("not_found", "No such dataset");
  const versions = await db
    .select({ id: datasetVersions.id, number: datasetVersions.number, title: datasetVersions.title })
    .from(datasetVersions)
    .where(eq(datasetVersions.datasetId, datasetId))
    .orderBy(desc(datasetVersions.number));
  const numberOf = new Map(versions.map((v) => [String(v.id), v.number]));
  const rows = await db
    .select({
      id: auditEvents.id,
      at: auditEvents.at,
      actor: users.name,
      action: auditEvents.action,
      subjectType: auditEvents.subjectType,
      subjectId: auditEvents.subjectId,
      details: auditEvents.details,
    })
    .from(auditEvents)
    .leftJoin(users, eq(users.id, auditEvents.actorId))
    .where(
      or(
        and(eq(auditEvents.subjectType, "dataset"), eq(auditEvents.subjectId, String(datasetId))),
        versions.length
          ? and(eq(auditEvents.subjectType, "dataset_version"), inArray(auditEvents.subjectId, [...numberOf.keys()]))
          : sql`false`,
      ),
    )
    .orderBy(desc(auditEvents.at), desc(auditEvents.id))
    .limit(AUDIT_PAGE_SIZE + 1);
  const entries: AuditEntry[] = rows.slice(0, AUDIT_PAGE_SIZE).map((r) => ({
    id: r.id,
    at: r.at,
    actor: r.actor,
    action: r.action,
    versionNumber: r.subjectType === "dataset_version" ? (numberOf.get(r.subjectId) ?? null) : null,
    details: r.details,
  }));
  return {
    datasetId,
    title: versions[0]?.title ?? "",
    latestVersionId: versions[0]?.id ?? null,
    entries,
    more: rows.length > AUDIT_PAGE_SIZE,
  };
}
