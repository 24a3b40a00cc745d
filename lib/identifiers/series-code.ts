// Our identifier scheme. A series (all versions of one dataset) is "ARH-" + seven random
// Crockford base32 symbols + one check symbol, grouped by four for reading aloud:
// 10.5072/ARH-4F7K-9QXM. A version is the series and its number after a slash: 10.5072/ARH-4F7K-9QXM/2.
// The codes say nothing about how many datasets exist, and the check symbol (Crockford's mod 37)
// catches a mistyped symbol or two swapped neighbours before anything is looked up.
// Identifiers minted before this scheme (10.5072/arrhenia.41, …/arrhenia.41.v1) stay valid and resolve.
import { randomInt } from "node:crypto";
import { CrockfordBase32 } from "crockford-base32";

export const SERIES_CODE_TAG = "ARH";
/** Random symbols in a series code (35 bits: 34 billion codes). */
export const SERIES_CODE_SYMBOLS = 7;
const SPACE = 32 ** SERIES_CODE_SYMBOLS;
/** Crockford's check symbols: the 32 digits, then * ~ $ = U for the values 32 … 36. */
const CHECK_SYMBOLS = "0123456789ABCDEFGHJKMNPQRSTVWXYZ*~$=U";

/** The check symbol of a value (Crockford base32, "check symbol" section: value mod 37). */
export function checkSymbol(value: number): string {
  return CHECK_SYMBOLS[value % 37];
}

/** "4F7K9QXM" → "ARH-4F7K-9QXM". */
function groupCode(symbols: string): string {
  return `${SERIES_CODE_TAG}-${symbols.slice(0, 4)}-${symbols.slice(4)}`;
}

/** A random value whose check symbol is a digit or letter: * ~ $ = break BibTeX and LaTeX and are hard to read aloud. */
function drawValue(): number {
  for (;;) {
    const value = randomInt(0, SPACE);
    if (value % 37 < 32) return value;
  }
}

/**
 * A new series code from a value in [0, 32⁷) whose check symbol is one of the 32 base symbols
 * (random by default). Codes with the other five check symbols minted earlier still parse.
 */
export function newSeriesCode(value: number = drawValue()): string {
  if (!Number.isInteger(value) || value < 0 || value >= SPACE) throw new RangeError(`series code value ${value} out of range`);
  if (value % 37 >= 32)
    throw new RangeError(
      `series code value ${value} has the check symbol ${checkSymbol(value)}; codes are drawn with a digit or letter there`,
    );
  const digits = CrockfordBase32.encode(value, { variant: "ulid" }).replace(/^0+/, "").padStart(SERIES_CODE_SYMBOLS, "0");
  return groupCode(digits + checkSymbol(value));
}

export function newSeriesIdentifier(prefix: string, value?: number): string {
  return `${prefix}/${newSeriesCode(value)}`;
}

const LEGACY_SERIES = /^10\.\d{4,9}\/arrhenia\.[1-9]\d*$/;

/** The version identifier of version `number` of a series; a series minted before the codes keeps its own form. */
export function versionIdentifierOf(series: string, number: number): string {
  return LEGACY_SERIES.test(series) ? `${series}.v${number}` : `${series}/${number}`;
}

export type ParsedIdentifier =
  | { ok: true; scheme: "code"; kind: "series" | "version"; identifier: string; series: string; version: number | null }
  | { ok: true; scheme: "legacy"; kind: "series" | "version"; identifier: string }
  | { ok: false; reason: "mistyped" | "malformed"; message: string };

const CODE_FORM = /^(10\.\d{4,9})\/ARH-?([0-9A-Z]{4})-?([0-9A-Z]{3})([0-9A-Z*~$=])(?:\/([1-9]\d{0,5}))?$/;
const LEGACY_FORM = /^10\.\d{4,9}\/arrhenia\.[1-9]\d{0,9}(\.v[1-9]\d{0,5})?$/;

/**
 * Reads what a person typed or pasted (with or without "doi:" or a resolver address, any case,
 * I/L for 1 and O for 0 as Crockford allows, hyphens optional) into the identifier as minted.
 * Pure: "mistyped" comes from the check symbol alone, before any lookup.
 */
export function parseIdentifier(raw: string): ParsedIdentifier {
  let text = raw.trim().replace(/^doi:\s*/i, "");
  // One slash too: a resolver address pasted into a path has its "//" collapsed to "/".
  text = text.replace(/^https?:\/\/?(dx\.)?doi\.org\//i, "");
  try {
    text = decodeURIComponent(text);
  } catch {
    return { ok: false, reason: "malformed", message: "The identifier contains a malformed %-escape" };
  }
  if (LEGACY_FORM.test(text)) return { ok: true, scheme: "legacy", kind: /\.v\d+$/.test(text) ? "version" : "series", identifier: text };
  const upper = text.toUpperCase().replace(/\s+/g, "");
  const m = CODE_FORM.exec(
    upper.replace(
      /^(10\.\d{4,9}\/ARH-?)([0-9A-Z-]+)/,
      (_, head: string, rest: string) => head + rest.replace(/[IL]/g, "1").replace(/O/g, "0"),
    ),
  );
  if (!m) {
    return {
      ok: false,
      reason: "malformed",
      message: "Not an identifier of this repository: expected a form such as 10.5072/ARH-4F7K-9QXM or 10.5072/ARH-4F7K-9QXM/2",
    };
  }
  const [, prefix, first, rest, check, version] = m;
  const digits = first + rest;
  if (/[U*~$=]/.test(digits)) return { ok: false, reason: "mistyped", message: mistyped(upper) };
  const value = Number(CrockfordBase32.decode(digits, { asNumber: true, variant: "ulid" }));
  if (checkSymbol(value) !== check) return { ok: false, reason: "mistyped", message: mistyped(upper) };
  const series = `${prefix}/${groupCode(digits + check)}`;
  const number = version ? Number(version) : null;
  return {
    ok: true,
    scheme: "code",
    kind: number === null ? "series" : "version",
    identifier: number === null ? series : versionIdentifierOf(series, number),
    series,
    version: number,
  };
}

function mistyped(text: string): string {
  return `Mistyped identifier: the check character of ${text} does not match its code; compare it with the citation symbol by symbol`;
}
