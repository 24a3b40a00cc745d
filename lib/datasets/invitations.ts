import "server-only";
import { generateSecret, hashSecret } from "@/lib/auth/secrets";
import type { CoEditorRole } from "@/lib/curation/lifecycle";
import { AppError } from "@/lib/errors";
import { enqueueMail } from "@/lib/mail/queue";
import { invitationAcceptedMail, invitationMail } from "@/lib/mail/templates";
import { getUserByEmail, normaliseEmail, type UserDto } from "@/lib/users/queries";
import { getVersionForOrThrow } from "./deposits";
import {
  acceptInvitationByToken,
  createInvitation,
  getInvitationByToken,
  listOpenInvitations,
  revokeOpenInvitation,
} from "./invitation-queries";

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
  await createInvitation({
    actorId: actor.id,
    datasetId: found.version.datasetId,
    email: address,
    role,
    tokenHash: hashSecret(secret),
    expiresAt: new Date(Date.now() + INVITATION_TTL_MS),
  });
  const existing = await getUserByEmail({ email: address });
  await enqueueMail(invitationMail(address, existing?.name ?? address, actor.name, found.version.title, role, secret));
}

/** Accepts an invitation for the signed-in person; the link works once, within seven days. */
export async function acceptInvitation({ actor, secret }: { actor: UserDto; secret: string }) {
  const accepted = await acceptInvitationByToken({
    tokenHash: hashSecret(secret),
    actor,
    // The owner (and whoever sent it, if another) hears that the invitation was taken up.
    beforeCommit: async (tx, { told, latest, role }) => {
      for (const o of told)
        await enqueueMail(invitationAcceptedMail(o.email, o.name, actor.name, actor.email, latest?.title ?? "", role, latest?.id ?? null), {
          tx,
        });
    },
  });
  return {
    datasetId: accepted.datasetId,
    versionId: accepted.latest?.id ?? null,
    role: accepted.role,
    title: accepted.latest?.title ?? "",
  };
}

/** What an invitation link offers, for the accept page: the dataset's title, the role, who sent it; or why it no longer works. */
export async function describeInvitation({ secret }: { secret: string }) {
  const inv = await getInvitationByToken({ tokenHash: hashSecret(secret) });
  if (!inv)
    return {
      usable: false as const,
      why: "This invitation is unknown or was revoked by the dataset's owner. Ask the owner for a new one.",
    };
  if (inv.acceptedAt)
    return { usable: false as const, why: "This invitation was already used. Ask the owner for a new one if you need it." };
  if (inv.expiresAt <= new Date())
    return { usable: false as const, why: "This invitation has expired (links work for 7 days). Ask the owner for a new one." };
  return { usable: true as const, title: inv.title, role: inv.role, inviter: inv.inviter, email: inv.email };
}

/** Invitations of a dataset not yet accepted (expired ones included, marked), newest first; for its owner. */
export async function listPendingInvitations({ actor, versionId }: { actor: UserDto; versionId: number }) {
  const found = await getVersionForOrThrow({ versionId, actor, action: "view" });
  if (found.datasetRole !== "owner") throw new AppError("forbidden", "Only the dataset's owner sees its invitations");
  const rows = await listOpenInvitations({ datasetId: found.version.datasetId });
  const now = Date.now();
  return rows.map((r) => ({ ...r, expired: r.expiresAt.getTime() <= now }));
}

/** The owner revokes an invitation not yet accepted: its link stops working at once. Audited. */
export async function revokeInvitation({ actor, invitationId }: { actor: UserDto; invitationId: number }) {
  await revokeOpenInvitation({ actorId: actor.id, invitationId });
}
