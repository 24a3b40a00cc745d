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

/** One line of text: characters XML cannot carry removed, every run of white space (line breaks included) one space. */
export function oneLineText(text: string): string {
  return xmlSafeText(text).replace(/\s+/g, " ").trim();
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
