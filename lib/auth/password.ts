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

// A fixed hash compared against when the e-mail is unknown, so timing does not reveal which e-mails exist.
const DUMMY_HASH = "$2b$11$5flmkfu6oesVJj4zLN48XuasQvHWAraMZ5qDLjbBxDMPFxDOw4ssu";

export async function verifyAgainstNothing(password: string): Promise<false> {
  await bcrypt.compare(password, DUMMY_HASH).catch(() => false);
  return false;
}
