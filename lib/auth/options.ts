import "server-only";
import { databaseUnavailable } from "@/lib/errors";
import { isDatabaseOutage } from "@/lib/jobs/outage";
import { getServerSession, type NextAuthOptions, type User } from "next-auth";
import CredentialsProvider from "next-auth/providers/credentials";
import type { OAuthConfig } from "next-auth/providers/oauth";
import { z } from "zod";
import { recordAuditEvent } from "@/lib/audit/record";
import { getDb } from "@/db/client";
import { nextAuthSecret } from "@/lib/config";
import { AppError } from "@/lib/errors";
import { appUrl, orcidSettings } from "@/lib/config";
import { resolveOrcidSignIn } from "@/lib/users/orcid-accounts";
import { enqueueMail } from "@/lib/mail/queue";
import { signInLinkMail } from "@/lib/mail/templates";
import { consumeOneTimeTokenOrThrow, createOneTimeToken, endAllSessions, getPasswordHash, getUserForSession } from "@/lib/users/queries";
import { safeCallbackPath } from "./callback-url";
import { clientAddress } from "./client-address";
import { verifyAgainstNothing, verifyPassword } from "./password";
import { isSpent, recordFailure, resetLimit, throwIfSpent } from "./rate-limit";

const credentialsSchema = z.object({ email: z.string().trim().email().max(320), password: z.string().min(1).max(200) });
const linkSchema = z.object({ token: z.string().min(20).max(200) });

/** The one wording for every failed sign-in, so the answer never tells whether an e-mail exists. */
export const SIGN_IN_FAILED = "E-mail or password is not right.";

/** The one wording while sign-in is paused, whatever password was typed, so a lock never confirms a guess. */
export const SIGN_IN_LOCKED =
  "Sign-in to this account from here is paused for 15 minutes after too many failed attempts (longer after failures from many places). If the password you typed is right and the address is confirmed, we have e-mailed you a link that signs you in; if you have forgotten the password, choose a new one (link below).";

const pairKey = (email: string, ip: string) => `${email.toLowerCase()}|${ip}`;

function toSessionUser(user: { id: number; email: string; name: string; role: User["role"]; sessionGeneration: number }): User {
  return { id: String(user.id), email: user.email, name: user.name, role: user.role, sessionGeneration: user.sessionGeneration };
}

async function rethrowLimit<T>(work: () => Promise<T>): Promise<T> {
  try {
    return await work();
  } catch (err) {
    // next-auth shows an Error's message; AppError's own message is written for people.
    if (err instanceof AppError) throw new Error(err.message);
    throw err;
  }
}

/**
 * Checks e-mail and password from the client address `ip`; throws an Error whose message is safe
 * to show. Failures lock the (account, address) pair, and many failures from anywhere lock the
 * account; through either lock the right password gets a one-time sign-in link by e-mail.
 */
export async function authorizeCredentials(raw: unknown, ip: string) {
  const parsed = credentialsSchema.safeParse(raw);
  if (!parsed.success) throw new Error(SIGN_IN_FAILED);
  const { email, password } = parsed.data;
  // Only failures count against the address: a lab signing in rightly from one address is never locked out.
  await rethrowLimit(() => throwIfSpent("signInIp", ip, "Too many failed sign-in attempts from this network"));
  const locked = (await isSpent("signInPair", pairKey(email, ip))) || (await isSpent("signInAccount", email));
  const user = await getPasswordHash({ email });
  const ok = user ? await verifyPassword(password, user.passwordHash) : await verifyAgainstNothing(password);
  if (locked) {
    if (user && ok && !user.deactivatedAt && user.emailVerifiedAt) await mailSignInLink(user);
    throw new Error(SIGN_IN_LOCKED);
  }
  if (!ok) await recordFailure("signInIp", ip);
  if (!user || !ok) {
    await recordFailure("signInPair", pairKey(email, ip));
    await recordFailure("signInAccount", email);
    throw new Error(SIGN_IN_FAILED);
  }
  // Past this point the person has proved they hold the password, so specific reasons are safe.
  if (user.deactivatedAt) throw new Error("This account has been deactivated. Write to an administrator.");
  if (!user.emailVerifiedAt) throw new Error("Confirm your e-mail address first: open the link we sent you.");
  await resetLimit("signInPair", pairKey(email, ip));
  await recordAuditEvent(getDb(), { actorId: user.id, action: "user.signed_in", subjectType: "user", subjectId: user.id, details: { ip } });
  return toSessionUser(user);
}

async function mailSignInLink(user: { id: number; email: string; name: string }) {
  // A few links an hour at most: the right password typed again and again must not flood the inbox.
  if (await isSpent("unlockMail", user.email)) return;
  await recordFailure("unlockMail", user.email);
  const secret = await createOneTimeToken({ userId: user.id, purpose: "unlock_sign_in" });
  await enqueueMail(signInLinkMail(user.email, user.name, secret));
}

/**
 * next-auth shows an authorize error's message to the person word for word: a database that is out
 * of reach must read as a moment's wait, never as the driver's "connect ECONNREFUSED 127.0.0.1:…".
 */
export async function unlessOutOfReach<T>(authorize: () => Promise<T>): Promise<T> {
  try {
    return await authorize();
  } catch (err) {
    const unavailable = databaseUnavailable(err);
    if (unavailable) throw new Error("Sign-in is out of reach for a moment; try again in a few seconds.");
    throw err;
  }
}

/** Signs in with a mailed one-time link (sent when the right password met a lock); the lock is lifted. */
export async function authorizeSignInLink(raw: unknown, ip: string) {
  const parsed = linkSchema.safeParse(raw);
  if (!parsed.success) throw new Error("This link is invalid, has expired, or was already used. Sign in again to get a new one.");
  const userId = await rethrowLimit(() => consumeOneTimeTokenOrThrow({ secret: parsed.data.token, purpose: "unlock_sign_in" }));
  const user = await getUserForSession({ id: userId });
  if (!user || user.deactivatedAt || !user.emailVerifiedAt) throw new Error("This account cannot sign in. Write to an administrator.");
  await resetLimit("signInAccount", user.email);
  await resetLimit("signInPair", pairKey(user.email, ip));
  await recordAuditEvent(getDb(), {
    actorId: user.id,
    action: "user.signed_in",
    subjectType: "user",
    subjectId: user.id,
    details: { ip, through: "mailed link" },
  });
  return toSessionUser(user);
}

/** Thrown inside the jwt callback: next-auth then clears the cookie and answers with no session. */
class SessionEndedError extends Error {
  constructor() {
    super("This session has ended");
    this.name = "SessionEndedError";
  }
}

/** Whether a session stamped with generation `gen` for person `uid` still counts. */
export async function isSessionCurrent(uid: number | undefined, gen: number | undefined): Promise<boolean> {
  if (!uid || gen === undefined) return false;
  const user = await getUserForSession({ id: uid });
  return !!user && !user.deactivatedAt && user.sessionGeneration === gen;
}

/** The claims of an ORCID ID token that we read: `sub` is the iD. */
interface OrcidClaims {
  sub: string;
  name?: string;
  given_name?: string;
  family_name?: string;
}

/**
 * ORCID's OpenID Connect sign-in (or the local stand-in, lib/auth/orcid-stand-in.ts): discovery
 * from the issuer, PKCE, state and nonce checked, the callback address next-auth builds from
 * NEXTAUTH_URL. Only the ID token's claims are read; no provider token is kept.
 */
function orcidProvider(): OAuthConfig<OrcidClaims> {
  const { issuer, clientId, clientSecret } = orcidSettings();
  return {
    id: "orcid",
    name: "ORCID",
    type: "oauth",
    wellKnown: `${issuer}/.well-known/openid-configuration`,
    authorization: { params: { scope: "openid" } },
    clientId,
    clientSecret,
    idToken: true,
    checks: ["pkce", "state", "nonce"],
    // Replaced by the account's own id, role and generation in the signIn callback.
    profile: (claims) => ({ id: claims.sub, name: reportedName(claims), email: null, role: "researcher", sessionGeneration: -1 }),
  };
}

function reportedName(claims: OrcidClaims): string {
  return (claims.name ?? [claims.given_name, claims.family_name].filter(Boolean).join(" ")).trim();
}

/** Where an ORCID sign-in that is not a plain sign-in ends: the confirmation page, settings, or a worded refusal. */
async function orcidSignIn(user: User, claims: OrcidClaims | undefined): Promise<true | string> {
  const base = appUrl();
  if (!claims?.sub) return `${base}/sign-in?error=OrcidNotAnId`;
  // Someone already signed in is linking the iD to their account (settings page).
  const session = await getServerSession(authOptions);
  const currentUserId =
    session?.user?.id && (await isSessionCurrent(session.user.id, session.user.sessionGeneration)) ? session.user.id : null;
  const outcome = await resolveOrcidSignIn({ subject: claims.sub, reportedName: reportedName(claims), currentUserId });
  switch (outcome.kind) {
    case "sign_in":
      Object.assign(user, toSessionUser(outcome.user));
      return true;
    case "confirm":
      return `${base}/sign-in/orcid?ticket=${encodeURIComponent(outcome.ticket)}`;
    case "linked":
      return `${base}/settings?orcid=linked`;
    case "refused":
      return currentUserId !== null ? `${base}/settings?orcid=${outcome.code}` : `${base}/sign-in?error=${outcome.code}`;
  }
}

export const authOptions: NextAuthOptions = {
  session: { strategy: "jwt", maxAge: 7 * 24 * 3600 },
  pages: { signIn: "/sign-in", error: "/sign-in" },
  secret: nextAuthSecret(),
  providers: [
    CredentialsProvider({
      name: "E-mail and password",
      credentials: { email: { label: "E-mail", type: "email" }, password: { label: "Password", type: "password" } },
      authorize: (credentials, req) => unlessOutOfReach(() => authorizeCredentials(credentials, clientAddress(req?.headers))),
    }),
    CredentialsProvider({
      id: "sign-in-link",
      name: "Mailed sign-in link",
      credentials: { token: { label: "Code", type: "text" } },
      authorize: (credentials, req) => unlessOutOfReach(() => authorizeSignInLink(credentials, clientAddress(req?.headers))),
    }),
    orcidProvider(),
  ],
  callbacks: {
    // Credentials were checked in authorize; an ORCID iD is resolved to an account (or a confirmation) here.
    signIn({ user, account, profile }) {
      if (account?.provider !== "orcid") return true;
      return orcidSignIn(user, profile as OrcidClaims | undefined);
    },
    // `user` is present only at sign-in: copy id, role and session generation onto the token then;
    // on every later read the generation must still match the database.
    async jwt({ token, user }) {
      if (user) {
        token.uid = Number(user.id);
        token.role = user.role;
        token.gen = user.sessionGeneration;
        return token;
      }
      let current: boolean;
      try {
        current = await isSessionCurrent(token.uid, token.gen);
      } catch (err) {
        // The database out of reach for a moment ends nobody's session: the cookie stays, and every
        // page or action that needs the person reads the database again (and says it is out of reach).
        if (isDatabaseOutage(err)) return token;
        throw err;
      }
      if (!current) throw new SessionEndedError();
      return token;
    },
    session({ session, token }) {
      if (session.user && token.uid) {
        session.user.id = token.uid;
        session.user.role = token.role;
        session.user.sessionGeneration = token.gen ?? -1;
      }
      return session;
    },
    // Only paths on this site: next-auth's own check lets `/\evil.example` through to the browser.
    redirect({ url, baseUrl }) {
      return `${baseUrl}${safeCallbackPath(url, baseUrl)}`;
    },
  },
  events: {
    // Signing out ends every session of the person, not only this browser's cookie: a copied
    // cookie is refused from now on.
    async signOut({ token }) {
      if (token?.uid) await endAllSessions({ userId: token.uid });
    },
  },
  logger: {
    error(code, metadata) {
      // An ended session is an expected outcome, not a fault.
      const err = metadata instanceof Error ? metadata : (metadata as { error?: unknown } | undefined)?.error;
      if (err instanceof SessionEndedError) return;
      console.error(`[next-auth][error][${code}]`, metadata);
    },
    warn(code) {
      console.warn(`[next-auth][warn][${code}]`);
    },
    debug() {},
  },
};

/** The site's own origin, for pages that validate a callback path before next-auth sees it. */
export function siteOrigin(): string {
  return new URL(appUrl()).origin;
}
