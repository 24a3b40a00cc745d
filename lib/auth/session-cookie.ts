/**
 * Any cookie next-auth may read as (part of) a session: it takes every cookie whose name *starts*
 * with its session cookie's name (`next-auth.session-token`, `__Secure-…`, chunks `.0`, `.1` — and
 * any other suffix), so a name that merely contains it counts too (case ignored, to be safe).
 */
const SESSION_COOKIE = /(?:^|;)[^=;]*next-auth\.session-token[^=;]*=/i;

/** True when a Cookie header may carry a session: without one, nobody is signed in. */
export function mayCarrySession(cookieHeader: string | null | undefined): boolean {
  return !!cookieHeader && SESSION_COOKIE.test(cookieHeader);
}
