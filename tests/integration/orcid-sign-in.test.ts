// Sign-in with ORCID through next-auth's own route handler (app/api/auth) against the local
// stand-in provider (lib/auth/orcid-stand-in.ts), with the browser played by this file: the
// cookies next-auth sets are kept and given back, and the stand-in's forms are posted.
import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";

const browser = vi.hoisted(() => {
  // The stand-in's port must be known when lib/auth/options.ts builds the provider (at import).
  process.env.ORCID_STAND_IN_PORT = String(43000 + Math.floor(Math.random() * 2000));
  process.env.NEXTAUTH_URL = "http://127.0.0.1:3999";
  delete process.env.ORCID_ISSUER;
  return { cookies: new Map<string, string>() };
});

const fakeHeaders = vi.hoisted(() => ({
  // Each request from its own address, vouched for as the front server does (sign-ups are limited per address).
  headers: async () =>
    new Headers({
      host: "127.0.0.1:3999",
      "x-arrhenia-client-address": `10.${Math.floor(Math.random() * 250)}.${Math.floor(Math.random() * 250)}.${1 + Math.floor(Math.random() * 250)}`,
      "x-arrhenia-edge-key": process.env.ARRHENIA_EDGE_KEY ?? "",
    }),
  cookies: async () => ({
    getAll: () => [...browser.cookies].map(([name, value]) => ({ name, value })),
    get: (name: string) => (browser.cookies.has(name) ? { name, value: browser.cookies.get(name)! } : undefined),
    has: (name: string) => browser.cookies.has(name),
    set: (name: string, value: string) => void browser.cookies.set(name, value),
    delete: (name: string | { name: string }) => void browser.cookies.delete(typeof name === "string" ? name : name.name),
  }),
}));
vi.mock("next/headers", () => fakeHeaders);
// The tags invalidated (lib/public-cache.ts), in order.
const revalidated = vi.hoisted(() => [] as string[]);
vi.mock("next/cache", () => ({
  revalidatePath: () => {},
  revalidateTag: (tag: string) => void revalidated.push(tag),
  unstable_cache: (fn: () => unknown) => fn,
}));

import { createRequire } from "node:module";
import { NextRequest } from "next/server";
import { GET, POST } from "@/app/api/auth/[...nextauth]/route";
import { confirmOrcidSignUpAction } from "@/app/sign-in/orcid/actions";
import { refuseOrcidAction, verifyAction } from "@/app/verify/actions";
import { idleState } from "@/lib/auth/action-state";
import { startOrcidStandIn, type OrcidStandIn } from "@/lib/auth/orcid-stand-in";
import { hashPassword } from "@/lib/auth/password";
import { ORCID_STAND_IN_CLIENT } from "@/lib/config";
import { payloadSha256 } from "@/lib/curation/transitions";
import { EXAMPLE_DEPOSIT } from "@/lib/deposits";
import { getPublicVersionDatacite } from "@/lib/identifiers/public-datacite";
import { getPublicProfile, listProfileDatasets } from "@/lib/people/queries";
import { unlinkOrcid } from "@/lib/users/orcid-accounts";
import {
  confirmAddressWithToken,
  createOneTimeToken,
  createUser,
  getUserByEmail,
  markEmailVerified,
  saveOrcidSignUp,
} from "@/lib/users/queries";
import { requestPasswordReset, resetPassword, setAccountActive, unlinkOrcidWithPassword } from "@/lib/users/accounts";
import { freshOrcid } from "../support/orcid";
import { depositInState, linkToken, sql, startMailPipeline, uniqueEmail, uniqueIp, waitForMail } from "./helpers";

// next-auth loads next/headers with require(), which vi.mock does not reach: the same fake goes into require's cache.
const nodeRequire = createRequire(import.meta.url);
const headersPath = nodeRequire.resolve("next/headers");
nodeRequire.cache[headersPath] = { id: headersPath, filename: headersPath, loaded: true, exports: fakeHeaders } as unknown as NodeJS.Module;

const APP = "http://127.0.0.1:3999";
let standIn: OrcidStandIn;
let mail: Awaited<ReturnType<typeof startMailPipeline>>;

beforeAll(async () => {
  mail = await startMailPipeline();
  standIn = await startOrcidStandIn({
    port: Number(process.env.ORCID_STAND_IN_PORT),
    ...ORCID_STAND_IN_CLIENT,
    redirectUri: `${APP}/api/auth/callback/orcid`,
    appUrl: APP,
  });
});
afterAll(async () => {
  await mail?.stop();
  await standIn?.close();
});

function keepCookies(res: Response, jar: Map<string, string>) {
  for (const line of res.headers.getSetCookie()) {
    const [pair, ...attributes] = line.split(";");
    const at = pair.indexOf("=");
    const name = pair.slice(0, at).trim();
    // Kept decoded, as Next's cookies() gives them.
    const value = decodeURIComponent(pair.slice(at + 1).trim());
    const expired = attributes.some((a) => /max-age=0\b/i.test(a.trim()) || /expires=Thu, 01 Jan 1970/i.test(a.trim()));
    if (expired || value === "") jar.delete(name);
    else jar.set(name, value);
  }
}

/** One request to next-auth's route handler as the browser makes it; the cookies it sets are kept. */
async function auth(method: "GET" | "POST", path: string, form?: Record<string, string>): Promise<Response> {
  const url = new URL(path, APP);
  const segments = url.pathname.replace(/^\/api\/auth\//, "").split("/");
  const init: RequestInit = form
    ? { method, body: new URLSearchParams(form).toString(), headers: { "content-type": "application/x-www-form-urlencoded" } }
    : { method };
  const req = new NextRequest(url, init as ConstructorParameters<typeof NextRequest>[1]);
  const context = { params: Promise.resolve({ nextauth: segments }) };
  const res = await (method === "GET" ? GET(req, context) : POST(req, context));
  keepCookies(res, browser.cookies);
  return res;
}

/** The stand-in's side: follows its redirects with a cookie jar of its own until one leaves for the app. */
async function atStandIn(url: string, jar: Map<string, string>, form?: Record<string, string>): Promise<{ url: string; html?: string }> {
  let next: string | null = url;
  let body = form ? new URLSearchParams(form).toString() : undefined;
  while (next && next.startsWith(standIn.url)) {
    const res: Response = await fetch(next, {
      method: body ? "POST" : "GET",
      body,
      redirect: "manual",
      headers: {
        cookie: [...jar].map(([k, v]) => `${k}=${encodeURIComponent(v)}`).join("; "),
        ...(body ? { "content-type": "application/x-www-form-urlencoded" } : {}),
      },
    });
    keepCookies(res, jar);
    body = undefined;
    const location = res.headers.get("location");
    if (!location) return { url: next, html: await res.text() };
    next = new URL(location, next).toString();
  }
  return { url: next! };
}

/**
 * A whole ORCID sign-in: next-auth starts it, the person signs in at the stand-in as `orcid` and
 * allows (or denies) sharing; returns where the app's callback sends the browser.
 */
async function signInWithOrcid({
  orcid,
  name = "Test Person",
  consent = "allow",
  alterState = false,
}: {
  orcid: string;
  name?: string;
  consent?: "allow" | "deny";
  alterState?: boolean;
}): Promise<string> {
  const csrf = (await (await auth("GET", "/api/auth/csrf")).json()) as { csrfToken: string };
  const started = await auth("POST", "/api/auth/signin/orcid", { csrfToken: csrf.csrfToken, callbackUrl: `${APP}/deposits`, json: "true" });
  const { url } = (await started.json()) as { url: string };
  expect(url.startsWith(standIn.url)).toBe(true);
  const authorize = new URL(url);
  // PKCE, state and nonce are all sent.
  expect(authorize.searchParams.get("code_challenge_method")).toBe("S256");
  expect(authorize.searchParams.get("state")).toBeTruthy();
  expect(authorize.searchParams.get("nonce")).toBeTruthy();
  const jar = new Map<string, string>();
  const login = await atStandIn(url, jar);
  expect(login.html).toContain("Sign in with your ORCID iD");
  const consentPage = await atStandIn(`${login.url}/login`, jar, { orcid, name, action: "sign-in" });
  const back = consentPage.html ? await atStandIn(`${consentPage.url}/consent`, jar, { action: consent }) : consentPage;
  const callback = new URL(back.url);
  expect(callback.origin + callback.pathname).toBe(`${APP}/api/auth/callback/orcid`);
  if (alterState) callback.searchParams.set("state", `${callback.searchParams.get("state")}x`);
  const done = await auth("GET", callback.pathname + callback.search);
  expect(done.status).toBeGreaterThanOrEqual(300);
  return done.headers.get("location") ?? "";
}

/** The confirmation page's address: the ticket is in this browser's cookie, never in the address. */
const CONFIRM_PAGE = `${APP}/sign-in/orcid`;

async function confirm(location: string, name: string, email: string) {
  expect(location).toBe(CONFIRM_PAGE);
  const form = new FormData();
  form.set("name", name);
  form.set("email", email);
  return confirmOrcidSignUpAction(idleState, form);
}

async function signInWithPassword(email: string, password: string) {
  browser.cookies.clear();
  const csrf = (await (await auth("GET", "/api/auth/csrf")).json()) as { csrfToken: string };
  const res = await auth("POST", "/api/auth/callback/credentials", { csrfToken: csrf.csrfToken, email, password, json: "true" });
  expect(res.status).toBe(200);
  expect([...browser.cookies.keys()].some((k) => k.endsWith("session-token"))).toBe(true);
}

const accountOf = async (orcid: string) =>
  (await sql`select id, email, name, role, email_verified_at, password_set from users where verified_orcid = ${orcid}`)[0];

describe("sign in with ORCID through the stand-in", () => {
  it("a first sign-in asks for a name and an address, and creates a researcher only then", async () => {
    browser.cookies.clear();
    const orcid = freshOrcid();
    const location = await signInWithOrcid({ orcid, name: "Nadia Ferreira" });
    expect(location).toBe(CONFIRM_PAGE);
    // Nothing is stored before the confirmation, and no session was opened.
    expect(await accountOf(orcid)).toBeUndefined();
    expect([...browser.cookies.keys()].some((k) => k.endsWith("session-token"))).toBe(false);
    const email = uniqueEmail("orcid-first");
    const answer = await confirm(location, "Nadia Ferreira", email);
    expect(answer.status).toBe("ok");
    const account = await accountOf(orcid);
    expect(account).toMatchObject({ email, name: "Nadia Ferreira", role: "researcher", email_verified_at: null, password_set: false });
    const [token] = await sql`select count(*)::int as n from one_time_tokens where user_id = ${account.id} and purpose = 'verify_email'`;
    expect(token.n).toBe(1);
    // No profile before the address is confirmed.
    expect(await getPublicProfile({ id: account.id })).toBeNull();
  });

  it("a second sign-in with a confirmed account signs it in, with the database's role", async () => {
    browser.cookies.clear();
    const orcid = freshOrcid();
    await confirm(await signInWithOrcid({ orcid }), "Returning Person", uniqueEmail("orcid-again"));
    const account = await accountOf(orcid);
    await markEmailVerified({ userId: account.id });
    await sql`update users set role = 'curator' where id = ${account.id}`;
    browser.cookies.clear();
    const location = await signInWithOrcid({ orcid });
    expect(location).toBe(`${APP}/deposits`);
    expect([...browser.cookies.keys()].some((k) => k.endsWith("session-token"))).toBe(true);
    const session = (await (await auth("GET", "/api/auth/session")).json()) as { user?: { id: number; role: string } };
    expect(session.user).toMatchObject({ id: account.id, role: "curator" });
    const [n] = await sql`select count(*)::int as n from users where verified_orcid = ${orcid}`;
    expect(n.n).toBe(1);
    expect(await getPublicProfile({ id: account.id })).toMatchObject({ verifiedOrcid: orcid });
  });

  it("a later sign-in takes the place of a pending, unconfirmed sign-up with the same iD", async () => {
    browser.cookies.clear();
    const orcid = freshOrcid();
    const mistyped = uniqueEmail("orcid-mistyped");
    await confirm(await signInWithOrcid({ orcid }), "Pending Person", mistyped);
    const pending = await accountOf(orcid);
    // The mistyped address is never confirmed; the iD's owner signs in again.
    const location = await signInWithOrcid({ orcid });
    expect(location).toBe(CONFIRM_PAGE);
    const right = uniqueEmail("orcid-right");
    expect((await confirm(location, "Pending Person", right)).status).toBe("ok");
    const now = await accountOf(orcid);
    expect(now).toMatchObject({ id: pending.id, email: right });
    // The link mailed to the mistyped address confirms nothing any more.
    const [open] =
      await sql`select count(*)::int as n from one_time_tokens where user_id = ${pending.id} and purpose = 'verify_email' and used_at is null`;
    expect(open.n).toBe(1);
  });

  it("a confirmation page confirms one sign-up: a copy of its address used again is refused and changes nothing", async () => {
    browser.cookies.clear();
    const orcid = freshOrcid();
    const location = await signInWithOrcid({ orcid });
    const owner = uniqueEmail("orcid-owner");
    const ticket = browser.cookies.get("arrhenia-orcid-ticket")!;
    expect(ticket).toBeTruthy();
    expect((await confirm(location, "Ticket Owner", owner)).status).toBe("ok");
    // The same ticket sent again (this browser, or a copy of its cookie elsewhere) is refused.
    browser.cookies.set("arrhenia-orcid-ticket", ticket);
    const replay = await confirm(location, "Ticket Thief", uniqueEmail("orcid-thief"));
    expect(replay).toMatchObject({ status: "error", message: expect.stringMatching(/used already/) });
    expect(await accountOf(orcid)).toMatchObject({ email: owner, name: "Ticket Owner" });
  });

  it("the confirmation page opens only in the browser that came back from ORCID: its address handed to someone else confirms nothing", async () => {
    browser.cookies.clear();
    const orcid = freshOrcid();
    const location = await signInWithOrcid({ orcid, name: "Victor Victim" });
    expect(location).not.toContain("ticket");
    // Someone else opens the same address in their own browser: no ticket there.
    browser.cookies.clear();
    const answer = await confirm(location, "Victor Victim", uniqueEmail("orcid-forwarded"));
    expect(answer).toMatchObject({ status: "error", message: expect.stringMatching(/expired or was not made by this site/) });
    expect(await accountOf(orcid)).toBeUndefined();
  });

  it("a confirmation racing an address change never confirms the new address under the iD (twenty rounds, both orders)", async () => {
    const keyA = "a".repeat(64);
    const keyB = "b".repeat(64);
    for (let round = 0; round < 20; round++) {
      const orcid = freshOrcid();
      const own = uniqueEmail("race-own");
      const other = uniqueEmail("race-other");
      const first = await saveOrcidSignUp({
        orcid,
        name: "Racer",
        email: own,
        passwordHash: "x",
        ticketId: `race-${orcid}-1`,
        browserKeyHash: keyA,
      });
      if (!first || first === "ticket_used") throw new Error("the first sign-up was not stored");
      const confirmOwn = () =>
        confirmAddressWithToken({ secret: first.secret, browserKeyHash: async () => keyA }).catch((err: Error) => err);
      const switchAddress = () =>
        saveOrcidSignUp({ orcid, name: "Racer", email: other, passwordHash: "x", ticketId: `race-${orcid}-2`, browserKeyHash: keyB });
      await Promise.all(round % 2 ? [confirmOwn(), switchAddress()] : [switchAddress(), confirmOwn()]);
      const [row] = await sql`select email, email_verified_at, verified_orcid from users where id = ${first.user.id}`;
      // Either the own address was confirmed first (and the change refused), or the change won (and nothing is confirmed).
      if (row.email_verified_at) expect(row.email).toBe(own);
      else expect(row.email).toBe(other);
    }
  });

  it("changing a pending sign-up's address voids every link sent to the old one: a reset link for it opens nothing", async () => {
    browser.cookies.clear();
    const orcid = freshOrcid();
    const own = uniqueEmail("orcid-own");
    await confirm(await signInWithOrcid({ orcid }), "Switching Person", own);
    const pending = await accountOf(orcid);
    await requestPasswordReset({ email: own, ip: uniqueIp() });
    const [reset] =
      await sql`select count(*)::int as n from one_time_tokens where user_id = ${pending.id} and purpose = 'reset_password' and used_at is null`;
    expect(reset.n).toBe(1);
    const resetSecret = await createOneTimeToken({ userId: pending.id, purpose: "reset_password" });
    // The same iD signs in again and types someone else's address.
    const victim = uniqueEmail("orcid-switched-to");
    await confirm(await signInWithOrcid({ orcid }), "Switching Person", victim);
    await expect(resetPassword({ secret: resetSecret, password: "the attacker's password" })).rejects.toThrow(/already used/);
    const [row] = await sql`select email, email_verified_at, password_set from users where id = ${pending.id}`;
    expect(row).toMatchObject({ email: victim, email_verified_at: null, password_set: false });
    const [open] = await sql`select purpose from one_time_tokens where user_id = ${pending.id} and used_at is null`;
    expect(open.purpose).toBe("verify_email"); // only the new address's confirmation link is live
    // A link asked for the old address after the change is not made at all.
    expect(await createOneTimeToken({ userId: pending.id, purpose: "reset_password", sentTo: own })).toBeNull();
  });

  it("a pending ORCID sign-up whose address is proven by a password reset loses the iD (whoever typed the address need not own it)", async () => {
    browser.cookies.clear();
    const orcid = freshOrcid();
    const victim = uniqueEmail("orcid-victim");
    await confirm(await signInWithOrcid({ orcid }), "Planted Name", victim);
    const planted = await accountOf(orcid);
    const secret = await createOneTimeToken({ userId: planted.id, purpose: "reset_password" });
    await resetPassword({ secret, password: "the victim's own password" });
    expect(await accountOf(orcid)).toBeUndefined();
    const [row] = await sql`select verified_orcid, email_verified_at from users where id = ${planted.id}`;
    expect(row.verified_orcid).toBeNull();
    expect(row.email_verified_at).not.toBeNull();
    // The iD's holder signing in with ORCID again is asked for an address of their own; they never reach the victim's account.
    expect(await signInWithOrcid({ orcid })).toBe(CONFIRM_PAGE);
  });

  it("the mailed link of an ORCID sign-up names the iD and confirms only in the browser that signed in", async () => {
    browser.cookies.clear();
    const orcid = freshOrcid();
    const email = uniqueEmail("orcid-same-browser");
    expect((await confirm(await signInWithOrcid({ orcid }), "Same Browser", email)).status).toBe("ok");
    const message = await waitForMail(email, { subject: /ORCID sign-in/ });
    expect(message.text).toContain(orcid);
    expect(message.text).toContain("This was not me");
    const form = new FormData();
    form.set("token", linkToken(message.text, "/verify"));
    // The same browser (its cookie kept): confirmed, and sent on to sign in.
    await expect(verifyAction(idleState, form)).rejects.toMatchObject({ digest: expect.stringContaining("/sign-in?verified=orcid") });
    expect((await accountOf(orcid)).email_verified_at).not.toBeNull();
  });

  it("an unrequested ORCID sign-up's link opened elsewhere confirms nothing, names the iD, and the address's owner can refuse it", async () => {
    browser.cookies.clear();
    const orcid = freshOrcid();
    const victim = uniqueEmail("orcid-planted");
    expect((await confirm(await signInWithOrcid({ orcid }), "Planted Name", victim)).status).toBe("ok");
    const planted = await accountOf(orcid);
    const token = linkToken((await waitForMail(victim, { subject: /ORCID sign-in/ })).text, "/verify");
    // The address's owner opens the link in their own browser: no key of that sign-up there.
    browser.cookies.clear();
    const form = new FormData();
    form.set("token", token);
    const answer = await verifyAction(idleState, form);
    expect(answer).toMatchObject({ status: "error", data: { orcid } });
    expect(answer.message).toContain(orcid);
    expect((await accountOf(orcid)).email_verified_at).toBeNull();
    // A key of another sign-up does not do either.
    browser.cookies.set("arrhenia-orcid-sign-up", "osb_not-the-key-of-this-sign-up");
    expect(await verifyAction(idleState, form)).toMatchObject({ status: "error", data: { orcid } });
    // "This was not me": the iD leaves the address, and the link confirms nothing any more.
    expect(await refuseOrcidAction(idleState, form)).toMatchObject({ status: "ok", message: expect.stringContaining(orcid) });
    expect(await accountOf(orcid)).toBeUndefined();
    const [row] = await sql`select verified_orcid, email_verified_at, email, deactivated_at from users where id = ${planted.id}`;
    expect(row).toMatchObject({ verified_orcid: null, email_verified_at: null });
    // The sign-up is cancelled and the address free: its owner can make an account with it.
    expect(row.email).not.toBe(victim);
    expect(row.deactivated_at).not.toBeNull();
    expect(await getUserByEmail({ email: victim })).toBeNull();
    expect(await verifyAction(idleState, form)).toMatchObject({ status: "error", message: expect.stringMatching(/already used/) });
    expect(await refuseOrcidAction(idleState, form)).toMatchObject({ status: "error" });
    // The iD's holder signing in again is asked for an address of their own.
    browser.cookies.clear();
    expect(await signInWithOrcid({ orcid })).toBe(CONFIRM_PAGE);
  });

  it("a signed-in person links and unlinks an iD; a second account cannot link the same iD", async () => {
    const password = "a long enough password";
    const mk = async (tag: string) =>
      createUser({ email: uniqueEmail(tag), name: tag, passwordHash: await hashPassword(password), verified: true });
    const [first, second] = await Promise.all([mk("orcid-linker"), mk("orcid-second")]);
    const orcid = freshOrcid();
    await signInWithPassword(first.email, password);
    expect(await signInWithOrcid({ orcid })).toBe(`${APP}/settings?orcid=linked`);
    expect((await accountOf(orcid)).id).toBe(first.id);

    await signInWithPassword(second.email, password);
    expect(await signInWithOrcid({ orcid })).toBe(`${APP}/settings?orcid=OrcidLinkedElsewhere`);
    expect((await accountOf(orcid)).id).toBe(first.id);
    const [secondRow] = await sql`select verified_orcid from users where id = ${second.id}`;
    expect(secondRow.verified_orcid).toBeNull();

    // Unlinking from the settings page asks for the password again: a wrong one changes nothing.
    await expect(unlinkOrcidWithPassword({ userId: first.id, current: "not the password" })).rejects.toThrow(/not right/);
    expect((await accountOf(orcid)).id).toBe(first.id);
    await unlinkOrcidWithPassword({ userId: first.id, current: password });
    expect(await accountOf(orcid)).toBeUndefined();
  });

  it("the password typed again to unlink is limited: a session is no licence to guess it", async () => {
    const user = await createUser({
      email: uniqueEmail("orcid-guess"),
      name: "Guessed",
      passwordHash: await hashPassword("the right password"),
      verified: true,
    });
    for (let i = 0; i < 6; i++) {
      await expect(unlinkOrcidWithPassword({ userId: user.id, current: `guess ${i}` })).rejects.toThrow(/not right/);
    }
    await expect(unlinkOrcidWithPassword({ userId: user.id, current: "the right password" })).rejects.toThrow(/Too many wrong passwords/);
  });

  it("an account made through ORCID cannot unlink before it has a password", async () => {
    browser.cookies.clear();
    const orcid = freshOrcid();
    await confirm(await signInWithOrcid({ orcid }), "Keyless Person", uniqueEmail("orcid-nokey"));
    const account = await accountOf(orcid);
    await expect(unlinkOrcid({ userId: account.id })).rejects.toMatchObject({ status: 409 });
    expect((await accountOf(orcid)).id).toBe(account.id);
  });

  it("a state mismatch is refused and changes nothing", async () => {
    browser.cookies.clear();
    const orcid = freshOrcid();
    const refused = await signInWithOrcid({ orcid, alterState: true });
    expect(refused).toBe(`${APP}/api/auth/error?error=OAuthCallback`);
    // next-auth's own addresses send the browser on to the sign-in page, which words the code.
    let next = refused;
    for (let hops = 0; hops < 3 && new URL(next, APP).pathname.startsWith("/api/auth/"); hops++)
      next = (await auth("GET", next)).headers.get("location") ?? "";
    const page = new URL(next, APP);
    expect(page.pathname).toBe("/sign-in");
    expect(page.searchParams.get("error")).toBe("OAuthCallback");
    expect(await accountOf(orcid)).toBeUndefined();
    expect([...browser.cookies.keys()].some((k) => k.endsWith("session-token"))).toBe(false);
  });

  it("a cancelled consent says so and changes nothing", async () => {
    browser.cookies.clear();
    const orcid = freshOrcid();
    expect(await signInWithOrcid({ orcid, consent: "deny" })).toBe(`${APP}/sign-in?error=OrcidCancelled`);
    expect(await accountOf(orcid)).toBeUndefined();
  });
});

describe("the stand-in's own pages", () => {
  it("an expired or unknown sign-in page says so and links back to the app", async () => {
    const res = await fetch(`${standIn.url}/interaction/no-such-sign-in`);
    expect(res.status).toBe(400);
    const html = await res.text();
    expect(html).toContain("Your sign-in here has expired");
    expect(html).toContain(`href="${APP}/sign-in"`);
  });

  it("refuses an iD with a wrong check digit on its login form", async () => {
    const csrf = (await (await auth("GET", "/api/auth/csrf")).json()) as { csrfToken: string };
    const started = await auth("POST", "/api/auth/signin/orcid", { csrfToken: csrf.csrfToken, callbackUrl: `${APP}/`, json: "true" });
    const jar = new Map<string, string>();
    const login = await atStandIn(((await started.json()) as { url: string }).url, jar);
    const wrong = await atStandIn(`${login.url}/login`, jar, { orcid: "0009-0003-4172-5181", action: "sign-in" });
    expect(wrong.html).toContain("This is not an ORCID iD");
  });
});

describe("creators that are people", () => {
  it("linking a verified iD attaches the person to published versions naming it, without changing them", async () => {
    const password = "a long enough password";
    const mk = async (tag: string, role: "researcher" | "curator" = "researcher") =>
      createUser({ email: uniqueEmail(tag), name: tag, passwordHash: await hashPassword(password), verified: true, role });
    const [depositor, creator, curator] = await Promise.all([mk("orcid-depositor"), mk("orcid-creator"), mk("orcid-curator", "curator")]);
    const orcid = freshOrcid();
    const document = {
      ...EXAMPLE_DEPOSIT,
      title: `Creators that are people ${orcid}`,
      creators: [{ name: "Someone Else" }, { name: "Creator, Named", orcid, affiliation: "Invented Institute" }],
    };
    const v = await depositInState({ owner: depositor, curator, document, state: "published" });
    const [before] = await sql`select payload::text as payload, payload_sha256, updated_at from dataset_versions where id = ${v.id}`;
    const [stampBefore] = await sql`select changed_at from oai_record_datestamps where version_id = ${v.id}`;
    // The typed-in iD alone is no name identifier.
    const typed = await getPublicVersionDatacite({ datasetId: v.datasetId, versionNumber: 1 });
    expect(typed?.data.attributes.creators[1].nameIdentifiers).toBeUndefined();

    // As if the agency had the version's record already: the link must send it again.
    await sql`update identifier_registrations set registered = true where dataset_id = ${v.datasetId}`;
    const registered = await sql`select identifier from identifier_registrations where dataset_id = ${v.datasetId}`;
    expect(registered.length).toBeGreaterThan(0);

    await signInWithPassword(creator.email, password);
    expect(await signInWithOrcid({ orcid })).toBe(`${APP}/settings?orcid=linked`);
    // The agency's records are sent again (the registration queue, with refresh).
    const queued = await sql`select data->>'identifier' as identifier from pgboss.job
      where name = 'register-identifier' and data->>'refresh' = 'true' and data->>'identifier' in ${sql(registered.map((r) => r.identifier))}`;
    expect(new Set(queued.map((q) => q.identifier))).toEqual(new Set(registered.map((r) => r.identifier)));

    const links = await sql`select position, user_id from creator_people where version_id = ${v.id}`;
    expect(links.map((l) => ({ position: l.position, user: l.user_id }))).toEqual([{ position: 1, user: creator.id }]);
    // The published version is untouched: same document, same content hash (recomputed too), same row time.
    const [after] =
      await sql`select payload::text as payload, payload as document, payload_sha256, updated_at from dataset_versions where id = ${v.id}`;
    expect(after.payload).toBe(before.payload);
    expect(after.payload_sha256).toBe(before.payload_sha256);
    expect(payloadSha256(after.document)).toBe(before.payload_sha256);
    expect(after.updated_at).toEqual(before.updated_at);
    // Its OAI-PMH record changed (the DataCite creator now carries the verified iD).
    const [stampAfter] = await sql`select changed_at from oai_record_datestamps where version_id = ${v.id}`;
    expect(stampAfter.changed_at.getTime()).toBeGreaterThan(stampBefore.changed_at.getTime());
    const datacite = await getPublicVersionDatacite({ datasetId: v.datasetId, versionNumber: 1 });
    expect(datacite?.data.attributes.creators[1].nameIdentifiers).toEqual([
      { nameIdentifier: `https://orcid.org/${orcid}`, nameIdentifierScheme: "ORCID", schemeUri: "https://orcid.org" },
    ]);
    expect(datacite?.data.attributes.creators[0].nameIdentifiers).toBeUndefined();
    // The profiles: the creator's lists it as created, the depositor's as deposited.
    expect(await listProfileDatasets({ userId: creator.id })).toEqual([
      expect.objectContaining({ datasetId: v.datasetId, created: true, deposited: false }),
    ]);
    expect((await listProfileDatasets({ userId: depositor.id })).find((d) => d.datasetId === v.datasetId)).toMatchObject({
      created: false,
      deposited: true,
    });

    await unlinkOrcid({ userId: creator.id });
    expect(await sql`select 1 from creator_people where version_id = ${v.id}`).toHaveLength(0);
    const [unchanged] = await sql`select payload_sha256 from dataset_versions where id = ${v.id}`;
    expect(unchanged.payload_sha256).toBe(before.payload_sha256);
  });

  it("deactivating or reactivating an account named by published versions tells their pages (and the counts of people)", async () => {
    const mk = async (tag: string, role: "researcher" | "curator" | "admin" = "researcher") =>
      createUser({ email: uniqueEmail(tag), name: tag, passwordHash: "x", verified: true, role });
    const [depositor, creator, curator, admin] = await Promise.all([
      mk("active-dep"),
      mk("active-creator"),
      mk("active-cur", "curator"),
      mk("active-admin", "admin"),
    ]);
    const orcid = freshOrcid();
    const document = { ...EXAMPLE_DEPOSIT, title: `Creator deactivated ${orcid}`, creators: [{ name: "Creator, Named", orcid }] };
    const v = await depositInState({ owner: depositor, curator, document, state: "published" });
    await sql`update users set verified_orcid = ${orcid} where id = ${creator.id}`;
    expect(await sql`select 1 from creator_people where version_id = ${v.id}`).toHaveLength(1);
    for (const active of [false, true]) {
      revalidated.length = 0;
      await setAccountActive({ actorId: admin.id, userId: creator.id, active });
      expect(revalidated).toEqual(expect.arrayContaining(["public", `dataset:${v.datasetId}`]));
    }
  });

  it("a version deposited after the link names the person at once", async () => {
    const creator = await createUser({ email: uniqueEmail("orcid-later"), name: "Later", passwordHash: "x", verified: true });
    const curator = await createUser({
      email: uniqueEmail("orcid-later-cur"),
      name: "Cur",
      passwordHash: "x",
      verified: true,
      role: "curator",
    });
    const orcid = freshOrcid();
    await sql`update users set verified_orcid = ${orcid} where id = ${creator.id}`;
    const v = await depositInState({
      owner: creator,
      curator,
      document: { ...EXAMPLE_DEPOSIT, title: `Later ${orcid}`, creators: [{ name: "Later, Person", orcid }] },
      state: "draft",
    });
    const links = await sql`select position, user_id from creator_people where version_id = ${v.id}`;
    expect(links.map((l) => l.user_id)).toEqual([creator.id]);
  });
});
