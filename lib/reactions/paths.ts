/**
 * The reaction page's address: `/reactions/<key>` with the reaction key (lib/chem/reaction-key.ts)
 * written URL-safe by putting "~" for its ">>" (InChIKeys, "+", "*" and "2*" coefficients are
 * safe in a path as they are): `/reactions/IUAWJ…-N+VNWK…-N~XLYO…-N`. The numeric id is an alias
 * that redirects there. Pure: pages, links and the sitemap share it.
 */
import { parseIdOrNull } from "@/lib/ids";

/** The path segment of a reaction key ("A+B>>C" → "A+B~C"). */
export const reactionSegment = (key: string) => key.replace(">>", "~");

/** The reaction page of a key. */
export const reactionPath = (key: string) => `/reactions/${reactionSegment(key)}`;

/**
 * What a `/reactions/<segment>` path names: a numeric id (the alias), a key (from its URL-safe
 * form or written with ">>"), or nothing a reaction could have (a 404 without a lookup).
 */
export function readReactionSegment(segment: string): { id: number } | { key: string } | null {
  if (/^\d+$/.test(segment)) {
    const id = parseIdOrNull(segment);
    return id === null ? null : { id };
  }
  const key = segment.includes(">>") ? segment : segment.replace("~", ">>");
  // Sides of "[coefficient*]INCHIKEY" joined by "+", then ">>", then such a side or "*".
  const part = "(?:[0-9.e-]+\\*)?[A-Z]{14}-[A-Z]{10}-[A-Z]";
  const side = `${part}(?:\\+${part})*`;
  return key.length <= 2000 && new RegExp(`^${side}>>(?:${side}|\\*)$`).test(key) ? { key } : null;
}

/** A path segment as it arrives, "%3E%3E" read as ">>" (the front server already refused malformed escapes). */
export function decodePathSegment(raw: string): string {
  try {
    return decodeURIComponent(raw);
  } catch {
    return raw;
  }
}

/** readReactionSegment of a path segment as it arrives. */
export const readReactionPathSegment = (raw: string) => readReactionSegment(decodePathSegment(raw));
