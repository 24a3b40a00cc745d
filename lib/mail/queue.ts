import { getSender, retryPolicy } from "@/lib/jobs/boss";
import type { MailMessage } from "./templates";

/**
 * Queues a message; the worker delivers it with retries and backoff, so a relay that is down
 * delays mail and loses none.
 */
export async function enqueueMail(message: MailMessage): Promise<string | null> {
  const boss = await getSender();
  return boss.send("mail", message, retryPolicy);
}
