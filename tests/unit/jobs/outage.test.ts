import { describe, expect, it } from "vitest";
import { isDatabaseOutage } from "@/lib/jobs/outage";
import { unlessOutOfReach } from "@/lib/auth/options";

// SQLSTATE 57P01 admin_shutdown and class 08 connection exceptions: PostgreSQL's documented error codes (Appendix A);
// ECONNREFUSED / ECONNRESET: the operating system's socket errors as Node reports them.
const coded = (code: string, message = code) => Object.assign(new Error(message), { code });

describe("isDatabaseOutage: what a server survives while PostgreSQL restarts", () => {
  it("is true for a refused or dropped connection and a server shutting down", () => {
    expect(isDatabaseOutage(coded("ECONNREFUSED", "connect ECONNREFUSED 127.0.0.1:54501"))).toBe(true);
    expect(isDatabaseOutage(coded("57P01"))).toBe(true);
    expect(isDatabaseOutage(new Error("Connection terminated unexpectedly"))).toBe(true);
    expect(isDatabaseOutage(Object.assign(new Error("wrapped"), { cause: coded("ECONNRESET") }))).toBe(true);
  });

  it("is false for anything else, which still ends the server", () => {
    expect(isDatabaseOutage(new TypeError("x is not a function"))).toBe(false);
    expect(isDatabaseOutage(coded("23505", "duplicate key"))).toBe(false);
    expect(isDatabaseOutage("plain text")).toBe(false);
  });
});

describe("unlessOutOfReach: sign-in errors a person may read", () => {
  it("says 'a moment' instead of the driver's address when the database is out of reach", async () => {
    await expect(unlessOutOfReach(() => Promise.reject(coded("ECONNREFUSED", "connect ECONNREFUSED 127.0.0.1:54501")))).rejects.toThrow(
      "Sign-in is out of reach for a moment; try again in a few seconds.",
    );
    await expect(unlessOutOfReach(() => Promise.reject(new Error("E-mail or password is not right.")))).rejects.toThrow(
      "E-mail or password is not right.",
    );
    await expect(unlessOutOfReach(() => Promise.resolve(7))).resolves.toBe(7);
  });
});
