import "server-only";
import { and, desc, eq, gt, isNull, or } from "drizzle-orm";
import { getDb, type Transaction } from "@/db/client";
import { datasetInvitations, datasetMembers, datasetVersions } from "@/db/datasets";
import { users } from "@/db/users";
import { recordAuditEvent } from "@/lib/audit/record";
import type { CoEditorRole } from "@/lib/curation/lifecycle";
import { AppError } from "@/lib/errors";

type InvitedRole = Exclude<CoEditorRole, "owner">;

/** The newest version of a dataset (where a new co-editor lands), id and title. */
async function getNewestVersion(db: Pick<Transaction, "select">, datasetId: number) {
  const [latest] = await db
    .select({ id: datasetVersions.id, title: datasetVersions.title })
    .from(datasetVersions)
    .where(eq(datasetVersions.datasetId, datasetId))
    .orderBy(desc(datasetVersions.number))
    .limit(1);
  return latest ?? null;
}

/** Stores an invitation (only its token's hash) with its audit event, in one transaction. */
export async function createInvitation(input: {
  actorId: number;
  datasetId: number;
  email: string;
  role: InvitedRole;
  tokenHash: string;
  expiresAt: Date;
}) {
  await getDb().transaction(async (tx) => {
    await tx.insert(datasetInvitations).values({
      datasetId: input.datasetId,
      email: input.email,
      role: input.role,
      tokenHash: input.tokenHash,
      invitedBy: input.actorId,
      expiresAt: input.expiresAt,
    });
    await recordAuditEvent(tx, {
      actorId: input.actorId,
      action: "dataset.invited",
      subjectType: "dataset",
      subjectId: input.datasetId,
      details: { email: input.email, role: input.role },
    });
  });
}

export interface AcceptedInvitation {
  datasetId: number;
  role: InvitedRole;
  /** The dataset's newest version, or null. */
  latest: { id: number; title: string } | null;
  /** The owner and whoever sent it (active people other than the one accepting), to be told. */
  told: { id: number; email: string; name: string }[];
}

/**
 * Uses an unexpired, unused invitation for `actor` (whose address it must be): makes them a member
 * (an owner stays owner) and audits it; `beforeCommit` queues what must commit with it (the mail).
 */
export async function acceptInvitationByToken({
  tokenHash,
  actor,
  beforeCommit,
}: {
  tokenHash: string;
  actor: { id: number; email: string };
  beforeCommit: (tx: Transaction, accepted: AcceptedInvitation) => Promise<void>;
}): Promise<AcceptedInvitation> {
  return getDb().transaction(async (tx) => {
    const [inv] = await tx
      .update(datasetInvitations)
      .set({ acceptedAt: new Date() })
      .where(
        and(
          eq(datasetInvitations.tokenHash, tokenHash),
          isNull(datasetInvitations.acceptedAt),
          gt(datasetInvitations.expiresAt, new Date()),
        ),
      )
      .returning({
        datasetId: datasetInvitations.datasetId,
        role: datasetInvitations.role,
        email: datasetInvitations.email,
        invitedBy: datasetInvitations.invitedBy,
      });
    if (!inv)
      throw new AppError(
        "not_found",
        "This invitation is invalid, has expired (links work for 7 days), or was already used. Ask the owner for a new one.",
      );
    if (inv.email !== actor.email)
      throw new AppError("forbidden", `This invitation was sent to ${inv.email}; sign in with that address to accept it.`);
    const [current] = await tx
      .select({ role: datasetMembers.role })
      .from(datasetMembers)
      .where(and(eq(datasetMembers.datasetId, inv.datasetId), eq(datasetMembers.userId, actor.id)));
    if (current?.role !== "owner") {
      await tx
        .insert(datasetMembers)
        .values({ datasetId: inv.datasetId, userId: actor.id, role: inv.role })
        .onConflictDoUpdate({ target: [datasetMembers.datasetId, datasetMembers.userId], set: { role: inv.role } });
    }
    await recordAuditEvent(tx, {
      actorId: actor.id,
      action: "dataset.invitation_accepted",
      subjectType: "dataset",
      subjectId: inv.datasetId,
      details: { role: inv.role },
    });
    const told = await tx
      .selectDistinct({ id: users.id, email: users.email, name: users.name })
      .from(users)
      .leftJoin(datasetMembers, and(eq(datasetMembers.userId, users.id), eq(datasetMembers.datasetId, inv.datasetId)))
      .where(and(or(eq(users.id, inv.invitedBy), eq(datasetMembers.role, "owner")), isNull(users.deactivatedAt)));
    const accepted: AcceptedInvitation = {
      datasetId: inv.datasetId,
      role: inv.role as InvitedRole,
      latest: await getNewestVersion(tx, inv.datasetId),
      told: told.filter((o) => o.id !== actor.id),
    };
    await beforeCommit(tx, accepted);
    return accepted;
  });
}

/** An invitation by its token's hash, with who sent it and the title of the dataset's newest version. */
export async function getInvitationByToken({ tokenHash }: { tokenHash: string }) {
  const db = getDb();
  const [inv] = await db
    .select({
      datasetId: datasetInvitations.datasetId,
      role: datasetInvitations.role,
      email: datasetInvitations.email,
      acceptedAt: datasetInvitations.acceptedAt,
      expiresAt: datasetInvitations.expiresAt,
      inviter: users.name,
    })
    .from(datasetInvitations)
    .innerJoin(users, eq(users.id, datasetInvitations.invitedBy))
    .where(eq(datasetInvitations.tokenHash, tokenHash));
  if (!inv) return null;
  const latest = await getNewestVersion(db, inv.datasetId);
  return { ...inv, title: latest?.title ?? "" };
}

/** A dataset's invitations not yet accepted, newest first. */
export async function listOpenInvitations({ datasetId }: { datasetId: number }) {
  return getDb()
    .select({
      id: datasetInvitations.id,
      email: datasetInvitations.email,
      role: datasetInvitations.role,
      createdAt: datasetInvitations.createdAt,
      expiresAt: datasetInvitations.expiresAt,
    })
    .from(datasetInvitations)
    .where(and(eq(datasetInvitations.datasetId, datasetId), isNull(datasetInvitations.acceptedAt)))
    .orderBy(desc(datasetInvitations.createdAt));
}

/** Deletes an invitation not yet accepted when `actorId` owns its dataset, with the audit event. */
export async function revokeOpenInvitation({ actorId, invitationId }: { actorId: number; invitationId: number }) {
  await getDb().transaction(async (tx) => {
    const [inv] = await tx
      .select({ datasetId: datasetInvitations.datasetId, email: datasetInvitations.email, role: datasetInvitations.role })
      .from(datasetInvitations)
      .where(and(eq(datasetInvitations.id, invitationId), isNull(datasetInvitations.acceptedAt)))
      .for("update");
    const [member] = inv
      ? await tx
          .select({ role: datasetMembers.role })
          .from(datasetMembers)
          .where(and(eq(datasetMembers.datasetId, inv.datasetId), eq(datasetMembers.userId, actorId)))
      : [];
    // Someone who is not a member is not told the invitation exists.
    if (!inv || !member) throw new AppError("not_found", "No such invitation (it may have been accepted or revoked already)");
    if (member.role !== "owner") throw new AppError("forbidden", "Only the dataset's owner revokes invitations");
    await tx.delete(datasetInvitations).where(eq(datasetInvitations.id, invitationId));
    await recordAuditEvent(tx, {
      actorId,
      action: "dataset.invitation_revoked",
      subjectType: "dataset",
      subjectId: inv.datasetId,
      details: { email: inv.email, role: inv.role },
    });
  });
}
