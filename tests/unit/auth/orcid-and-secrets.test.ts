import { createHash } from "node:crypto";
import { describe, expect, it } from "vitest";
import { normaliseOrcid, orcidChecksumValid } from "@/lib/auth/orcid";
import { generateSecret, hashSecret } from "@/lib/auth/secrets";
import { AppError, problemJson } from "@/lib/errors";

describe("ORCID iD check digit (ISO 7064 MOD 11-2)", () => {
  // 0000-0002-1825-0097 is the example iD in ORCID's own documentation (quoted from memory).
  it("accepts the documented example", () => expect(orcidChecksumValid("0000-0002-1825-0097")).toBe(true));
  it("rejects a wrong check digit", () => expect(orcidChecksumValid("0000-0002-1825-0098")).toBe(false));
  it("handles the X check digit", () => {
    // Computed here by hand with the same algorithm: 15 base digits 000000021694233 → check X.
    expect(orcidChecksumValid("0000-0002-1694-233X")).toBe(true);
    expect(orcidChecksumValid("0000-0002-1694-2330")).toBe(false);
  });
  it("normalises the URL form and missing hyphens", () => {
    expect(normaliseOrcid("https://orcid.org/0000-0002-1825-0097")).toBe("0000-0002-1825-0097");
    expect(normaliseOrcid("0000000218250097")).toBe("0000-0002-1825-0097");
    expect(normaliseOrcid("0000-0002-1825")).toBeNull();
    expect(normaliseOrcid("0000-0002-1825-0098")).toBeNull();
  });
});

describe("secrets", () => {
  it("hashes with SHA-256 (Node's crypto as the reference)", () => {
    expect(hashSecret("abc")).toBe(createHash("sha256").update("abc").digest("hex"));
    // FIPS 180-2 test vector for "abc".
    expect(hashSecret("abc")).toBe("ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad");
  });
  it("generates distinct prefixed secrets", () => {
    const a = generateSecret("arr_pat_");
    const b = generateSecret("arr_pat_");
    expect(a).toMatch(/^arr_pat_[A-Za-z0-9_-]{43}$/);
    expect(a).not.toBe(b);
  });
});

describe("problem+json", () => {
  it("keeps 401, 403, 404, 409, 422 distinct and lists pointers", () => {
    const codes = ["unauthenticated", "forbidden", "not_found", "conflict", "validation_failed"] as const;
    expect(codes.map((c) => new AppError(c, "x").status)).toEqual([401, 403, 404, 409, 422]);
    const body = problemJson(new AppError("validation_failed", "Bad", [{ pointer: "/points/3/T", message: "must be > 0" }]), "/api/v1/x");
    expect(body).toMatchObject({ status: 422, code: "validation_failed", instance: "/api/v1/x", errors: [{ pointer: "/points/3/T" }] });
  });
});
