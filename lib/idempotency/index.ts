import "server-only";
import { createHash } from "node:crypto";
import { NextResponse } from "next/server";
import type { Transaction } from "@/db/client";
import { AppError } from "@/lib/errors";
import type { UserDto } from "@/lib/users/queries";
import { findIdempotencyRecord, IdempotencyKeyTakenError, recordIdempotentResponse, type IdempotencyRecord } from "./queries";

// The Idempotency-Key header of the IETF httpapi draft ("The Idempotency-Key HTTP Header Field"):
// same caller + same key + same request → the first response is replayed; the same key with
// another request → 422. The key and its response are written in the transaction that creates
// the thing, so a crash at any point leaves either both or neither: a retry replays or runs anew,
// and a key can never be stuck "in flight". Two requests racing with one key: the second waits on
// the first's insert, rolls back, and replays the first's response.

const KEY_PATTERN = /^[\x21-\x7e]{1,255}$/;

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

/** A successful answer of a creating POST: JSON body, status, extra headers (location, etag). */
export interface IdempotentAnswer {
  status: number;
  body: unknown;
  headers?: Record<string, string>;
}

/**
 * Given how a route turns what it created into its answer, the hook its creating transaction runs
 * last (`beforeCommit`): it records the key with that answer in the same transaction.
 */
export type KeepAnswer = <T>(answerOf: (created: T) => IdempotentAnswer) => (tx: Transaction, created: T) => Promise<void>;

function toResponse(answer: IdempotentAnswer): Response {
  return NextResponse.json(answer.body, { status: answer.status, headers: answer.headers });
}

function replayOrThrow(record: IdempotencyRecord, endpoint: string, requestHash: string): Response {
  if (record.endpoint !== endpoint || record.requestHash !== requestHash) {
    throw new AppError(
      "validation_failed",
      "This Idempotency-Key was already used for a different request; use a new key for a new request",
      [{ pointer: "", message: `key first used for ${record.endpoint} with another body` }],
    );
  }
  return new Response(record.responseBody, {
    status: record.responseStatus,
    headers: { ...record.responseHeaders, "idempotent-replayed": "true" },
  });
}

/**
 * Runs `run` at most once per (caller, Idempotency-Key). `fingerprint` stands for the request
 * body: the raw bytes for JSON, or what a multipart body carries (its boundary changes on every
 * retry). `run` passes `keep(answerOf)` as the `beforeCommit` of the transaction that creates the
 * thing and returns the same answer. Without the header, `run` simply runs. Only successful (2xx)
 * answers are kept: a refused request stored nothing, so its retry is judged again.
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
  run: (keep: KeepAnswer) => Promise<IdempotentAnswer>;
}): Promise<Response> {
  const key = keyOf(req);
  if (key === null) return toResponse(await run(() => async () => {}));
  const endpoint = `${req.method} ${new URL(req.url).pathname}`;
  const requestHash = createHash("sha256").update(endpoint).update("\n").update(fingerprint).digest("hex");
  const existing = await findIdempotencyRecord({ userId: user.id, key });
  if (existing) return replayOrThrow(existing, endpoint, requestHash);

  let kept = false;
  const keep: KeepAnswer = (answerOf) => async (tx, created) => {
    const answer = answerOf(created);
    if (answer.status < 200 || answer.status >= 300) return;
    const headers: Record<string, string> = { "content-type": "application/json", ...answer.headers };
    await recordIdempotentResponse(tx, {
      userId: user.id,
      key,
      endpoint,
      requestHash,
      status: answer.status,
      headers,
      body: JSON.stringify(answer.body),
    });
    kept = true;
  };
  let answer: IdempotentAnswer;
  try {
    answer = await run(keep);
  } catch (err) {
    // Another request with this key may have committed meanwhile (this one then rolled back, or
    // found its work already done): answer as that one did.
    const now = await findIdempotencyRecord({ userId: user.id, key });
    if (now) return replayOrThrow(now, endpoint, requestHash);
    if (err instanceof IdempotencyKeyTakenError)
      throw new AppError("conflict", "A request with this Idempotency-Key has just finished; retry");
    throw err;
  }
  if (!kept && answer.status >= 200 && answer.status < 300) {
    // Every route passes `keep` to its creating transaction; a success without it is a wiring bug.
    throw new Error(`Idempotency-Key: ${endpoint} answered ${answer.status} without recording the key in its transaction`);
  }
  return toResponse(answer);
}
