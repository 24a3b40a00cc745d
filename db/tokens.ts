import { index, integer, pgEnum, pgTable, text, timestamp, uniqueIndex } from "drizzle-orm/pg-core";
import { users } from "./users";

export const oneTimePurposeEnum = pgEnum("one_time_purpose", ["verify_email", "reset_password", "unlock_sign_in"]);

/** E-mail verification, password-reset and sign-in-through-a-lock links: only a SHA-256 of the secret is stored. */
export const oneTimeTokens = pgTable(
  "one_time_tokens",
  {
    id: integer().primaryKey().generatedAlwaysAsIdentity(),
    userId: integer()
      .notNull()
      .references(() => users.id, { onDelete: "cascade" }),
    purpose: oneTimePurposeEnum().notNull(),
    tokenHash: text().notNull(),
    expiresAt: timestamp({ withTimezone: true }).notNull(),
    usedAt: timestamp({ withTimezone: true }),
    createdAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [uniqueIndex("one_time_tokens_hash_key").on(t.tokenHash), index("one_time_tokens_user_idx").on(t.userId)],
);

/** Personal API tokens for the REST API: hashed, named, scoped, revocable. */
export const apiTokens = pgTable(
  "api_tokens",
  {
    id: integer().primaryKey().generatedAlwaysAsIdentity(),
    userId: integer()
      .notNull()
      .references(() => users.id, { onDelete: "cascade" }),
    name: text().notNull(),
    tokenHash: text().notNull(),
    /** First characters of the secret, shown in lists so people can tell tokens apart. */
    prefix: text().notNull(),
    scopes: text().array().notNull(),
    lastUsedAt: timestamp({ withTimezone: true }),
    revokedAt: timestamp({ withTimezone: true }),
    createdAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [uniqueIndex("api_tokens_hash_key").on(t.tokenHash), index("api_tokens_user_idx").on(t.userId)],
);

/**
 * One confirmation of a first ORCID sign-up: the ticket it used (so each confirmation page confirms
 * one sign-up) and a hash of the random key left in that browser's cookie. The address of such a
 * sign-up is confirmed only in the browser holding the newest key: someone who typed another
 * person's address cannot have that person's click give them an account under that address.
 */
export const orcidSignUps = pgTable(
  "orcid_sign_ups",
  {
    /** Insertion order under the account's lock: the highest id is the newest confirmation. */
    id: integer().primaryKey().generatedAlwaysAsIdentity(),
    ticketId: text().notNull(),
    userId: integer()
      .notNull()
      .references(() => users.id, { onDelete: "cascade" }),
    browserKeyHash: text().notNull(),
    createdAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [uniqueIndex("orcid_sign_ups_ticket_key").on(t.ticketId), index("orcid_sign_ups_user_idx").on(t.userId, t.id)],
);
