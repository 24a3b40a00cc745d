import "server-only";
import { and, eq, gt, lt, sql } from "drizzle-orm";
import { getDb, type Transaction } from "@/db/client";
import { idempotencyKeys } from "@/db/idempotency";

/** How long a key and its stored response are kept. */
export const IDEMPOTENCY_TTL_HOURS = 24;

export interface IdempotencyRecord {
  endpoint: string;
  requestHash: string;
  responseStatus: number;
  responseHeaders: Record<string, string>;
  responseBody: string;
}

/** Thrown inside a creating transaction when another request already recorded the same key: roll back. */
export class IdempotencyKeyTakenError extends Error {
  constructor() {
    super("This Idempotency-Key was recorded by another request");
  }
}

/** The live record of a key, if any (expired records are cleared first). */
export async function findIdempotencyRecord({ userId, key }: { userId: number; key: string }): Promise<IdempotencyRecord | null> {
  const db = getDb();
  await db.delete(idempotencyKeys).where(lt(idempotencyKeys.expiresAt, sql`now()`));
  const [found] = await db
    .select({
      endpoint: idempotencyKeys.endpoint,
      requestHash: idempotencyKeys.requestHash,
      responseStatus: idempotencyKeys.responseStatus,
      responseHeaders: idempotencyKeys.responseHeaders,
      responseBody: idempotencyKeys.responseBody,
    })
    .from(idempotencyKeys)
    .where(and(eq(idempotencyKeys.userId, userId), eq(idempotencyKeys.key, key), gt(idempotencyKeys.expiresAt, sql`now()`)));
  return found ?? null;
}

/**
 * Records a key with the response to replay, inside the transaction that created what the
 * response describes: both commit, or neither. When a live record of the key exists (a concurrent
 * request with the same key committed first; this insert waits for it), throws
 * IdempotencyKeyTakenError so that this transaction rolls back.
 */
export async function recordIdempotentResponse(
  tx: Transaction,
  {
    userId,
    key,
    endpoint,
    requestHash,
    status,
    headers,
    body,
  }: { userId: number; key: string; endpoint: string; requestHash: string; status: number; headers: Record<string, string>; body: string },
): Promise<void> {
  // What a replaced (expired) record is overwritten with: everything but its identity.
  const record = {
    endpoint,
    requestHash,
    responseStatus: status,
    responseHeaders: headers,
    responseBody: body,
    createdAt: sql`now()`,
    expiresAt: sql`now() + make_interval(hours => ${IDEMPOTENCY_TTL_HOURS})`,
  };
  const written = await tx
    .insert(idempotencyKeys)
    .values({ userId, key, ...record })
    // An expired record of the same key is replaced; a live one is kept.
    .onConflictDoUpdate({
      target: [idempotencyKeys.userId, idempotencyKeys.key],
      set: record,
      setWhere: lt(idempotencyKeys.expiresAt, sql`now()`),
    })
    .returning({ key: idempotencyKeys.key });
  if (!written.length) throw new IdempotencyKeyTakenError();
}
