import "server-only";
import { createHash } from "node:crypto";
import { AppError } from "@/lib/errors";
import type { UserDto } from "@/lib/users/queries";
import { claimIdempotencyKey, completeIdempotencyKey, releaseIdempotencyKey } from "./queries";

// The Idempotency-Key header of the IETF httpapi draft ("The Idempotency-Key HTTP Header Field"):
// same caller + same key + same request → the first response is replayed; the same key with
// another request → 422; while the first is still running → 409.

const KEY_PATTERN = /^[\x21-\x7e]{1,255}$/;
/** Response headers worth replaying; the rest are set afresh by the server. */
const KEPT_HEADERS = ["content-type", "location", "etag"];

/** The header's value: a structured-field string (`"…"`) or, leniently, a bare token. */
function keyOf(req: Request): string | null {
  const raw = req.headers.get("idempotency-key");
  if (raw === null) return null;
  const trimmed = raw.trim();
  const key = trimmed.length >= 2 && trimmed.startsWith('"') && trimmed.endsWith('"') ? trimmed.slice(1, -1) : trimmed;
  if (!KEY_PATTERN.test(key)) {
    throw new AppError("validation_failed", "The Idempotency-Key header must be 1 to 255 visible ASCII characters", [
      { pointer: "", message: "invalid Idempotency-Key header" },
    ]);
  }
  return key;
}

/**
 * Runs `run` at most once per (caller, Idempotency-Key). `fingerprint` stands for the request
 * body: the raw bytes for JSON, or what a multipart body carries (its boundary changes on every
 * retry). Without the header, `run` simply runs. Only successful (2xx) responses are kept: a
 * refused request stored nothing, so its retry may run again.
 */
export async function withIdempotency({
  req,
  user,
  fingerprint,
  run,
}: {
  req: Request;
  user: UserDto;
  fingerprint: Uint8Array | string;
  run: () => Promise<Response>;
}): Promise<Response> {
  const key = keyOf(req);
  if (key === null) return run();
  const endpoint = `${req.method} ${new URL(req.url).pathname}`;
  const requestHash = createHash("sha256").update(endpoint).update("\n").update(fingerprint).digest("hex");
  const existing = await claimIdempotencyKey({ userId: user.id, key, endpoint, requestHash });
  if (existing) {
    if (existing.endpoint !== endpoint || existing.requestHash !== requestHash) {
      throw new AppError(
        "validation_failed",
        "This Idempotency-Key was already used for a different request; use a new key for a new request",
        [{ pointer: "", message: `key first used for ${existing.endpoint} with another body` }],
      );
    }
    if (existing.responseStatus === null)
      throw new AppError("conflict", "A request with this Idempotency-Key is still being processed; retry later");
    return new Response(existing.responseBody, {
      status: existing.responseStatus,
      headers: { ...existing.responseHeaders, "idempotent-replayed": "true" },
    });
  }
  let response: Response;
  try {
    response = await run();
  } catch (err) {
    await releaseIdempotencyKey({ userId: user.id, key });
    throw err;
  }
  if (response.status < 200 || response.status >= 300) {
    await releaseIdempotencyKey({ userId: user.id, key });
    return response;
  }
  const body = await response.text();
  const headers = Object.fromEntries(KEPT_HEADERS.flatMap((h) => (response.headers.has(h) ? [[h, response.headers.get(h)!]] : [])));
  await completeIdempotencyKey({ userId: user.id, key, status: response.status, headers, body });
  return new Response(body, { status: response.status, headers: response.headers });
}
