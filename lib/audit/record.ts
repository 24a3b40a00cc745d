import "server-only";
import { auditEvents } from "@/db/audit";
import type { Database, Transaction } from "@/db/client";

export interface AuditInput {
  actorId: number | null;
  action: string;
  subjectType: string;
  subjectId: string | number;
  details?: Record<string, unknown>;
}

/** Writes one audit event; pass the transaction of the change it records. */
export async function recordAuditEvent(db: Database | Transaction, input: AuditInput): Promise<void> {
  await db.insert(auditEvents).values({
    actorId: input.actorId,
    action: input.action,
    subjectType: input.subjectType,
    subjectId: String(input.subjectId),
    details: input.details ?? {},
  });
}
