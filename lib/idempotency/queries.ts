import "server-only";
import { and, eq, isNull, lt, sql } from "drizzle-orm";
import { getDb } from "@/db/client";
import { idempotencyKeys } from "@/db/idempotency";

/** How long a key and its stored response are kept. */
export const IDEMPOTENCY_TTL_HOURS = 24;

export interface IdempotencyRecord {
  endpoint: string;
  requestHash: string;
  responseStatus: number | null;
  responseHeaders: Record<string, string> | null;
  responseBody: string | null;
}

/**
 * Claims a key for a request about to run. Returns null when this call claimed it, else the
 * record already there (in flight or finished). Expired records are cleared first.
 */
export async function claimIdempotencyKey({
  userId,
  key,
  endpoint,
  requestHash,
}: {
  userId: number;
  key: string;
  endpoint: string;
  requestHash: string;
}): Promise<IdempotencyRecord | null> {
  const db = getDb();
  await db.delete(idempotencyKeys).where(lt(idempotencyKeys.expiresAt, sql`now()`));
  const inserted = await db
    .insert(idempotencyKeys)
    .values({ userId, key, endpoint, requestHash, expiresAt: sql`now() + make_interval(hours => ${IDEMPOTENCY_TTL_HOURS})` })
    .onConflictDoNothing()
    .returning({ key: idempotencyKeys.key });
  if (inserted.length) return null;
  const [existing] = await db
    .select({
      endpoint: idempotencyKeys.endpoint,
      requestHash: idempotencyKeys.requestHash,
      responseStatus: idempotencyKeys.responseStatus,
      responseHeaders: idempotencyKeys.responseHeaders,
      responseBody: idempotencyKeys.responseBody,
    })
    .from(idempotencyKeys)
    .where(and(eq(idempotencyKeys.userId, userId), eq(idempotencyKeys.key, key)));
  // Expired and removed between the two statements: claim again.
  return existing ?? claimIdempotencyKey({ userId, key, endpoint, requestHash });
}

/** Stores the response of a finished request so that retries replay it. */
export async function completeIdempotencyKey({
  userId,
  key,
  status,
  headers,
  body,
}: {
  userId: number;
  key: string;
  status: number;
  headers: Record<string, string>;
  body: string;
}) {
  await getDb()
    .update(idempotencyKeys)
    .set({ responseStatus: status, responseHeaders: headers, responseBody: body })
    .where(and(eq(idempotencyKeys.userId, userId), eq(idempotencyKeys.key, key), isNull(idempotencyKeys.responseStatus)));
}

/** Frees a key whose request failed and stored nothing, so a retry runs afresh. */
export async function releaseIdempotencyKey({ userId, key }: { userId: number; key: string }) {
  await getDb()
    .delete(idempotencyKeys)
    .where(and(eq(idempotencyKeys.userId, userId), eq(idempotencyKeys.key, key), isNull(idempotencyKeys.responseStatus)));
}
