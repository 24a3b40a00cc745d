// The real getCurrentUser under a mocked next-auth session: the JWT keeps saying "admin", the
// database says otherwise, and the database wins at once.
import { beforeAll, describe, expect, it, vi } from "vitest";

vi.mock("next-auth", async (importOriginal) => ({ ...(await importOriginal<object>()), getServerSession: vi.fn() }));
vi.mock("next/cache", () => ({ revalidatePath: vi.fn(), revalidateTag: vi.fn() }));
// The request carries a session cookie (its content is what getServerSession, mocked, decodes).
vi.mock("next/headers", () => ({ headers: async () => new Headers({ cookie: "next-auth.session-token=mocked" }) }));

import { getServerSession } from "next-auth";
import { PATCH } from "@/app/api/v1/users/[id]/route";
import { createUser, type UserDto } from "@/lib/users/queries";
import { sql, uniqueEmail } from "./helpers";

let subject: UserDto;
beforeAll(async () => {
  subject = await createUser({
    email: uniqueEmail("reread-subject"),
    name: "Subject",
    passwordHash: "x",
    role: "researcher",
    verified: true,
  });
});

/** A session cookie as next-auth decodes it: id, role and session generation copied onto the token at sign-in. */
function sessionOf(user: UserDto, role = user.role, sessionGeneration = 0) {
  vi.mocked(getServerSession).mockResolvedValue({
    user: { id: user.id, email: user.email, name: user.name, role, sessionGeneration },
    expires: new Date(Date.now() + 3600_000).toISOString(),
  });
}

const patch = (id: number, body: unknown) =>
  PATCH(new Request(`http://127.0.0.1/api/v1/users/${id}`, { method: "PATCH", body: JSON.stringify(body) }), {
    params: Promise.resolve({ id: String(id) }),
  });

describe("the role is re-read from the database on every request", () => {
  it("an admin demoted in SQL is refused at once although the session still says admin", async () => {
    const admin = await createUser({ email: uniqueEmail("reread-admin"), name: "Admin", passwordHash: "x", role: "admin", verified: true });
    sessionOf(admin, "admin");
    expect((await patch(subject.id, { role: "curator" })).status).toBe(200);
    await sql`update users set role = 'researcher' where id = ${admin.id}`;
    sessionOf(admin, "admin");
    expect((await patch(subject.id, { role: "researcher" })).status).toBe(403);
    const [row] = await sql`select role from users where id = ${subject.id}`;
    expect(row.role).toBe("curator");
  });

  it("a researcher promoted in SQL may act at once although the session still says researcher", async () => {
    const promoted = await createUser({
      email: uniqueEmail("reread-promoted"),
      name: "Promoted",
      passwordHash: "x",
      role: "researcher",
      verified: true,
    });
    sessionOf(promoted, "researcher");
    expect((await patch(subject.id, { role: "researcher" })).status).toBe(403);
    await sql`update users set role = 'admin' where id = ${promoted.id}`;
    expect((await patch(subject.id, { role: "researcher" })).status).toBe(200);
  });

  it("a deactivated admin is treated as signed out", async () => {
    const leaver = await createUser({
      email: uniqueEmail("reread-leaver"),
      name: "Leaver",
      passwordHash: "x",
      role: "admin",
      verified: true,
    });
    sessionOf(leaver, "admin");
    await sql`update users set deactivated_at = now() where id = ${leaver.id}`;
    expect((await patch(subject.id, { role: "curator" })).status).toBe(401);
  });
});
