import { describe, expect, it } from "vitest";
import { hashPassword } from "@/lib/auth/password";
import { authorizeCredentials, authorizeSignInLink, SIGN_IN_FAILED, SIGN_IN_LOCKED } from "@/lib/auth/options";
import { signUp } from "@/lib/users/accounts";
import { createUser } from "@/lib/users/queries";
import { linkToken, sql, startMailPipeline, uniqueEmail, uniqueIp, waitForMail } from "./helpers";

async function target(password = "the-right-password") {
  const email = uniqueEmail("target");
  await createUser({ email, name: "Target", passwordHash: await hashPassword(password), verified: true });
  return { email, password };
}

async function mailsTo(email: string): Promise<number> {
  const [row] = await sql<{ n: number }[]>`select count(*)::int as n from captured_mail where ${email} = any(to_addresses)`;
  return row.n;
}

describe("sign-in lockout by (account, address), with a ceiling per account", () => {
  it("seven wrong passwords from address A do not lock the owner signing in from address B", async () => {
    const { email, password } = await target();
    const attacker = uniqueIp();
    for (let i = 0; i < 7; i++) await authorizeCredentials({ email, password: `guess-${i}-wrong` }, attacker).catch(() => {});
    await expect(authorizeCredentials({ email, password }, uniqueIp())).resolves.toMatchObject({ email });
    // The attacker's own address is locked, and its answer does not depend on the password.
    await expect(authorizeCredentials({ email, password: "another-guess" }, attacker)).rejects.toThrow(SIGN_IN_LOCKED);
  });

  it("six failures from one address lock that pair; the right password there gets a mailed link that works once and lifts the lock", async () => {
    const pipeline = await startMailPipeline();
    try {
      const { email, password } = await target();
      const home = uniqueIp();
      for (let i = 0; i < 6; i++)
        await expect(authorizeCredentials({ email, password: `typo-${i}-wrong` }, home)).rejects.toThrow(SIGN_IN_FAILED);
      // A wrong password through the lock: the same answer, and no mail.
      await expect(authorizeCredentials({ email, password: "still-wrong" }, home)).rejects.toThrow(SIGN_IN_LOCKED);
      // The right password through the lock: the same answer, plus a link in the owner's inbox.
      await expect(authorizeCredentials({ email, password }, home)).rejects.toThrow(SIGN_IN_LOCKED);
      const mail = await waitForMail(email, { subject: /sign-in link/ });
      expect(await mailsTo(email)).toBe(1);
      const token = linkToken(mail.text, "/sign-in/link");
      await expect(authorizeSignInLink({ token }, home)).resolves.toMatchObject({ email });
      await expect(authorizeSignInLink({ token }, home)).rejects.toThrow(/already used/);
      // The lock on this pair is lifted.
      await expect(authorizeCredentials({ email, password }, home)).resolves.toMatchObject({ email });
    } finally {
      await pipeline.stop();
    }
  });

  it("failures spread over many addresses hit the account's ceiling (60 an hour); the right password then gets a mailed link", async () => {
    const { email, password } = await target();
    for (let i = 0; i < 60; i++)
      await expect(authorizeCredentials({ email, password: `spread-${i}-wrong` }, uniqueIp())).rejects.toThrow(SIGN_IN_FAILED);
    await expect(authorizeCredentials({ email, password }, uniqueIp())).rejects.toThrow(SIGN_IN_LOCKED);
    const [row] = await sql<{ n: number }[]>`
      select count(*)::int as n from one_time_tokens t join users u on u.id = t.user_id
      where u.email = ${email} and t.purpose = 'unlock_sign_in' and t.used_at is null`;
    expect(row.n).toBe(1);
  });

  it("limits sign-in attempts per network address across accounts", async () => {
    const ip = uniqueIp();
    let limited = 0;
    for (let i = 0; i < 32; i++) {
      await authorizeCredentials({ email: uniqueEmail("spray"), password: "whatever-password" }, ip).catch((err: Error) => {
        if (/from this network/.test(err.message)) limited++;
      });
    }
    expect(limited).toBe(2); // 30 failures allowed per 15 minutes
  });

  it("successful sign-ins do not count against the address: a lab behind one address is not locked out", async () => {
    const ip = uniqueIp();
    const { email, password } = await target();
    for (let i = 0; i < 35; i++) await expect(authorizeCredentials({ email, password }, ip)).resolves.toMatchObject({ email });
    // Failures from that address still count, across accounts.
    for (let i = 0; i < 30; i++)
      await expect(authorizeCredentials({ email: uniqueEmail("spray"), password: "whatever-password" }, ip)).rejects.toThrow(
        SIGN_IN_FAILED,
      );
    await expect(authorizeCredentials({ email, password }, ip)).rejects.toThrow(/failed sign-in attempts from this network/);
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
    const { email, password } = await target("right-password-x");
    const ip = uniqueIp();
    for (let i = 0; i < 6; i++) await authorizeCredentials({ email, password: "nope-nope-nope" }, ip).catch(() => {});
    // A fresh module graph stands in for another instance: same PostgreSQL table, same verdict.
    const { vi } = await import("vitest");
    vi.resetModules();
    (globalThis as { arrheniaLimiters?: unknown }).arrheniaLimiters = undefined;
    (globalThis as { arrheniaLimitPool?: unknown }).arrheniaLimitPool = undefined;
    const fresh = await import("@/lib/auth/options");
    await expect(fresh.authorizeCredentials({ email, password }, ip)).rejects.toThrow(fresh.SIGN_IN_LOCKED);
  });
});

describe("reset requests per address", () => {
  it("limits reset requests from one address across e-mails (10 an hour)", async () => {
    const { requestPasswordReset } = await import("@/lib/users/accounts");
    const ip = uniqueIp();
    for (let i = 0; i < 10; i++) await requestPasswordReset({ email: uniqueEmail("forgetful"), ip });
    await expect(requestPasswordReset({ email: uniqueEmail("forgetful"), ip })).rejects.toThrow(
      /Too many reset requests from this network/,
    );
  });
});
