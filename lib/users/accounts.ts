import "server-only";
import { hashPassword, verifyPassword } from "@/lib/auth/password";
import { consumeOrThrow } from "@/lib/auth/rate-limit";
import { AppError } from "@/lib/errors";
import { enqueueMail } from "@/lib/mail/queue";
import { existingAccountMail, passwordResetMail, verificationMail } from "@/lib/mail/templates";
import {
  consumeOneTimeTokenOrThrow,
  createOneTimeToken,
  createUser,
  getPasswordHash,
  getUserByEmail,
  getUserById,
  isPendingOrcidSignUp,
  markEmailVerified,
  setPasswordHash,
} from "./queries";
import { unlinkOrcid } from "./orcid-accounts";

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

export async function verifyEmail({ secret }: { secret: string }) {
  const userId = await consumeOneTimeTokenOrThrow({ secret, purpose: "verify_email" });
  await markEmailVerified({ userId });
  return getUserById({ id: userId });
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
  const secret = await createOneTimeToken({ userId: user.id, purpose: "verify_email" });
  await enqueueMail(verificationMail(user.email, user.name, secret));
}

/** Sends a reset link when the account exists; answers the same either way. */
export async function requestPasswordReset({ email, ip }: { email: string; ip: string }) {
  await consumeOrThrow("resetIp", ip, "Too many reset requests from this network");
  await consumeOrThrow("resetEmail", email, "Too many reset requests for this address");
  const user = await getUserByEmail({ email });
  if (!user || user.deactivatedAt) return;
  const secret = await createOneTimeToken({ userId: user.id, purpose: "reset_password" });
  await enqueueMail(passwordResetMail(user.email, user.name, secret));
}

export async function resetPassword({ secret, password }: { secret: string; password: string }) {
  const userId = await consumeOneTimeTokenOrThrow({ secret, purpose: "reset_password" });
  // A pending ORCID sign-up's address proven by a reset: whoever typed that address at the ORCID
  // sign-up need not own it, so the iD does not stay with the account (its holder signs in with
  // ORCID again and confirms an address of their own).
  const before = await getUserById({ id: userId });
  await setPasswordHash({ userId, passwordHash: await hashPassword(password), actorId: userId });
  if (before && isPendingOrcidSignUp(before)) await unlinkOrcid({ userId });
  // Following a link from the inbox also proves the address.
  await markEmailVerified({ userId });
}

export async function changePassword({ userId, current, password }: { userId: number; current: string; password: string }) {
  const row = await getPasswordHash({ id: userId });
  if (!row || !(await verifyPassword(current, row.passwordHash))) {
    throw new AppError("validation_failed", "Your current password is not right", [
      { pointer: "/current", message: "Your current password is not right" },
    ]);
  }
  await setPasswordHash({ userId, passwordHash: await hashPassword(password), actorId: userId });
}
