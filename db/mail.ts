import { index, integer, jsonb, pgTable, text, timestamp } from "drizzle-orm/pg-core";

/** Messages received by the local SMTP capture server (development and tests only). */
export const capturedMail = pgTable(
  "captured_mail",
  {
    id: integer().primaryKey().generatedAlwaysAsIdentity(),
    messageId: text(),
    fromAddress: text().notNull(),
    toAddresses: text().array().notNull(),
    subject: text().notNull(),
    text: text(),
    html: text(),
    headers: jsonb().$type<Record<string, string>>().notNull().default({}),
    receivedAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [index("captured_mail_received_idx").on(t.receivedAt)],
);
