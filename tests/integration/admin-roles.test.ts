import { beforeAll, describe, expect, it, vi } from "vitest";

vi.mock("@/lib/auth/session", () => ({ getCurrentUser: vi.fn() }));
vi.mock("next/cache", () => ({ revalidatePath: vi.fn(), revalidateTag: vi.fn() }));

import { changeRoleAction, setActiveAction } from "@/app/admin/people/actions";
import { PATCH } from "@/app/api/v1/users/[id]/route";
import { GET as listUsersRoute } from "@/app/api/v1/users/route";
import { idleState } from "@/lib/auth/action-state";
import { hashPassword } from "@/lib/auth/password";
import { getCurrentUser } from "@/lib/auth/session";
import { createUser, type UserDto } from "@/lib/users/queries";
import { sql, uniqueEmail } from "./helpers";

let admin: UserDto, curator: UserDto, researcher: UserDto, subject: UserDto;

beforeAll(async () => {
  const passwordHash = await hashPassword("irrelevant-here");
  const mk = (tag: string, role: UserDto["role"]) => createUser({ email: uniqueEmail(tag), name: tag, passwordHash, role, verified: true });
  [admin, curator, researcher, subject] = await Promise.all([
    mk("admin", "admin"),
    mk("curator", "curator"),
    mk("researcher", "researcher"),
    mk("subject", "researcher"),
  ]);
});

function signInAs(user: UserDto | null) {
  vi.mocked(getCurrentUser).mockResolvedValue(user);
}

function patch(id: number, body: unknown) {
  return PATCH(
    new Request(`http://127.0.0.1/api/v1/users/${id}`, {
      method: "PATCH",
      body: JSON.stringify(body),
      headers: { "content-type": "application/json" },
    }),
    {
      params: Promise.resolve({ id: String(id) }),
    },
  );
}

function form(values: Record<string, string>) {
  const fd = new FormData();
  for (const [k, v] of Object.entries(values)) fd.set(k, v);
  return fd;
}

describe("PATCH /api/v1/users/:id, per role", () => {
  const table: [string, () => UserDto | null, number][] = [
    ["anonymous", () => null, 401],
    ["researcher", () => researcher, 403],
    ["curator", () => curator, 403],
    ["admin", () => admin, 200],
  ];
  for (const [who, actor, status] of table) {
    it(`${who} → ${status}`, async () => {
      // A researcher of its own per row, so each row sees whether its own request changed the role.
      const target = await createUser({
        email: uniqueEmail(`patch-${who}`),
        name: "Target",
        passwordHash: "x",
        role: "researcher",
        verified: true,
      });
      signInAs(actor());
      const res = await patch(target.id, { role: "curator" });
      expect(res.status).toBe(status);
      const [row] = await sql`select role from users where id = ${target.id}`;
      if (status === 200) {
        expect(row.role).toBe("curator");
      } else {
        expect(res.headers.get("content-type")).toBe("application/problem+json");
        const body = await res.json();
        expect(body.status).toBe(status);
        expect(row.role).toBe("researcher");
      }
    });
  }

  it("GET /api/v1/users is admin-only and never returns password hashes", async () => {
    signInAs(researcher);
    expect((await listUsersRoute(new Request("http://127.0.0.1/api/v1/users"), { params: Promise.resolve({}) })).status).toBe(403);
    signInAs(admin);
    const res = await listUsersRoute(new Request("http://127.0.0.1/api/v1/users"), { params: Promise.resolve({}) });
    expect(res.status).toBe(200);
    const text = await res.text();
    expect(text).not.toMatch(/password|\$2[aby]\$/i);
  });

  it("rejects a malformed body with 422 and a pointer", async () => {
    signInAs(admin);
    const res = await patch(subject.id, { role: "overlord" });
    expect(res.status).toBe(422);
    const body = await res.json();
    expect(body.errors[0].pointer).toBe("/role");
  });

  it("answers 404 for someone who does not exist", async () => {
    signInAs(admin);
    expect((await patch(99_999_999, { role: "curator" })).status).toBe(404);
  });
});

describe("role change by an admin is audited", () => {
  it("records actor, subject, old and new role in the same transaction", async () => {
    signInAs(admin);
    const state = await changeRoleAction(idleState, form({ userId: String(subject.id), role: "admin" }));
    expect(state.status).toBe("ok");
    const [row] = await sql`select role from users where id = ${subject.id}`;
    expect(row.role).toBe("admin");
    const events =
      await sql`select actor_id, details from audit_events where action = 'user.role_changed' and subject_id = ${String(subject.id)} order by id desc limit 1`;
    expect(events[0].actor_id).toBe(admin.id);
    expect(events[0].details).toMatchObject({ to: "admin" });
  });

  it("a researcher calling the admin action is refused and nothing changes", async () => {
    signInAs(researcher);
    const state = await changeRoleAction(idleState, form({ userId: String(researcher.id), role: "admin" }));
    expect(state).toMatchObject({ status: "error", message: "Your role does not allow this" });
    const [row] = await sql`select role from users where id = ${researcher.id}`;
    expect(row.role).toBe("researcher");
  });

  it("deactivation is audited and revokes the person's API tokens", async () => {
    signInAs(admin);
    const target = await createUser({ email: uniqueEmail("leaver"), name: "Leaver", passwordHash: "x", verified: true });
    await sql`insert into api_tokens (user_id, name, token_hash, prefix, scopes) values (${target.id}, 'script', ${"h" + target.id}, 'arr_pat_xxxx', ${sql.array(["deposit:read"])})`;
    const state = await setActiveAction(idleState, form({ userId: String(target.id), active: "false" }));
    expect(state.status).toBe("ok");
    const [u] = await sql`select deactivated_at from users where id = ${target.id}`;
    expect(u.deactivated_at).toBeInstanceOf(Date);
    const [t] = await sql`select revoked_at from api_tokens where user_id = ${target.id}`;
    expect(t.revoked_at).toBeInstanceOf(Date);
    const [e] =
      await sql`select count(*)::int as n from audit_events where action = 'user.deactivated' and subject_id = ${String(target.id)}`;
    expect(e.n).toBe(1);
  });
});
