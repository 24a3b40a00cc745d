import { createHash, randomBytes, timingSafeEqual } from "node:crypto";

/** A URL-safe random secret with a readable prefix, e.g. `arh_key_…` for API keys. */
export function generateSecret(prefix: string, bytes = 32): string {
  return `${prefix}${randomBytes(bytes).toString("base64url")}`;
}

/**
 * SHA-256 of a high-entropy secret. Unlike passwords, random 256-bit secrets need no slow hash:
 * guessing is infeasible, and a fast hash lets us look the token up by its hash.
 */
export function hashSecret(secret: string): string {
  return createHash("sha256").update(secret, "utf8").digest("hex");
}

export function secretsEqual(a: string, b: string): boolean {
  const ab = Buffer.from(a);
  const bb = Buffer.from(b);
  return ab.length === bb.length && timingSafeEqual(ab, bb);
}
