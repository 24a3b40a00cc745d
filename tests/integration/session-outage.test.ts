// A session read while PostgreSQL is out of reach (a restart) must not end the session: next-auth
// clears the cookie of any error thrown in the jwt callback, so the callback keeps the token then.
import { describe, expect, it, vi } from "vitest";

const queries = vi.hoisted(() => ({ failWith: null as Error | null }));
vi.mock("@/lib/users/queries", async (importOriginal) => {
  const real = await importOriginal<typeof import("@/lib/users/queries")>();
  return {
    ...real,
    getUserForSession: async (input: { id: number }) => {
      if (queries.failWith) throw queries.failWith;
      return real.getUserForSession(input);
    },
  };
});

import { authOptions } from "@/lib/auth/options";
import { hashPassword } from "@/lib/auth/password";
import { createUser } from "@/lib/users/queries";
import { uniqueEmail } from "./helpers";

type JwtCallback = (params: { token: { uid: number; gen: number }; account: null }) => Promise<unknown>;
const readToken = (token: { uid: number; gen: number }) => (authOptions.callbacks!.jwt as unknown as JwtCallback)({ token, account: null });

describe("a session read while the database is out of reach", () => {
  it("keeps the session (the token comes back unchanged); any other failure and a stale generation still end it", async () => {
    const user = await createUser({
      email: uniqueEmail("outage"),
      name: "Outage Reader",
      passwordHash: await hashPassword("long enough password"),
      verified: true,
    });
    const token = { uid: user.id, gen: 0 };
    expect(await readToken(token)).toEqual(token);

    queries.failWith = Object.assign(new Error("connect ECONNREFUSED 127.0.0.1:5432"), { code: "ECONNREFUSED" });
    expect(await readToken(token)).toEqual(token);
    queries.failWith = Object.assign(new Error("terminating connection due to administrator command"), { code: "57P01" });
    expect(await readToken(token)).toEqual(token);

    queries.failWith = new Error("column does not exist");
    await expect(readToken(token)).rejects.toThrow(/column does not exist/);
    queries.failWith = null;
    await expect(readToken({ uid: user.id, gen: 7 })).rejects.toThrow(/session has ended/);
  });
});
