import type { Transaction } from "@/db/client";
import { getSender, jobsInTransaction, retryPolicy } from "@/lib/jobs/boss";
import type { MailMessage } from "./templates";

/**
 * Queues a message; the worker delivers it with retries and backoff, so a relay that is down
 * delays mail and loses none. Pass `tx` to queue it inside the transaction of the change it
 * reports: it is then sent only if that change commits.
 */
export async function enqueueMail(message: MailMessage, { tx }: { tx?: Transaction } = {}): Promise<string | null> {
  const boss = await getSender();
  return boss.send("mail", message, { ...retryPolicy, ...(tx ? { db: jobsInTransaction(tx) } : {}) });
}
