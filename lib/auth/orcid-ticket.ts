import "server-only";
import { createHmac, randomBytes, timingSafeEqual } from "node:crypto";
import { searchCursorSecret } from "@/lib/config";

/**
 * What a first ORCID sign-in hands to the confirmation page: the iD the provider proved and the
 * name it reported, valid for `ORCID_TICKET_SECONDS`, signed (HMAC-SHA-256, a label of its own on
 * the server key) so the page cannot be pointed at another iD. It is no session: it only lets its
 * holder confirm a name and an e-mail address for a new account. Form: base64url(JSON) "." MAC.
 */
export const ORCID_TICKET_SECONDS = 15 * 60;

export interface OrcidTicket {
  /** Random: a ticket confirms one sign-up only (a copy of the page's address cannot be used again). */
  id: string;
  orcid: string;
  name: string;
  /** Seconds since 1970 after which the ticket is refused. */
  expires: number;
}

const mac = (body: string) => createHmac("sha256", searchCursorSecret()).update(`orcid-sign-up-ticket\n${body}`).digest();

export function signOrcidTicket({ orcid, name }: { orcid: string; name: string }, now = new Date()): string {
  const ticket: OrcidTicket = {
    id: randomBytes(12).toString("base64url"),
    orcid,
    name,
    expires: Math.floor(now.getTime() / 1000) + ORCID_TICKET_SECONDS,
  };
  const body = Buffer.from(JSON.stringify(ticket)).toString("base64url");
  return `${body}.${mac(body).toString("base64url")}`;
}

export const TICKET_REFUSED = "This confirmation page has expired or was not made by this site. Sign in with ORCID again.";

/** The ticket's content, or null when it was altered, made with another key, or has expired. */
export function readOrcidTicket(text: string, now = new Date()): OrcidTicket | null {
  const [body, signature, extra] = text.split(".");
  if (!body || !signature || extra !== undefined) return null;
  const given = Buffer.from(signature, "base64url");
  const expected = mac(body);
  if (given.length !== expected.length || !timingSafeEqual(given, expected)) return null;
  try {
    const ticket = JSON.parse(Buffer.from(body, "base64url").toString("utf8")) as OrcidTicket;
    if (
      typeof ticket.id !== "string" ||
      typeof ticket.orcid !== "string" ||
      typeof ticket.name !== "string" ||
      typeof ticket.expires !== "number"
    )
      return null;
    return now.getTime() / 1000 > ticket.expires ? null : ticket;
  } catch {
    return null;
  }
}
