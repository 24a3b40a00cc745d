import "server-only";
import { desc, eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { capturedMail } from "@/db/mail";

export async function listCapturedMail({ limit = 100 }: { limit?: number } = {}) {
  return getDb()
    .select({
      id: capturedMail.id,
      fromAddress: capturedMail.fromAddress,
      toAddresses: capturedMail.toAddresses,
      subject: capturedMail.subject,
      receivedAt: capturedMail.receivedAt,
    })
    .from(capturedMail)
    .orderBy(desc(capturedMail.receivedAt), desc(capturedMail.id))
    .limit(limit);
}

export async function getCapturedMail({ id }: { id: number }) {
  const [row] = await getDb().select().from(capturedMail).where(eq(capturedMail.id, id));
  return row ?? null;
}
