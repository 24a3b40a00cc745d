import { randomInt } from "node:crypto";
import { orcidCheckDigit } from "../../lib/auth/orcid";

/**
 * An invented ORCID iD no other test uses: random digits after the 0009 block, with the right ISO
 * 7064 MOD 11-2 check character. The database is shared by the whole run, and other tests link iDs
 * to people, so each test takes its own.
 */
export function freshOrcid(): string {
  const first15 = `0009${String(randomInt(0, 10 ** 6)).padStart(6, "0")}${String(randomInt(0, 10 ** 5)).padStart(5, "0")}`;
  const digits = `${first15}${orcidCheckDigit(first15)}`;
  return digits.match(/.{4}/g)!.join("-");
}
