// GET/POST /api/auth/* — next-auth's sign-in, session and sign-out endpoints
import NextAuth from "next-auth";
import { NextRequest, NextResponse } from "next/server";
import { clientAbortResponse, problemResponse } from "@/lib/auth/api";
import { authOptions } from "@/lib/auth/options";
import { ORCID_TICKET_COOKIE, ORCID_TICKET_COOKIE_OPTIONS, ticketCookieSecure } from "@/lib/auth/orcid-browser";
import { appUrl } from "@/lib/config";
import { AppError } from "@/lib/errors";
import { BODY_LIMITS, readBodyOrThrow } from "@/lib/http/read-body";

type Context = { params: Promise<{ nextauth: string[] }> };

const handler = NextAuth(authOptions);

/**
 * An ORCID callback that carries the provider's `error` (the person cancelled, or the provider
 * failed) goes to the sign-in page with a worded code; next-auth would say only "Callback".
 * Nothing is changed: the state and PKCE cookies expire on their own.
 */
async function GET(req: NextRequest, context: Context) {
  const url = new URL(req.url);
  const error = url.searchParams.get("error");
  if (error && url.pathname.endsWith("/callback/orcid")) {
    const code = error === "access_denied" ? "OrcidCancelled" : "OrcidProviderError";
    return NextResponse.redirect(`${appUrl()}/sign-in?error=${code}`, 302);
  }
  const res: Response = await handler(req, context);
  return url.pathname.endsWith("/callback/orcid") ? ticketIntoCookie(res) : res;
}

/**
 * A first ORCID sign-in ends at the confirmation page: its ticket leaves the address for a cookie
 * of this browser (the one whose state and PKCE cookies next-auth just checked), so the page's
 * address, if copied, opens nothing for anyone else.
 */
function ticketIntoCookie(res: Response): Response {
  const location = res.headers.get("location");
  if (!location) return res;
  const target = new URL(location, appUrl());
  const ticket = target.searchParams.get("ticket");
  if (target.pathname !== "/sign-in/orcid" || !ticket) return res;
  target.searchParams.delete("ticket");
  const headers = new Headers(res.headers);
  headers.set("location", target.toString());
  const out = new NextResponse(null, { status: res.status, headers });
  out.cookies.set(ORCID_TICKET_COOKIE, ticket, { ...ORCID_TICKET_COOKIE_OPTIONS, secure: ticketCookieSecure() });
  return out;
}

// next-auth reads the whole body itself; hand it a copy read with the cap instead.
async function POST(req: NextRequest, context: Context) {
  let body: Uint8Array;
  try {
    body = await readBodyOrThrow(req, { limit: BODY_LIMITS.form, what: "sign-in request" });
  } catch (err) {
    const instance = new URL(req.url).pathname;
    if (err instanceof AppError) return problemResponse(err, instance);
    const aborted = clientAbortResponse(req, err, instance);
    if (aborted) return aborted;
    throw err;
  }
  return handler(new NextRequest(req.url, { method: "POST", headers: req.headers, body: body as BodyInit }), context);
}

export { GET, POST };
