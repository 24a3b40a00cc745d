/**
 * ORCID iD check digit: ISO 7064 MOD 11-2, as described in ORCID's public documentation on the
 * structure of the identifier. Accepts `0000-0002-1825-0097` or the https://orcid.org/ form.
 */
export function normaliseOrcid(input: string): string | null {
  const trimmed = input.trim().replace(/^https?:\/\/orcid\.org\//i, "");
  const m = /^(\d{4})-?(\d{4})-?(\d{4})-?(\d{3}[\dX])$/i.exec(trimmed);
  if (!m) return null;
  const id = `${m[1]}-${m[2]}-${m[3]}-${m[4].toUpperCase()}`;
  return orcidChecksumValid(id) ? id : null;
}

export function orcidChecksumValid(id: string): boolean {
  const digits = id.replace(/-/g, "");
  if (!/^\d{15}[\dX]$/.test(digits)) return false;
  return orcidCheckDigit(digits.slice(0, 15)) === digits[15];
}

/** The ISO 7064 MOD 11-2 check character of the first 15 digits of an iD ("X" stands for 10). */
export function orcidCheckDigit(first15: string): string {
  let total = 0;
  for (let i = 0; i < 15; i++) total = (total + Number(first15[i])) * 2;
  const result = (12 - (total % 11)) % 11;
  return result === 10 ? "X" : String(result);
}
