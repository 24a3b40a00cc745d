import { sql } from "drizzle-orm";
import { index, integer, pgEnum, pgTable, text, timestamp, uniqueIndex } from "drizzle-orm/pg-core";

export const roleEnum = pgEnum("role", ["researcher", "curator", "admin"]);

/** People who sign in. E-mail is stored lower-cased; uniqueness is on that form. */
export const users = pgTable(
  "users",
  {
    id: integer().primaryKey().generatedAlwaysAsIdentity(),
    email: text().notNull(),
    name: text().notNull(),
    affiliation: text(),
    orcid: text(),
    passwordHash: text().notNull(),
    role: roleEnum().notNull().default("researcher"),
    emailVerifiedAt: timestamp({ withTimezone: true }),
    deactivatedAt: timestamp({ withTimezone: true }),
    /** Stamped into every session at sign-in; bumping it ends every session of this person. */
    sessionGeneration: integer().notNull().default(0),
    createdAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
    updatedAt: timestamp({ withTimezone: true })
      .notNull()
      .defaultNow()
      .$onUpdate(() => new Date()),
  },
  (t) => [uniqueIndex("users_email_key").on(sql`lower(${t.email})`), index("users_role_idx").on(t.role)],
);

export type Role = (typeof roleEnum.enumValues)[number];
