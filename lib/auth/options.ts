import "server-only";
import type { NextAuthOptions } from "next-auth";
import CredentialsProvider from "next-auth/providers/credentials";
import { z } from "zod";
import { recordAuditEvent } from "@/lib/audit/record";
import { getDb } from "@/db/client";
import { nextAuthSecret } from "@/lib/config";
import { AppError } from "@/lib/errors";
import { getPasswordHash } from "@/lib/users/queries";
import { verifyAgainstNothing, verifyPassword } from "./password";
import { clientIp, consumeOrThrow, resetLimit } from "./rate-limit";

const credentialsSchema = z.object({ email: z.string().trim().email().max(320), password: z.string().min(1).max(200) });

/** The one wording for every failed sign-in, so the answer never tells whether an e-mail exists. */
export const SIGN_IN_FAILED = "E-mail or password is not right.";

/** Checks e-mail and password; throws an Error whose message is safe to show. */
export async function authorizeCredentials(raw: unknown, ip: string) {
  const parsed = credentialsSchema.safeParse(raw);
  if (!parsed.success) throw new Error(SIGN_IN_FAILED);
  const { email, password } = parsed.data;
  try {
    await consumeOrThrow("signInIp", ip, "Too many sign-in attempts from this network");
    await consumeOrThrow("signInAccount", email, "Too many sign-in attempts for this account");
  } catch (err) {
    if (err instanceof AppError) throw new Error(err.message);
    throw err;
  }
  const user = await getPasswordHash({ email });
  const ok = user ? await verifyPassword(password, user.passwordHash) : await verifyAgainstNothing(password);
  if (!user || !ok) throw new Error(SIGN_IN_FAILED);
  // Past this point the person has proved they hold the password, so specific reasons are safe.
  if (user.deactivatedAt) throw new Error("This account has been deactivated. Write to an administrator.");
  if (!user.emailVerifiedAt) throw new Error("Confirm your e-mail address first: open the link we sent you.");
  await resetLimit("signInAccount", email);
  await recordAuditEvent(getDb(), { actorId: user.id, action: "user.signed_in", subjectType: "user", subjectId: user.id, details: { ip } });
  return { id: String(user.id), email: user.email, name: user.name, role: user.role };
}

export const authOptions: NextAuthOptions = {
  session: { strategy: "jwt", maxAge: 7 * 24 * 3600 },
  pages: { signIn: "/sign-in", error: "/sign-in" },
  secret: nextAuthSecret(),
  providers: [
    CredentialsProvider({
      name: "E-mail and password",
      credentials: { email: { label: "E-mail", type: "email" }, password: { label: "Password", type: "password" } },
      authorize: (credentials, req) => authorizeCredentials(credentials, clientIp(req?.headers)),
    }),
  ],
  callbacks: {
    // `user` is present only at sign-in: copy id and role onto the token then.
    jwt({ token, user }) {
      if (user) {
        token.uid = Number(user.id);
        token.role = user.role;
      }
      return token;
    },
    session({ session, token }) {
      if (session.user && token.uid) {
        session.user.id = token.uid;
        session.user.role = token.role;
      }
      return session;
    },
  },
};
