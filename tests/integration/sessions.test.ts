import { createRequire } from "node:module";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import type { NextAuthOptions, Session } from "next-auth";

// getCurrentUser asks next-auth for the session; here that question goes through next-auth's own
// handler with the cookie under test, so the JWT, its callbacks and the database all take part.
let cookieJar: Record<string, string> = {};
vi.mock("next-auth", async (importOriginal) => ({
  ...(await importOriginal<typeof import("next-auth")>()),
  getServerSession: async (options: NextAuthOptions) => {
    const res = await authHandler({ options, req: { action: "session", method: "GET", cookies: cookieJar, headers: {} } });
    return res.body && Object.keys(res.body).length ? (res.body as unknown as Session) : null;
  },
}));

// getCurrentUser asks next-auth only when the request carries a session cookie: the same jar's.
vi.mock("next/headers", () => ({
  headers: async () =>
    new Headers({
      cookie: Object.entries(cookieJar)
        .map(([name, value]) => `${name}=${value}`)
        .join("; "),
    }),
}));

import { hashPassword } from "@/lib/auth/password";
import { authOptions } from "@/lib/auth/options";
import { getCurrentUser } from "@/lib/auth/session";
import { changePassword, requestPasswordReset, resetPassword } from "@/lib/users/accounts";
import { changeUserRole, createUser, setUserActive } from "@/lib/users/queries";
import { fromAddress, linkToken, sql, startMailPipeline, uniqueEmail, uniqueIp, waitForMail } from "./helpers";

// next-auth exports its request core only by file path (package "exports" leave it out).
type AuthResponse = { status?: number; body?: Record<string, unknown>; redirect?: string; cookies?: { name: string; value: string }[] };
const authHandler: (p: { options: NextAuthOptions; req: Record<string, unknown> }) => Promise<AuthResponse> = createRequire(
  import.meta.url,
)(path.resolve("node_modules/next-auth/core/index.js")).AuthHandler;

const SESSION_COOKIE = "next-auth.session-token";

function jar(res: AuthResponse): Record<string, string> {
  return Object.fromEntries((res.cookies ?? []).map((c) => [c.name, c.value]));
}

/** A browser: signs in through next-auth's credentials callback and keeps its cookies. */
async function signIn(email: string, password: string) {
  const headers = { host: "127.0.0.1:3999", ...fromAddress(uniqueIp()) };
  const csrf = await authHandler({ options: authOptions, req: { action: "csrf", method: "GET", cookies: {}, headers } });
  const cookies = jar(csrf);
  const csrfToken = String(csrf.body?.csrfToken);
  const res = await authHandler({
    options: authOptions,
    req: {
      action: "callback",
      providerId: "credentials",
      method: "POST",
      cookies,
      headers,
      body: { email, password, csrfToken, callbackUrl: "/deposits" },
    },
  });
  const all = { ...cookies, ...jar(res) };
  if (!all[SESSION_COOKIE]) throw new Error(`sign-in failed: ${res.redirect}`);
  return {
    cookies: all,
    session: all[SESSION_COOKIE],
    redirect: res.redirect,
    signOut: () =>
      authHandler({ options: authOptions, req: { action: "signout", method: "POST", cookies: all, headers, body: { csrfToken } } }),
  };
}

/** What the app sees with this cookie: next-auth's session endpoint and getCurrentUser. */
async function seenWith(sessionCookie: string) {
  cookieJar = { [SESSION_COOKIE]: sessionCookie };
  const endpoint = await authHandler({ options: authOptions, req: { action: "session", method: "GET", cookies: cookieJar, headers: {} } });
  const user = await getCurrentUser();
  return {
    endpointUserId: (endpoint.body?.user as { id?: number } | undefined)?.id ?? null,
    currentUserId: user?.id ?? null,
    clears: (endpoint.cookies ?? []).some((c) => c.name === SESSION_COOKIE && c.value === ""),
  };
}

async function person(role: "researcher" | "curator" | "admin" = "researcher") {
  const email = uniqueEmail("session");
  const password = "a-session-password";
  const user = await createUser({ email, name: "Session Person", passwordHash: await hashPassword(password), role, verified: true });
  return { ...user, password };
}

let pipeline: Awaited<ReturnType<typeof startMailPipeline>>;
beforeAll(async () => {
  pipeline = await startMailPipeline();
});
afterAll(async () => {
  await pipeline.stop();
});

describe("a session ends when the person says so", () => {
  it("sign in → copy the cookie → sign out → the copied cookie is refused (and every other browser's too)", async () => {
    const p = await person();
    const laptop = await signIn(p.email, p.password);
    const phone = await signIn(p.email, p.password);
    const copied = laptop.session;
    expect(await seenWith(copied)).toMatchObject({ endpointUserId: p.id, currentUserId: p.id });

    const out = await laptop.signOut();
    expect(jar(out)[SESSION_COOKIE]).toBe(""); // the browser's own cookie is cleared as before

    expect(await seenWith(copied)).toEqual({ endpointUserId: null, currentUserId: null, clears: true });
    expect(await seenWith(phone.session)).toMatchObject({ endpointUserId: null, currentUserId: null });
    // Signing in again works and gives a fresh session.
    const again = await signIn(p.email, p.password);
    expect(await seenWith(again.session)).toMatchObject({ currentUserId: p.id });
  });

  it("a password reset ends every session; a newer reset link voids older ones, also after it is used", async () => {
    const p = await person();
    const browser = await signIn(p.email, p.password);
    await requestPasswordReset({ email: p.email, ip: uniqueIp() });
    const linkA = linkToken((await waitForMail(p.email, { subject: /new Arrhenia password/ })).text, "/reset-password");
    await sql`update captured_mail set subject = 'read: ' || subject where ${p.email} = any(to_addresses)`;
    await requestPasswordReset({ email: p.email, ip: uniqueIp() });
    const linkB = linkToken((await waitForMail(p.email, { subject: /^Choose a new Arrhenia password/ })).text, "/reset-password");
    expect(linkB).not.toBe(linkA);

    await expect(resetPassword({ secret: linkA, password: "older-link-password" })).rejects.toThrow(
      /invalid, has expired, or was already used/,
    );
    await resetPassword({ secret: linkB, password: "the-newest-password" });
    await expect(resetPassword({ secret: linkA, password: "older-link-password" })).rejects.toThrow(
      /invalid, has expired, or was already used/,
    );
    await expect(resetPassword({ secret: linkB, password: "again-the-link" })).rejects.toThrow(/already used/);

    expect(await seenWith(browser.session)).toMatchObject({ endpointUserId: null, currentUserId: null });
    await expect(signIn(p.email, "the-newest-password")).resolves.toBeDefined();
  });

  it("a password change ends every session, and no reset link sent before it still works", async () => {
    const p = await person();
    const browser = await signIn(p.email, p.password);
    await requestPasswordReset({ email: p.email, ip: uniqueIp() });
    const link = linkToken((await waitForMail(p.email, { subject: /new Arrhenia password/ })).text, "/reset-password");
    await changePassword({ userId: p.id, current: p.password, password: "changed-on-purpose" });
    expect(await seenWith(browser.session)).toMatchObject({ endpointUserId: null, currentUserId: null });
    await expect(resetPassword({ secret: link, password: "sneaky-old-link" })).rejects.toThrow(/already used/);
  });

  it("a password change also voids a mailed sign-in link sent before it", async () => {
    const p = await person();
    const { createOneTimeToken } = await import("@/lib/users/queries");
    const { authorizeSignInLink } = await import("@/lib/auth/options");
    const secret = await createOneTimeToken({ userId: p.id, purpose: "unlock_sign_in" });
    await changePassword({ userId: p.id, current: p.password, password: "changed-after-the-link" });
    await expect(authorizeSignInLink({ token: secret }, uniqueIp())).rejects.toThrow(/already used/);
  });

  it("deactivation ends every session, and reactivation does not bring the old ones back", async () => {
    const admin = await person("admin");
    const p = await person();
    const browser = await signIn(p.email, p.password);
    await setUserActive({ actorId: admin.id, userId: p.id, active: false });
    expect(await seenWith(browser.session)).toMatchObject({ endpointUserId: null, currentUserId: null });
    await setUserActive({ actorId: admin.id, userId: p.id, active: true });
    expect(await seenWith(browser.session)).toMatchObject({ endpointUserId: null, currentUserId: null });
  });

  it("losing a role ends every session; gaining one does not", async () => {
    const admin = await person("admin");
    const p = await person("curator");
    const browser = await signIn(p.email, p.password);
    await changeUserRole({ actorId: admin.id, userId: p.id, role: "admin" });
    expect(await seenWith(browser.session)).toMatchObject({ currentUserId: p.id });
    await changeUserRole({ actorId: admin.id, userId: p.id, role: "researcher" });
    expect(await seenWith(browser.session)).toMatchObject({ endpointUserId: null, currentUserId: null });
  });

  it("getCurrentUser itself refuses a session whose generation is not the person's", async () => {
    const p = await person();
    const browser = await signIn(p.email, p.password);
    await sql`update users set session_generation = session_generation + 1 where id = ${p.id}`;
    expect(await seenWith(browser.session)).toMatchObject({ currentUserId: null });
  });

  it("after sign-in next-auth sends people only to a path on this site", async () => {
    const p = await person();
    const browser = await signIn(p.email, p.password);
    expect(browser.redirect).toBe("http://localhost:3000/deposits");
    const redirect = authOptions.callbacks!.redirect!;
    for (const url of [
      "/\\evil.example/phish",
      "/%5Cevil.example/phish",
      "//evil.example",
      "https://evil.example/",
      "http://localhost:3000//evil.example",
    ]) {
      expect(await redirect({ url, baseUrl: "http://localhost:3000" })).toBe("http://localhost:3000/");
    }
  });
});
