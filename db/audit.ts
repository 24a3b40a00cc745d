import { index, integer, jsonb, pgTable, text, timestamp } from "drizzle-orm/pg-core";
import { recordedAt } from "./recorded-at";
import { users } from "./users";

/** Append-only record of who did what to which subject. */
export const auditEvents = pgTable(
  "audit_events",
  {
    id: integer().primaryKey().generatedAlwaysAsIdentity(),
    actorId: integer().references(() => users.id, { onDelete: "set null" }),
    action: text().notNull(),
    subjectType: text().notNull(),
    subjectId: text().notNull(),
    details: jsonb().$type<Record<string, unknown>>().notNull().default({}),
    at: timestamp({ withTimezone: true }).notNull().default(recordedAt),
  },
  (t) => [index("audit_events_subject_idx").on(t.subjectType, t.subjectId), index("audit_events_at_idx").on(t.at)],
);
