import { createHash } from "node:crypto";
import { bodyBytes, builtFromBytes, bytesResponse } from "./byte-body";

/**
 * Validators and caching of the API's public reads: a strong ETag over the exact bytes sent (or
 * the one the handler set), Cache-Control, and 304 Not Modified to a matching If-None-Match
 * (RFC 9110 §8.8.3, §13.1.2; RFC 9111 §5.2). Applied by withApi to endpoints that declare `cache`.
 */
export interface CachePolicy {
  /** Seconds a client or shared cache may reuse the answer without asking again. */
  maxAge: number;
}

/** The entity tag of a body: a SHA-256 of its bytes, quoted (RFC 9110 §8.8.3). */
export function entityTag(bytes: Uint8Array): string {
  return `"${createHash("sha256").update(bytes).digest("base64url").slice(0, 32)}"`;
}

/** RFC 9110 §13.1.2: If-None-Match uses the weak comparison; "*" matches any current answer. */
export function noneMatch(ifNoneMatch: string | null, etag: string): boolean {
  if (ifNoneMatch === null) return true;
  const opaque = (tag: string) => tag.trim().replace(/^W\//, "");
  const wanted = opaque(etag);
  return !ifNoneMatch.split(",").some((t) => t.trim() === "*" || opaque(t) === wanted);
}

/** The answer with its ETag and Cache-Control, or a 304 when the client already holds it. */
export async function withValidators(req: Request, res: Response, policy: CachePolicy): Promise<Response> {
  if ((req.method !== "GET" && req.method !== "HEAD") || res.status !== 200) return res;
  const built = builtFromBytes(res);
  const bytes = built ?? (await bodyBytes(res));
  const etag = res.headers.get("etag") ?? entityTag(bytes);
  // A response built from bytes here keeps its body and takes the headers (no second copy of it).
  const headers = built ? res.headers : new Headers(res.headers);
  headers.set("etag", etag);
  headers.set("cache-control", `public, max-age=${policy.maxAge}`);
  if (!noneMatch(req.headers.get("if-none-match"), etag)) {
    // RFC 9110 §15.4.5: a 304 carries the fields a 200 would have sent that describe caching.
    const kept = new Headers();
    for (const name of ["etag", "cache-control", "vary", "content-location", "expires"]) {
      const v = headers.get(name);
      if (v !== null) kept.set(name, v);
    }
    return new Response(null, { status: 304, headers: kept });
  }
  return built ? res : bytesResponse(bytes, { status: res.status, headers });
}

/** The API's public reads: a minute of reuse (publication and retraction show within it). */
export const PUBLIC_READ_CACHE: CachePolicy = { maxAge: 60 };
