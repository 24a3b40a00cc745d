import { beforeAll, describe, expect, it, vi } from "vitest";

vi.mock("@/lib/auth/session", () => ({ getCurrentUser: vi.fn() }));
vi.mock("next/cache", () => ({ revalidatePath: vi.fn(), revalidateTag: vi.fn() }));
// Hundreds of transitions here: their mails and registrations would only pile up in the shared queues.
vi.mock("@/lib/mail/queue", () => ({ enqueueMail: vi.fn() }));
vi.mock("@/lib/identifiers/queue", () => ({ enqueueIdentifierRegistration: vi.fn() }));
vi.mock("next/headers", () => ({ headers: async () => new Headers({ "x-forwarded-for": "10.250.0.1" }) }));

import { createDraftAction, inviteAction, saveDraftAction, startNextVersionAction, transitionAction } from "@/app/deposits/actions";
import { forgotPasswordAction } from "@/app/forgot-password/actions";
import { acceptInvitationAction } from "@/app/invitations/accept/actions";
import { resetPasswordAction } from "@/app/reset-password/actions";
import { changePasswordAction, createTokenAction, revokeTokenAction, updateProfileAction } from "@/app/settings/actions";
import { signUpAction } from "@/app/sign-up/actions";
import { verifyAction } from "@/app/verify/actions";
import { idleState, type ActionState } from "@/lib/auth/action-state";
import { hashPassword } from "@/lib/auth/password";
import { getCurrentUser } from "@/lib/auth/session";
import { EXAMPLE_DEPOSIT } from "@/lib/deposits";
import { createApiToken, createUser, type UserDto } from "@/lib/users/queries";
import { sql, uniqueEmail } from "./helpers";

/**
 * Per-role tables for the server actions: anonymous, researcher, curator and admin, each acting on
 * their own records, and (where records have owners) a person acting on someone else's.
 */
type Who = "anonymous" | "researcher" | "curator" | "admin";
const roles: Who[] = ["anonymous", "researcher", "curator", "admin"];
const people: Partial<Record<Who, UserDto>> = {};
let other: UserDto;
const PASSWORD = "correct horse battery";

beforeAll(async () => {
  const passwordHash = await hashPassword(PASSWORD);
  for (const r of ["researcher", "curator", "admin"] as const)
    people[r] = await createUser({ email: uniqueEmail(`act-${r}`), name: r, passwordHash, role: r, verified: true });
  other = await createUser({ email: uniqueEmail("act-other"), name: "Other", passwordHash, verified: true });
});

const as = (who: Who | UserDto) => vi.mocked(getCurrentUser).mockResolvedValue(typeof who === "string" ? (people[who] ?? null) : who);
const form = (values: Record<string, string | string[]>) => {
  const fd = new FormData();
  for (const [k, v] of Object.entries(values)) for (const x of Array.isArray(v) ? v : [v]) fd.append(k, x);
  return fd;
};
const doc = JSON.stringify(EXAMPLE_DEPOSIT);
const signInMessage = /sign in/i;
const isInternal = (s: { message?: string }) => /went wrong on our side/.test(s.message ?? "");

describe("form actions on one's own account, per role", () => {
  for (const who of roles) {
    const allowed = who !== "anonymous";
    it(`updateProfileAction: ${who} → ${allowed ? "ok" : "refused"}`, async () => {
      as(who);
      const out = await updateProfileAction(idleState, form({ name: `Renamed ${who}`, affiliation: "Lab", orcid: "" }));
      expect(out.status).toBe(allowed ? "ok" : "error");
      if (!allowed) expect(out.message).toMatch(signInMessage);
      else expect((await sql`select name from users where id = ${people[who]!.id}`)[0].name).toBe(`Renamed ${who}`);
    });

    it(`changePasswordAction: ${who} → ${allowed ? "checks the current password" : "refused"}`, async () => {
      as(who);
      const out = await changePasswordAction(
        idleState,
        form({ current: "not the password", password: "another good password", confirm: "another good password" }),
      );
      expect(out.status).toBe("error");
      expect(out.message).toMatch(allowed ? /correct the marked|current password/i : signInMessage);
      expect(isInternal(out)).toBe(false);
    });

    it(`createTokenAction and revokeTokenAction: ${who} → ${allowed ? "own tokens only" : "refused"}`, async () => {
      as(who);
      const created = await createTokenAction(idleState, form({ name: "script", scopes: ["deposit:read"] }));
      expect(created.status).toBe(allowed ? "ok" : "error");
      const { token: othersToken } = await createApiToken({ userId: other.id, name: "theirs", scopes: ["deposit:read"] });
      const revoked = await revokeTokenAction(idleState, form({ tokenId: String(othersToken.id) }));
      expect(revoked.status).toBe("error");
      expect((await sql`select revoked_at from api_tokens where id = ${othersToken.id}`)[0].revoked_at).toBeNull();
      if (allowed) {
        const { token: mine } = await createApiToken({ userId: people[who]!.id, name: "mine", scopes: ["deposit:read"] });
        expect((await revokeTokenAction(idleState, form({ tokenId: String(mine.id) }))).status).toBe("ok");
      }
    });

    it(`acceptInvitationAction: ${who} → ${allowed ? "unknown link refused plainly" : "refused"}`, async () => {
      as(who);
      const out = await acceptInvitationAction(idleState, form({ token: "x".repeat(40) }));
      expect(out.status).toBe("error");
      expect(out.message).toMatch(allowed ? /invalid, has expired/ : signInMessage);
      expect((await acceptInvitationAction(idleState, form({ token: "x".repeat(600) }))).status).toBe("error");
    });
  }
});

describe("the deposit editor's actions, per role", () => {
  for (const who of roles) {
    const allowed = who !== "anonymous";
    it(`createDraft, saveDraft, submit, invite: ${who} → ${allowed ? "allowed on own draft, 404 on another's" : "401"}`, async () => {
      as(who);
      const created = await createDraftAction(doc);
      if (!allowed) {
        expect(created).toMatchObject({ ok: false, status: 401 });
        return;
      }
      expect(created.ok).toBe(true);
      if (!created.ok) return;
      const saved = await saveDraftAction(
        created.versionId,
        created.lockVersion,
        JSON.stringify({ ...EXAMPLE_DEPOSIT, title: "Saved again" }),
      );
      expect(saved).toMatchObject({ ok: true, lockVersion: created.lockVersion + 1 });
      expect(await inviteAction(created.versionId, uniqueEmail("co"), "editor")).toMatchObject({ ok: true });
      expect(await transitionAction(created.versionId, "submit")).toMatchObject({ ok: true, state: "submitted" });
      // Someone else (a researcher who is no member) is not told the draft exists.
      as(other);
      expect(await transitionAction(created.versionId, "withdraw")).toMatchObject({ ok: false, status: 404 });
      expect(await startNextVersionAction(created.versionId)).toMatchObject({ ok: false, status: 404 });
    });
  }

  it("validates every argument: lock version, reason length, document size, transition name, e-mail", async () => {
    as("researcher");
    const created = await createDraftAction(doc);
    if (!created.ok) throw new Error(created.message);
    const [before] = await sql`select lock_version, state from dataset_versions where id = ${created.versionId}`;
    const cases: [string, Promise<{ ok: boolean; status?: number }>][] = [
      ["negative lock version", saveDraftAction(created.versionId, -1, doc)],
      ["fractional lock version", saveDraftAction(created.versionId, 1.5, doc)],
      ["lock version as text", saveDraftAction(created.versionId, "1" as unknown as number, doc)],
      ["document not text", saveDraftAction(created.versionId, 1, { title: "x" } as unknown as string)],
      ["document over 25 MB", createDraftAction("x".repeat(25 * 1024 * 1024 + 1))],
      ["unknown transition", transitionAction(created.versionId, "publish" as never)],
      ["reason over 5000 characters", transitionAction(created.versionId, "submit", "r".repeat(5001))],
      ["reason not text", transitionAction(created.versionId, "submit", 5 as unknown as string)],
      ["bad e-mail", inviteAction(created.versionId, "not an address", "editor")],
      ["owner role by invitation", inviteAction(created.versionId, uniqueEmail("x"), "owner" as never)],
    ];
    for (const [name, call] of cases) {
      const out = await call;
      expect(out, name).toMatchObject({ ok: false, status: 422 });
    }
    const [after] = await sql`select lock_version, state from dataset_versions where id = ${created.versionId}`;
    expect(after).toEqual(before);
  });
});

describe("public actions answer every role alike and never fail inside", () => {
  for (const who of roles) {
    it(`${who}: sign-up, forgotten password, reset and verify with bad input`, async () => {
      as(who);
      const outs: [string, ActionState][] = [
        [
          "sign-up, passwords differ",
          await signUpAction(
            idleState,
            form({ name: "N", email: uniqueEmail("su"), password: "long enough password", confirm: "different password" }),
          ),
        ],
        [
          "sign-up, bad e-mail",
          await signUpAction(
            idleState,
            form({ name: "N", email: "nope", password: "long enough password", confirm: "long enough password" }),
          ),
        ],
        [
          "reset, unknown link",
          await resetPasswordAction(
            idleState,
            form({ token: "y".repeat(40), password: "long enough password", confirm: "long enough password" }),
          ),
        ],
        [
          "reset, oversized link",
          await resetPasswordAction(
            idleState,
            form({ token: "y".repeat(5000), password: "long enough password", confirm: "long enough password" }),
          ),
        ],
        ["verify, unknown link", await verifyAction(idleState, form({ token: "z".repeat(40) }))],
        ["verify, oversized link", await verifyAction(idleState, form({ token: "z".repeat(5000) }))],
      ];
      for (const [name, out] of outs) {
        expect(out.status, name).toBe("error");
        expect(isInternal(out), name).toBe(false);
      }
      const forgot = await forgotPasswordAction(idleState, form({ email: uniqueEmail("nobody") }));
      expect(forgot.status).toBe("ok");
    });
  }
});

describe("form actions called with arguments of another shape", () => {
  it("answer with a plain error, never an exception", async () => {
    vi.mocked(getCurrentUser).mockResolvedValue(null);
    for (const action of [forgotPasswordAction, signUpAction, updateProfileAction, changePasswordAction]) {
      for (const args of [["x"], { entries: 1 }, null, "text"]) {
        const state = await (action as (p: ActionState, f: unknown) => Promise<ActionState>)(idleState, args);
        expect(state).toMatchObject({ status: "error", message: "This form was sent in a shape it does not accept." });
      }
    }
  });
});
