import "server-only";
import { and, desc, eq, gt, isNull, or } from "drizzle-orm";
import { getDb } from "@/db/client";
import { datasetInvitations, datasetMembers, datasetVersions } from "@/db/datasets";
import { recordAuditEvent } from "@/lib/audit/record";
import { generateSecret, hashSecret } from "@/lib/auth/secrets";
import type { CoEditorRole } from "@/lib/curation/lifecycle";
import { AppError } from "@/lib/errors";
import { enqueueMail } from "@/lib/mail/queue";
import { invitationAcceptedMail, invitationMail } from "@/lib/mail/templates";
import { users } from "@/db/users";
import { getUserByEmail, normaliseEmail, type UserDto } from "@/lib/users/queries";
import { getVersionForOrThrow } from "./deposits";

/** Invitation links work for seven days. */
export const INVITATION_TTL_MS = 7 * 24 * 3600_000;

/** The owner invites someone by e-mail to co-edit (editor) or read (viewer) the dataset of a version. */
export async function inviteCoEditor({
  actor,
  versionId,
  email,
  role,
}: {
  actor: UserDto;
  versionId: number;
  email: string;
  role: Exclude<CoEditorRole, "owner">;
}) {
  const found = await getVersionForOrThrow({ versionId, actor, action: "invite" });
  const address = normaliseEmail(email);
  if (address === actor.email) throw new AppError("conflict", "You already own this dataset");
  const secret = generateSecret("", 32);
  await getDb().transaction(async (tx) => {
    await tx.insert(datasetInvitations).values({
      datasetId: found.version.datasetId,
      email: address,
      role,
      tokenHash: hashSecret(secret),
      invitedBy: actor.id,
      expiresAt: new Date(Date.now() + INVITATION_TTL_MS),
    });
    await recordAuditEvent(tx, {
      actorId: actor.id,
      action: "dataset.invited",
      subjectType: "dataset",
      subjectId: found.version.datasetId,
      details: { email: address, role },
    });
  });
  const existing = await getUserByEmail({ email: address });
  await enqueueMail(invitationMail(address, existing?.name ?? address, actor.name, found.version.title, role, secret));
}

/** Accepts an invitation for the signed-in person; the link works once, within seven days. */
export async function acceptInvitation({ actor, secret }: { actor: UserDto; secret: string }) {
  return getDb().transaction(async (tx) => {
    const [inv] = await tx
      .update(datasetInvitations)
      .set({ acceptedAt: new Date() })
      .where(
        and(
          eq(datasetInvitations.tokenHash, hashSecret(secret)),
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
    // The newest version is where the new co-editor lands.
    const [latest] = await tx
      .select({ id: datasetVersions.id, title: datasetVersions.title })
      .from(datasetVersions)
      .where(eq(datasetVersions.datasetId, inv.datasetId))
      .orderBy(desc(datasetVersions.number))
      .limit(1);
    // The owner (and whoever sent it, if another) hears that the invitation was taken up.
    const told = await tx
      .selectDistinct({ id: users.id, email: users.email, name: users.name })
      .from(users)
      .leftJoin(datasetMembers, and(eq(datasetMembers.userId, users.id), eq(datasetMembers.datasetId, inv.datasetId)))
      .where(and(or(eq(users.id, inv.invitedBy), eq(datasetMembers.role, "owner")), isNull(users.deactivatedAt)));
    for (const o of told.filter((o) => o.id !== actor.id))
      await enqueueMail(
        invitationAcceptedMail(o.email, o.name, actor.name, actor.email, latest?.title ?? "", inv.role, latest?.id ?? null),
        { tx },
      );
    return { datasetId: inv.datasetId, versionId: latest?.id ?? null, role: inv.role, title: latest?.title ?? "" };
  });
}

/** What an invitation link offers, for the accept page: the dataset's title, the role, who sent it; or why it no longer works. */
export async function describeInvitation({ secret }: { secret: string }) {
  const [inv] = await getDb()
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
    .where(eq(datasetInvitations.tokenHash, hashSecret(secret)));
  if (!inv)
    return {
      usable: false as const,
      why: "This invitation is unknown or was revoked by the dataset's owner. Ask the owner for a new one.",
    };
  if (inv.acceptedAt)
    return { usable: false as const, why: "This invitation was already used. Ask the owner for a new one if you need it." };
  if (inv.expiresAt <= new Date())
    return { usable: false as const, why: "This invitation has expired (links work for 7 days). Ask the owner for a new one." };
  const [latest] = await getDb()
    .select({ title: datasetVersions.title })
    .from(datasetVersions)
    .where(eq(datasetVersions.datasetId, inv.datasetId))
    .orderBy(desc(datasetVersions.number))
    .limit(1);
  return { usable: true as const, title: latest?.title ?? "", role: inv.role, inviter: inv.inviter, email: inv.email };
}

/** Invitations of a dataset not yet accepted (expired ones included, marked), newest first; for its owner. */
export async function listPendingInvitations({ actor, versionId }: { actor: UserDto; versionId: number }) {
  const found = await getVersionForOrThrow({ versionId, actor, action: "view" });
  if (found.datasetRole !== "owner") throw new AppError("forbidden", "Only the dataset's owner sees its invitations");
  const rows = await getDb()
    .select({
      id: datasetInvitations.id,
      email: datasetInvitations.email,
      role: datasetInvitations.role,
      createdAt: datasetInvitations.createdAt,
      expiresAt: datasetInvitations.expiresAt,
    })
    .from(datasetInvitations)
    .where(and(eq(datasetInvitations.datasetId, found.version.datasetId), isNull(datasetInvitations.acceptedAt)))
    .orderBy(desc(datasetInvitations.createdAt));
  const now = Date.now();
  return rows.map((r) => ({ ...r, expired: r.expiresAt.getTime() <= now }));
}

/** The owner revokes an invitation not yet accepted: its link stops working at once. Audited. */
export async function revokeInvitation({ actor, invitationId }: { actor: UserDto; invitationId: number }) {
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
          .where(and(eq(datasetMembers.datasetId, inv.datasetId), eq(datasetMembers.userId, actor.id)))
      : [];
    // Someone who is not a member is not told the invitation exists.
    if (!inv || !member) throw new AppError("not_found", "No such invitation (it may have been accepted or revoked already)");
    if (member.role !== "owner") throw new AppError("forbidden", "Only the dataset's owner revokes invitations");
    await tx.delete(datasetInvitations).where(eq(datasetInvitations.id, invitationId));
    await recordAuditEvent(tx, {
      actorId: actor.id,
      action: "dataset.invitation_revoked",
      subjectType: "dataset",
      subjectId: inv.datasetId,
      details: { email: inv.email, role: inv.role },
    });
  });
}
