import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { authorizeCredentials, SIGN_IN_FAILED } from "@/lib/auth/options";
import { requestPasswordReset, resetPassword, signUp, verifyEmail } from "@/lib/users/accounts";
import { getUserByEmail } from "@/lib/users/queries";
import { linkToken, sql, startMailPipeline, uniqueEmail, uniqueIp, waitForMail } from "./helpers";

let pipeline: Awaited<ReturnType<typeof startMailPipeline>>;
beforeAll(async () => {
  pipeline = await startMailPipeline();
});
afterAll(async () => {
  await pipeline.stop();
});

describe("sign-up → captured verification mail → verify → sign in", () => {
  const email = uniqueEmail("newcomer");
  const password = "a-long-enough-password";

  it("creates an unverified researcher and mails a link (through the queue and the capture server)", async () => {
    await signUp({ name: "Test Newcomer", email, password, ip: uniqueIp() });
    const user = await getUserByEmail({ email });
    expect(user).toMatchObject({ role: "researcher", emailVerifiedAt: null });
    const mail = await waitForMail(email, { subject: /Confirm your e-mail/ });
    expect(mail.text).toContain("http://127.0.0.1:3999/verify?token=");
  });

  it("refuses sign-in before the address is confirmed", async () => {
    await expect(authorizeCredentials({ email, password }, uniqueIp())).rejects.toThrow(/Confirm your e-mail address first/);
  });

  it("verifies with the link from the mail, once only", async () => {
    const mail = await waitForMail(email, { subject: /Confirm your e-mail/ });
    const token = linkToken(mail.text, "/verify");
    const [stored] = await sql`select token_hash from one_time_tokens where token_hash = encode(sha256(${token}::bytea), 'hex')`;
    expect(stored).toBeDefined(); // only the SHA-256 of the secret is stored
    expect(await verifyEmail({ secret: token, browserKeyHash: async () => null })).toEqual({
      kind: "verified",
      orcidOnly: false,
      datasetIds: [],
    });
    expect((await getUserByEmail({ email }))?.emailVerifiedAt).toBeInstanceOf(Date);
    await expect(verifyEmail({ secret: token, browserKeyHash: async () => null })).rejects.toThrow(/already used/);
  });

  it("signs in with the right password and answers alike for a wrong password or an unknown e-mail", async () => {
    const ok = await authorizeCredentials({ email, password }, uniqueIp());
    expect(ok).toMatchObject({ email, role: "researcher" });
    await expect(authorizeCredentials({ email, password: "wrong-password!" }, uniqueIp())).rejects.toThrow(SIGN_IN_FAILED);
    await expect(authorizeCredentials({ email: uniqueEmail("nobody"), password }, uniqueIp())).rejects.toThrow(SIGN_IN_FAILED);
  });

  it("a second sign-up with the same e-mail reveals nothing and sends a notice instead", async () => {
    await expect(signUp({ name: "Someone Else", email, password: "another-password", ip: uniqueIp() })).resolves.toBeUndefined();
    const notice = await waitForMail(email, { subject: /already have an Arrhenia account/ });
    expect(notice.text).toContain("/forgot-password");
  });

  it("resets a forgotten password through the mailed link", async () => {
    await requestPasswordReset({ email, ip: uniqueIp() });
    const mail = await waitForMail(email, { subject: /new Arrhenia password/ });
    await resetPassword({ secret: linkToken(mail.text, "/reset-password"), password: "a-brand-new-password" });
    await expect(authorizeCredentials({ email, password: "a-brand-new-password" }, uniqueIp())).resolves.toMatchObject({ email });
    await expect(authorizeCredentials({ email, password }, uniqueIp())).rejects.toThrow(SIGN_IN_FAILED);
  });

  it("answers a reset request for an unknown e-mail without sending anything", async () => {
    const ghost = uniqueEmail("ghost");
    await expect(requestPasswordReset({ email: ghost, ip: uniqueIp() })).resolves.toBeUndefined();
    await expect(waitForMail(ghost, { timeoutMs: 2500 })).rejects.toThrow(/no mail/);
  });
});
