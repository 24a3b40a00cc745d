import { describe, expect, it } from "vitest";
import { hashPassword } from "@/lib/auth/password";
import { authorizeCredentials, SIGN_IN_FAILED } from "@/lib/auth/options";
import { signUp } from "@/lib/users/accounts";
import { createUser } from "@/lib/users/queries";
import { uniqueEmail, uniqueIp } from "./helpers";

describe("rate limits (counters in PostgreSQL)", () => {
  it("locks an account after repeated failed sign-ins, even from different addresses and with the right password", async () => {
    const email = uniqueEmail("target");
    await createUser({ email, name: "Target", passwordHash: await hashPassword("the-right-password"), verified: true });
    for (let i = 0; i < 6; i++) {
      await expect(authorizeCredentials({ email, password: `guess-${i}-wrong` }, uniqueIp())).rejects.toThrow(SIGN_IN_FAILED);
    }
    await expect(authorizeCredentials({ email, password: "the-right-password" }, uniqueIp())).rejects.toThrow(/Too many sign-in attempts for this account/);
  });

  it("limits sign-in attempts per network address across accounts", async () => {
    const ip = uniqueIp();
    let limited = 0;
    for (let i = 0; i < 32; i++) {
      await authorizeCredentials({ email: uniqueEmail("spray"), password: "whatever-password" }, ip).catch((err: Error) => {
        if (/from this network/.test(err.message)) limited++;
      });
    }
    expect(limited).toBe(2); // 30 allowed per 15 minutes
  });

  it("limits sign-ups per address", async () => {
    const email = uniqueEmail("repeat");
    const ip = uniqueIp();
    await signUp({ name: "Repeat", email, password: "long-password-1", ip });
    await signUp({ name: "Repeat", email, password: "long-password-1", ip });
    await signUp({ name: "Repeat", email, password: "long-password-1", ip });
    await expect(signUp({ name: "Repeat", email, password: "long-password-1", ip })).rejects.toThrow(/Too many sign-ups for this address/);
  });

  it("the same limits hold for a second app instance (a separate connection pool)", async () => {
    const email = uniqueEmail("shared");
    await createUser({ email, name: "Shared", passwordHash: await hashPassword("right-password-x"), verified: true });
    for (let i = 0; i < 6; i++) await authorizeCredentials({ email, password: "nope-nope-nope" }, uniqueIp()).catch(() => {});
    // A fresh module graph stands in for another instance: same PostgreSQL table, same verdict.
    const { vi } = await import("vitest");
    vi.resetModules();
    (globalThis as { arrheniaLimiters?: unknown }).arrheniaLimiters = undefined;
    (globalThis as { arrheniaLimitPool?: unknown }).arrheniaLimitPool = undefined;
    const fresh = await import("@/lib/auth/options");
    await expect(fresh.authorizeCredentials({ email, password: "right-password-x" }, uniqueIp())).rejects.toThrow(/Too many/);
  });
});
