import "server-only";
import { and, eq, gt, isNull } from "drizzle-orm";
import { getDb } from "@/db/client";
import { datasetInvitations, datasetMembers, datasetVersions } from "@/db/datasets";
import { recordAuditEvent } from "@/lib/audit/record";
import { generateSecret, hashSecret } from "@/lib/auth/secrets";
import type { CoEditorRole } from "@/lib/curation/lifecycle";
import { AppError } from "@/lib/errors";
import { enqueueMail } from "@/lib/mail/queue";
import { invitationMail } from "@/lib/mail/templates";
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
      .returning({ datasetId: datasetInvitations.datasetId, role: datasetInvitations.role, email: datasetInvitations.email });
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
    const [latest] = await tx
      .select({ id: datasetVersions.id })
      .from(datasetVersions)
      .where(eq(datasetVersions.datasetId, inv.datasetId))
      .orderBy(datasetVersions.number)
      .limit(1);
    return { datasetId: inv.datasetId, versionId: latest?.id ?? null, role: inv.role };
  });
}
