import type { Transaction } from "@/db/client";
import { getSender, jobsInTransaction, retryPolicy } from "@/lib/jobs/boss";
import { listPendingIdentifiers } from "./queries";

/** Job data of the `register-identifier` queue. */
export interface IdentifierJob {
  identifier: string;
  /** Re-send the metadata of an identifier already registered (a series after a new version). */
  refresh?: boolean;
}

/**
 * Queues the registration of one minted identifier; pass `tx`, the transaction that minted it, so
 * the job exists exactly when the identifier does. The worker retries with backoff while the
 * agency is down, and registration is idempotent, so queuing the same identifier twice is harmless.
 */
export async function enqueueIdentifierRegistration(
  identifier: string,
  { refresh = false, tx }: { refresh?: boolean; tx?: Transaction } = {},
): Promise<string | null> {
  const boss = await getSender();
  const data: IdentifierJob = refresh ? { identifier, refresh } : { identifier };
  return boss.send("register-identifier", data, { ...retryPolicy, ...(tx ? { db: jobsInTransaction(tx) } : {}) });
}

/** Queues every identifier not yet registered (at start-up: nothing minted is ever left behind). */
export async function enqueuePendingIdentifierRegistrations(): Promise<number> {
  const pending = await listPendingIdentifiers();
  for (const identifier of pending) await enqueueIdentifierRegistration(identifier);
  return pending.length;
}
