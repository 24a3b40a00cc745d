import "server-only";
import { randomBytes } from "node:crypto";
import { recordAuditEvent } from "@/lib/audit/record";
import { getDb } from "@/db/client";
import { normaliseOrcid } from "@/lib/auth/orcid";
import { readOrcidTicket, signOrcidTicket, TICKET_REFUSED } from "@/lib/auth/orcid-ticket";
import { hashPassword } from "@/lib/auth/password";
import { consumeOrThrow } from "@/lib/auth/rate-limit";
import { AppError } from "@/lib/errors";
import { enqueueMail } from "@/lib/mail/queue";
import { enqueueIdentifierRegistration } from "@/lib/identifiers/queue";
import { listRegisteredIdentifiers } from "@/lib/identifiers/queries";
import { choosePasswordMail, existingAccountMail, orcidVerificationMail } from "@/lib/mail/templates";
import { datasetTag, invalidatePublicCache, PUBLIC_TAG } from "@/lib/public-cache";
import {
  createOneTimeToken,
  getUserByEmail,
  getUserById,
  getUserByVerifiedOrcid,
  isPendingOrcidSignUp,
  linkVerifiedOrcid,
  listLinkedDatasetIds,
  saveOrcidSignUp,
  unlinkVerifiedOrcid,
} from "./queries";

const TICKET_USED = "This confirmation page was used already. To change the address, sign in with ORCID again for a new one.";

/** Why an ORCID sign-in went no further; the sign-in page words each code (app/sign-in/orcid-errors.ts). */
export type OrcidRefusal = "OrcidNotAnId" | "OrcidAccountDeactivated" | "OrcidLinkedElsewhere";

export type OrcidSignInOutcome =
  | {
      kind: "sign_in";
      user: { id: number; email: string; name: string; role: "researcher" | "curator" | "admin"; sessionGeneration: number };
    }
  | { kind: "confirm"; ticket: string }
  | { kind: "linked" }
  | { kind: "refused"; code: OrcidRefusal };

/**
 * What an iD proven at the provider leads to. With someone signed in (`currentUserId`) it is linked
 * to that account. Otherwise the account holding it is signed in; an unknown iD, or one held only
 * by a pending unconfirmed sign-up, goes to the confirmation page with a signed ticket. Roles are
 * the database's: nothing the provider says sets one.
 */
export async function resolveOrcidSignIn({
  subject,
  reportedName,
  currentUserId,
}: {
  subject: string;
  reportedName: string;
  currentUserId: number | null;
}): Promise<OrcidSignInOutcome> {
  const orcid = normaliseOrcid(subject);
  if (!orcid) return { kind: "refused", code: "OrcidNotAnId" };
  if (currentUserId !== null) {
    try {
      await afterLinkChange(await linkVerifiedOrcid({ userId: currentUserId, orcid }));
    } catch (err) {
      if (err instanceof AppError && err.code === "conflict") return { kind: "refused", code: "OrcidLinkedElsewhere" };
      throw err;
    }
    return { kind: "linked" };
  }
  const user = await getUserByVerifiedOrcid({ orcid });
  if (!user || isPendingOrcidSignUp(user)) return { kind: "confirm", ticket: signOrcidTicket({ orcid, name: reportedName }) };
  if (user.deactivatedAt) return { kind: "refused", code: "OrcidAccountDeactivated" };
  await recordAuditEvent(getDb(), {
    actorId: user.id,
    action: "user.signed_in",
    subjectType: "user",
    subjectId: user.id,
    details: { through: "orcid" },
  });
  return { kind: "sign_in", user };
}

/**
 * The confirmation page's answer: creates the account of a first ORCID sign-in (or takes the place
 * of a pending one holding the same iD) and mails the usual confirmation link. When the address
 * already has an account, that address gets the "you already have an account" mail instead, and
 * the caller sees the same answer either way. The mail names the iD, and its link confirms only in
 * the browser holding `browserKeyHash`'s key.
 */
export async function confirmOrcidSignUp({
  ticket,
  name,
  email,
  ip,
  browserKeyHash,
}: {
  ticket: string;
  name: string;
  email: string;
  ip: string;
  /** Hash of the key the confirming browser keeps (lib/auth/orcid-browser.ts): only it confirms the address. */
  browserKeyHash: string;
}) {
  const read = readOrcidTicket(ticket);
  if (!read) throw new AppError("validation_failed", TICKET_REFUSED, [{ pointer: "/ticket", message: TICKET_REFUSED }]);
  await consumeOrThrow("signUpIp", ip, "Too many sign-ups from this network");
  await consumeOrThrow("signUpEmail", email, "Too many sign-ups for this address");
  // A password nobody knows: the person signs in with ORCID until they choose one.
  const saved = await saveOrcidSignUp({
    orcid: read.orcid,
    name,
    email,
    passwordHash: await hashPassword(randomBytes(32).toString("hex")),
    ticketId: read.id,
    browserKeyHash,
  });
  if (saved === "ticket_used") {
    throw new AppError("validation_failed", TICKET_USED, [{ pointer: "/ticket", message: TICKET_USED }]);
  }
  if (!saved) {
    const holder = await getUserByVerifiedOrcid({ orcid: read.orcid });
    if (holder && !isPendingOrcidSignUp(holder)) {
      throw new AppError("conflict", "This ORCID iD is already linked to an account: sign in with ORCID to use it.");
    }
    const existing = await getUserByEmail({ email });
    if (existing) await enqueueMail(existingAccountMail(existing.email, existing.name));
    return;
  }
  // The new account holds the iD: the creator entries naming it are linked to it (drizzle/0030), and those datasets' pages and metadata name it.
  await afterLinkChange(await listLinkedDatasetIds({ userId: saved.user.id }));
  await enqueueMail(orcidVerificationMail(saved.user.email, saved.user.name, read.orcid, saved.secret));
}

export async function unlinkOrcid({ userId }: { userId: number }) {
  await afterLinkChange(await unlinkVerifiedOrcid({ userId }));
}

/** Mails an account without a password a link to choose one (a few an hour at most). */
export async function requestPasswordChoice({ userId }: { userId: number }) {
  const user = await getUserById({ id: userId });
  if (!user || user.passwordSet) throw new AppError("conflict", "This account has a password already: change it in the form beside.");
  await consumeOrThrow("resetEmail", user.email, "Several links were sent in the last hour: look in your inbox");
  const secret = await createOneTimeToken({ userId, purpose: "reset_password" });
  await enqueueMail(choosePasswordMail(user.email, user.name, secret));
}

/**
 * A changed link changes the creators' iDs on those datasets' pages (JSON-LD), the people lists
 * and the metadata registered with the DOI agency (sent again through the registration queue).
 */
export async function afterLinkChange(datasetIds: number[]) {
  await invalidatePublicCache([PUBLIC_TAG, ...datasetIds.map(datasetTag)]);
  for (const identifier of await listRegisteredIdentifiers({ datasetIds }))
    await enqueueIdentifierRegistration(identifier, { refresh: true });
}
