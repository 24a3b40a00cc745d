/**
 * Text fit for the research world's metadata formats. XML 1.0 (§2.2, production Char) cannot carry
 * C0 control characters other than tab, line feed and carriage return, lone surrogates, or
 * U+FFFE / U+FFFF, and a metadata record that holds one is refused by whoever reads it; a line
 * break inside a one-line field of a line-based format (RIS) would start a new tag.
 */

// Characters outside XML 1.0's Char production (tab, LF and CR are allowed).
const NOT_XML_CHAR =
  /[\u0000-\u0008\u000B\u000C\u000E-\u001F\uFFFE\uFFFF]|[\uD800-\uDBFF](?![\uDC00-\uDFFF])|(?<![\uD800-\uDBFF])[\uDC00-\uDFFF]/g;

/** The text without characters XML 1.0 cannot carry (line breaks kept). */
export function xmlSafeText(text: string): string {
  return text.replace(NOT_XML_CHAR, "");
}

/** Characters that change how a line displays without being seen: zero width space, text direction controls, noncharacters. */
const UNSEEN = /[\u200B\u202A-\u202E\u2066-\u2069\uFDD0-\uFDEF]/g;

/**
 * One line of text: characters XML cannot carry and unseen ones (UNSEEN) removed, every run of
 * white space one space — line breaks included, and the ones YAML 1.1 readers also break lines at
 * (U+0085, U+2028, U+2029), so a line-based format never gets a line the text did not mean.
 */
export function oneLineText(text: string): string {
  return xmlSafeText(text)
    .replace(UNSEEN, "")
    .replace(/[\s\u0085]+/g, " ")
    .trim();
}

/** Every string inside a JSON-like value passed through `clean` (objects and arrays copied, other values kept). */
export function mapStrings<T>(value: T, clean: (s: string) => string): T {
  if (typeof value === "string") return clean(value) as T;
  if (Array.isArray(value)) return value.map((v) => mapStrings(v, clean)) as T;
  if (value && typeof value === "object" && !(value instanceof Date)) {
    return Object.fromEntries(Object.entries(value).map(([k, v]) => [k, mapStrings(v, clean)])) as T;
  }
  return value;
}

/**
 * Characters no deposited text may hold, so that every format the text later travels in (XML,
 * RIS, BibTeX, CSV, YAML, a terminal) carries it as written: the C0 controls (tab, line feed and
 * carriage return only in a field that allows lines), DEL and the C1 controls (U+007F–U+009F),
 * lone surrogates and the noncharacters U+FDD0–U+FDEF, U+FFFE / U+FFFF (the Unicode Standard,
 * §23.7). A one-line field holds none of the line and paragraph separators U+2028 / U+2029 (a
 * YAML 1.1 reader breaks the line there), the bidirectional embeddings, overrides and isolates
 * U+202A–U+202E and U+2066–U+2069 (which make the text display in another order than it reads,
 * Unicode Standard Annex #9) or the zero width space U+200B. Refused where text enters, never removed.
 */
const FORBIDDEN_IN_LINE =
  /[\u0000-\u001F\u007F-\u009F\u200B\u2028\u2029\u202A-\u202E\u2066-\u2069\uFDD0-\uFDEF\uFFFE\uFFFF]|[\uD800-\uDBFF](?![\uDC00-\uDFFF])|(?<![\uD800-\uDBFF])[\uDC00-\uDFFF]/;
const FORBIDDEN_IN_LINES =
  /[\u0000-\u0008\u000B\u000C\u000E-\u001F\u007F-\u009F\uFDD0-\uFDEF\uFFFE\uFFFF]|[\uD800-\uDBFF](?![\uDC00-\uDFFF])|(?<![\uD800-\uDBFF])[\uDC00-\uDFFF]/;

/** Whether a string could hold a forbidden character at all (one cheap test before the precise one). */
export const SUSPECT_CHARACTER =
  /[\u0000-\u001F\u007F-\u009F\u200B\u2028\u2029\u202A-\u202E\u2066-\u2069\uD800-\uDFFF\uFDD0-\uFDEF\uFFFE\uFFFF]/;

/** A character's code as U+XXXX. */
export const codePointLabel = (c: string) => `U+${c.charCodeAt(0).toString(16).toUpperCase().padStart(4, "0")}`;

const CHARACTER_NAMES: Record<string, string> = {
  "\u0000": "NUL",
  "\t": "tab",
  "\n": "line feed",
  "\r": "carriage return",
  "\u007F": "delete",
  "\u200B": "zero width space",
  "\u2028": "line separator",
  "\u2029": "paragraph separator",
  "\uFFFE": "not a character",
  "\uFFFF": "not a character",
};

/** What the character is, in words: "U+0007 (a control character)", "U+000A (line feed)". */
export function describeCharacter(c: string): string {
  const code = c.charCodeAt(0);
  const name =
    CHARACTER_NAMES[c] ??
    (code >= 0xd800 && code <= 0xdfff
      ? "half of a character, not valid Unicode"
      : code >= 0xfdd0 && code <= 0xfdef
        ? "not a character"
        : (code >= 0x202a && code <= 0x202e) || (code >= 0x2066 && code <= 0x2069)
          ? "a text direction control"
          : "a control character");
  return `${codePointLabel(c)} (${name})`;
}

/**
 * The first character a deposited text may not hold (see above), with its position (from 0), or
 * null. `lines`: the field allows several lines, so tab, line feed and carriage return are fine.
 *
 * @example forbiddenCharacter("Tanaka\u0007", { lines: false }) // { character: "\u0007", index: 6 }
 */
export function forbiddenCharacter(text: string, { lines }: { lines: boolean }): { character: string; index: number } | null {
  const m = (lines ? FORBIDDEN_IN_LINES : FORBIDDEN_IN_LINE).exec(text);
  return m ? { character: m[0], index: m.index } : null;
}
