import { index, integer, jsonb, pgTable, primaryKey, smallint, text, timestamp } from "drizzle-orm/pg-core";
import { users } from "./users";

/**
 * Idempotency-Key records of POSTs that create things, per caller: the request's fingerprint and
 * the response to replay. A record is written in the transaction that creates the thing, so it
 * exists exactly when the thing does (never "in flight"). Kept 24 hours.
 */
export const idempotencyKeys = pgTable(
  "idempotency_keys",
  {
    userId: integer()
      .notNull()
      .references(() => users.id, { onDelete: "cascade" }),
    key: text().notNull(),
    /** Method and path the key was first used on, e.g. `POST /api/v1/datasets`. */
    endpoint: text().notNull(),
    /** SHA-256 (hex) of the endpoint and the request body. */
    requestHash: text().notNull(),
    responseStatus: smallint().notNull(),
    responseHeaders: jsonb().$type<Record<string, string>>().notNull(),
    responseBody: text().notNull(),
    createdAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
    expiresAt: timestamp({ withTimezone: true }).notNull(),
  },
  (t) => [primaryKey({ columns: [t.userId, t.key] }), index("idempotency_keys_expires_idx").on(t.expiresAt)],
);
