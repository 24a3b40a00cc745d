import "server-only";
import { createHash, createHmac, timingSafeEqual } from "node:crypto";
import { searchCursorSecret } from "@/lib/config";
import { AppError } from "@/lib/errors";
import type { SearchRequest } from "./types";

/**
 * Cursors: the engine's position after the last hit, bound to the search it came from (text,
 * view, sort, filters) and signed with a server key (HMAC-SHA-256), so a reader can neither forge
 * a position nor carry a cursor over to another search. Form: base64url(JSON) "." base64url(MAC).
 */

/** What a cursor is bound to: everything of the request but the page size and the cursor itself. */
function fingerprint(request: Pick<SearchRequest, "q" | "view" | "sort" | "filters">): string {
  const { q, view, sort, filters } = request;
  return createHash("sha256")
    .update(JSON.stringify([q, view, sort, filters]))
    .digest("base64url")
    .slice(0, 16);
}

function mac(body: string): Buffer {
  return createHmac("sha256", searchCursorSecret()).update(body).digest();
}

/** A cursor for the engine position `after` within this search. */
export function signCursor(after: string, request: Pick<SearchRequest, "q" | "view" | "sort" | "filters">): string {
  const body = Buffer.from(JSON.stringify({ a: after, f: fingerprint(request) })).toString("base64url");
  return `${body}.${mac(body).toString("base64url")}`;
}

/** The engine position in a cursor, or null when it was altered, made with another key, or belongs to another search. */
export function verifyCursor(cursor: string, request: Pick<SearchRequest, "q" | "view" | "sort" | "filters">): string | null {
  const [body, signature, extra] = cursor.split(".");
  if (!body || !signature || extra !== undefined) return null;
  const given = Buffer.from(signature, "base64url");
  const expected = mac(body);
  if (given.length !== expected.length || !timingSafeEqual(given, expected)) return null;
  try {
    const decoded = JSON.parse(Buffer.from(body, "base64url").toString("utf8")) as { a?: unknown; f?: unknown };
    if (typeof decoded.a !== "string" || decoded.f !== fingerprint(request)) return null;
    return decoded.a;
  } catch {
    return null;
  }
}

/** The engine position of the request's cursor (null on the first page), or a 400 naming `cursor`. */
export function cursorPositionOrThrow(request: SearchRequest): string | null {
  if (request.cursor === null) return null;
  const after = verifyCursor(request.cursor, request);
  if (after === null) {
    const message = "cursor was altered or belongs to another search; start again from the first page";
    throw new AppError("bad_request", message, [{ pointer: "/cursor", parameter: "cursor", message }]);
  }
  return after;
}
