import "server-only";
import { createHmac, timingSafeEqual } from "node:crypto";
import { searchCursorSecret } from "@/lib/config";

/**
 * OAI-PMH resumption tokens (§3.5): where an incomplete list stopped, bound to the request that
 * began it and to a time after which it expires, signed with a server key (HMAC-SHA-256) so a
 * harvester can neither forge a position nor stretch its life. Nothing is stored: the list goes on
 * from the last (datestamp, id) delivered. Form: base64url(JSON) "." base64url(MAC).
 */

/** How long a token may be used, seconds. */
export const RESUMPTION_TOKEN_SECONDS = 24 * 60 * 60;

export interface ListPosition {
  verb: "ListIdentifiers" | "ListRecords";
  metadataPrefix: string;
  set: string | null;
  /** The list's bounds: first instant admitted, first instant no longer admitted (ISO 8601). */
  from: string | null;
  until: string | null;
  /** The last record delivered: its exact datestamp (microseconds, as PostgreSQL keeps it) and version id. */
  after: { at: string; id: number };
  /** Records delivered before the next page (§3.5.1 cursor). */
  cursor: number;
  /** Seconds since 1970 after which the token is refused. */
  expires: number;
}

// Domain-separated from the search cursors that share the key.
const mac = (body: string) => createHmac("sha256", searchCursorSecret()).update(`oai-resumption-token\n${body}`).digest();

export function signResumptionToken(position: ListPosition): string {
  const body = Buffer.from(JSON.stringify(position)).toString("base64url");
  return `${body}.${mac(body).toString("base64url")}`;
}

/** The position in a token, or why it is refused: altered or made with another key, or expired. */
export function readResumptionToken(token: string, now: Date = new Date()): { position: ListPosition } | { refused: string } {
  const [body, signature, extra] = token.split(".");
  const altered = { refused: "The resumption token was altered or was not issued by this repository." };
  if (!body || !signature || extra !== undefined) return altered;
  const given = Buffer.from(signature, "base64url");
  const expected = mac(body);
  if (given.length !== expected.length || !timingSafeEqual(given, expected)) return altered;
  let position: ListPosition;
  try {
    position = JSON.parse(Buffer.from(body, "base64url").toString("utf8")) as ListPosition;
  } catch {
    return altered;
  }
  if (typeof position?.expires !== "number" || now.getTime() / 1000 > position.expires)
    return { refused: "The resumption token has expired; start the list again." };
  return { position };
}
