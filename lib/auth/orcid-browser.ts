import "server-only";
import { cookies } from "next/headers";
import { generateSecret, hashSecret } from "@/lib/auth/secrets";
import { appUrl } from "@/lib/config";

/**
 * The browser that confirmed a first ORCID sign-up keeps a random key in a cookie; the address of
 * that sign-up is confirmed only where the key is (lib/users/accounts.ts verifyEmail). It is read
 * only by the confirmation page's action, so its path is /verify.
 */
const COOKIE = "arrhenia-orcid-sign-up";
const LIFETIME_SECONDS = 48 * 3600; // as long as the confirmation link lives

export function newOrcidBrowserKey(): { key: string; hash: string } {
  const key = generateSecret("osb_");
  return { key, hash: hashSecret(key) };
}

export async function keepOrcidBrowserKey(key: string) {
  (await cookies()).set(COOKIE, key, {
    httpOnly: true,
    sameSite: "lax",
    secure: appUrl().startsWith("https:"),
    path: "/verify",
    maxAge: LIFETIME_SECONDS,
  });
}

export async function orcidBrowserKeyHash(): Promise<string | null> {
  const key = (await cookies()).get(COOKIE)?.value;
  return key && key.length <= 200 ? hashSecret(key) : null;
}

/**
 * The signed ticket of a first ORCID sign-in travels in a cookie set on the ORCID callback's own
 * answer (app/api/auth), never in an address: the confirmation page opens only in the browser that
 * came back from ORCID, so its link cannot be handed to someone else to fill in.
 */
export const ORCID_TICKET_COOKIE = "arrhenia-orcid-ticket";
export const ORCID_TICKET_COOKIE_OPTIONS = {
  httpOnly: true,
  sameSite: "lax" as const,
  path: "/sign-in/orcid",
  maxAge: 15 * 60, // the ticket's own lifetime (lib/auth/orcid-ticket.ts)
};

export function ticketCookieSecure(): boolean {
  return appUrl().startsWith("https:");
}

export async function orcidTicketFromCookie(): Promise<string | null> {
  const value = (await cookies()).get(ORCID_TICKET_COOKIE)?.value;
  return value && value.length <= 2000 ? value : null;
}
