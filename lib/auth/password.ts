import bcrypt from "bcryptjs";
import { bcryptRounds } from "@/lib/config";

export const PASSWORD_MIN_LENGTH = 10;

export function hashPassword(password: string): Promise<string> {
  // Default cost 11 ≈ 0.1–0.2 s in pure JS on this class of machine: slow for guessing, fine for people.
  return bcrypt.hash(password, bcryptRounds());
}

export function verifyPassword(password: string, hash: string): Promise<boolean> {
  return bcrypt.compare(password, hash);
}

// A hash at the same cost as real ones, compared against when the e-mail is unknown, so timing
// does not reveal which e-mails exist (a fixed cost would differ once BCRYPT_ROUNDS is changed).
let dummyHash: Promise<string> | undefined;

export async function verifyAgainstNothing(password: string): Promise<false> {
  dummyHash ??= bcrypt.hash("no account has this password", bcryptRounds());
  await bcrypt.compare(password, await dummyHash).catch(() => false);
  return false;
}
