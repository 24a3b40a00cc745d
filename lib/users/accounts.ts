import "server-only";
import { hashPassword, verifyPassword } from "@/lib/auth/password";
import { consumeOrThrow, recordFailure, throwIfSpent } from "@/lib/auth/rate-limit";
import { AppError } from "@/lib/errors";
import { enqueueMail } from "@/lib/mail/queue";
import { existingAccountMail, orcidVerificationMail, passwordResetMail, verificationMail } from "@/lib/mail/templates";
import {
  type AddressConfirmation,
  confirmAddressWithToken,
  createOneTimeToken,
  createUser,
  getPasswordHash,
  getUserByEmail,
  getUserById,
  isPendingOrcidSignUp,
  refuseOrcidSignUpWithToken,
  resetPasswordWithToken,
  setPasswordHash,
  setUserActive,
} from "./queries";
import { afterLinkChange, unlinkOrcid } from "./orcid-accounts";
import { datasetTag, invalidatePublicCache, PUBLIC_TAG } from "@/lib/public-cache";

/**
 * Sign-up: creates an unverified researcher and mails a verification link. An e-mail that already
 * has an account gets a "you already have an account" message instead, and the caller sees the
 * same answer either way, so sign-up cannot be used to find out who has an account.
 */
export async function signUp({ name, email, password, ip }: { name: string; email: string; password: string; ip: string }) {
  await consumeOrThrow("signUpIp", ip, "Too many sign-ups from this network");
  await consumeOrThrow("signUpEmail", email, "Too many sign-ups for this address");
  const existing = await getUserByEmail({ email });
  if (existing) {
    await enqueueMail(existingAccountMail(existing.email, existing.name));
    return;
  }
  let user;
  try {
    user = await createUser({ name, email, passwordHash: await hashPassword(password) });
  } catch (err) {
    if (err instanceof AppError && err.code === "conflict") return; // a parallel sign-up won; same answer
    throw err;
  }
  const secret = await createOneTimeToken({ userId: user.id, purpose: "verify_email" });
  await enqueueMail(verificationMail(user.email, user.name, secret));
}

/**
 * Confirms an address from the mailed link. The address of a pending ORCID sign-up is confirmed
 * only in the browser that made it (`browserKeyHash`: the hash of its cookie's key): anywhere else
 * the answer names the iD, and the owner of the address can refuse it (refuseOrcidSignUp).
 */
export async function verifyEmail({
  secret,
  browserKeyHash,
}: {
  secret: string;
  /** Read only for a pending ORCID sign-up. */
  browserKeyHash: () => Promise<string | null>;
}): Promise<AddressConfirmation> {
  const confirmed = await confirmAddressWithToken({ secret, browserKeyHash });
  // A confirmed address makes the account's creator links show on the datasets naming it.
  if (confirmed.kind === "verified" && confirmed.datasetIds.length > 0) await invalidatePublicCache(confirmed.datasetIds.map(datasetTag));
  return confirmed;
}

/** "This was not me": the ORCID iD of a pending sign-up leaves the address the link was mailed to. */
export async function refuseOrcidSignUp({ secret }: { secret: string }): Promise<{ orcid: string }> {
  const { orcid, datasetIds } = await refuseOrcidSignUpWithToken({ secret });
  if (datasetIds.length > 0) await afterLinkChange(datasetIds);
  return { orcid };
}

/**
 * Deactivates or reactivates an account (an admin's act): the home page's counts of people and the
 * creator links on the datasets naming it change.
 */
export async function setAccountActive(args: { actorId: number; userId: number; active: boolean }): Promise<void> {
  const datasetIds = await setUserActive(args);
  await invalidatePublicCache([PUBLIC_TAG, ...datasetIds.map(datasetTag)]);
}

/**
 * Sends a new confirmation link when the address belongs to an account still waiting for one
 * (the old link was used, expired or lost); answers the same either way, and counts every request
 * against the address and the network, so it cannot be used to find accounts or to flood an inbox.
 */
export async function requestConfirmationLink({ email, ip }: { email: string; ip: string }) {
  await consumeOrThrow("confirmIp", ip, "Too many requests for a confirmation link from this network");
  await consumeOrThrow("confirmEmail", email, "Too many requests for a confirmation link for this address");
  const user = await getUserByEmail({ email });
  if (!user || user.deactivatedAt || user.emailVerifiedAt) return;
  const secret = await createOneTimeToken({ userId: user.id, purpose: "verify_email", sentTo: user.email });
  if (!secret) return; // the address changed meanwhile
  await enqueueMail(
    isPendingOrcidSignUp(user) && user.verifiedOrcid
      ? orcidVerificationMail(user.email, user.name, user.verifiedOrcid, secret)
      : verificationMail(user.email, user.name, secret),
  );
}

/** Sends a reset link when the account exists; answers the same either way. */
export async function requestPasswordReset({ email, ip }: { email: string; ip: string }) {
  await consumeOrThrow("resetIp", ip, "Too many reset requests from this network");
  await consumeOrThrow("resetEmail", email, "Too many reset requests for this address");
  const user = await getUserByEmail({ email });
  if (!user || user.deactivatedAt) return;
  const secret = await createOneTimeToken({ userId: user.id, purpose: "reset_password", sentTo: user.email });
  if (!secret) return; // the address changed meanwhile
  await enqueueMail(passwordResetMail(user.email, user.name, secret));
}

export async function resetPassword({ secret, password }: { secret: string; password: string }) {
  // One transaction under the account's lock: the password, the proven address and (for a pending
  // ORCID sign-up, whose address need not be its iD holder's) the iD taken off.
  const { datasetIds } = await resetPasswordWithToken({ secret, passwordHash: await hashPassword(password) });
  if (datasetIds.length > 0) await afterLinkChange(datasetIds);
}

async function checkCurrentPassword(userId: number, current: string) {
  const key = `user:${userId}`;
  await throwIfSpent("passwordRetyped", key, "Too many wrong passwords");
  const row = await getPasswordHash({ id: userId });
  if (!row || !(await verifyPassword(current, row.passwordHash))) {
    await recordFailure("passwordRetyped", key);
    throw new AppError("validation_failed", "Your current password is not right", [
      { pointer: "/current", message: "Your current password is not right" },
    ]);
  }
}

export async function changePassword({ userId, current, password }: { userId: number; current: string; password: string }) {
  await checkCurrentPassword(userId, current);
  await setPasswordHash({ userId, passwordHash: await hashPassword(password), actorId: userId });
}

/** Unlinking ORCID from the settings page: the password is typed again (a session left open is not enough). */
export async function unlinkOrcidWithPassword({ userId, current }: { userId: number; current: string }) {
  const user = await getUserById({ id: userId });
  if (user && !user.passwordSet) {
    throw new AppError("conflict", "Choose a password first (we can e-mail you a link): without ORCID it is how you sign in");
  }
  await checkCurrentPassword(userId, current);
  await unlinkOrcid({ userId });
}
