import { describe, expect, it, vi } from "vitest";

vi.mock("@/lib/auth/session", () => ({ getCurrentUser: vi.fn().mockResolvedValue(null) }));

import { GET as listUsersRoute } from "@/app/api/v1/users/route";
import { hashSecret } from "@/lib/auth/secrets";
import { createApiToken, createUser, getUserByApiToken, listApiTokens, revokeApiToken } from "@/lib/users/queries";
import { sql, uniqueEmail } from "./helpers";

describe("personal API tokens", () => {
  it("stores only the SHA-256 of the secret and resolves the bearer to its owner", async () => {
    const user = await createUser({ email: uniqueEmail("tok"), name: "Token Owner", passwordHash: "x", verified: true });
    const { secret, token } = await createApiToken({ userId: user.id, name: "upload script", scopes: ["deposit:read", "deposit:write"] });
    expect(secret).toMatch(/^arh_key_/);
    const [row] = await sql`select token_hash, prefix from api_tokens where id = ${token.id}`;
    expect(row.token_hash).toBe(hashSecret(secret));
    expect(row.token_hash).not.toContain(secret);
    expect(secret.startsWith(row.prefix)).toBe(true);
    const found = await getUserByApiToken({ secret });
    expect(found?.user.id).toBe(user.id);
    expect(found?.scopes).toEqual(["deposit:read", "deposit:write"]);
    const [used] = await sql`select last_used_at from api_tokens where id = ${token.id}`;
    expect(used.last_used_at).toBeInstanceOf(Date);
    const listed = await listApiTokens({ userId: user.id });
    expect(JSON.stringify(listed)).not.toContain(secret);
  });

  it("a revoked token stops working; another person cannot revoke it", async () => {
    const owner = await createUser({ email: uniqueEmail("own"), name: "Owner", passwordHash: "x", verified: true });
    const other = await createUser({ email: uniqueEmail("oth"), name: "Other", passwordHash: "x", verified: true });
    const { secret, token } = await createApiToken({ userId: owner.id, name: "t", scopes: ["deposit:read"] });
    await expect(revokeApiToken({ userId: other.id, tokenId: token.id })).rejects.toThrow(/No such active token/);
    expect(await getUserByApiToken({ secret })).not.toBeNull();
    await revokeApiToken({ userId: owner.id, tokenId: token.id });
    expect(await getUserByApiToken({ secret })).toBeNull();
  });

  it("route handlers accept a bearer token and refuse an unknown one with 401", async () => {
    const admin = await createUser({ email: uniqueEmail("apiadmin"), name: "Api Admin", passwordHash: "x", role: "admin", verified: true });
    const { secret } = await createApiToken({ userId: admin.id, name: "ops", scopes: ["admin"] });
    const call = (auth: string) =>
      listUsersRoute(new Request("http://127.0.0.1/api/v1/users", { headers: { authorization: auth } }), { params: Promise.resolve({}) });
    expect((await call(`Bearer ${secret}`)).status).toBe(200);
    const bad = await call("Bearer arh_key_not-a-real-token");
    expect(bad.status).toBe(401);
    expect((await bad.json()).code).toBe("unauthenticated");
  });
});
