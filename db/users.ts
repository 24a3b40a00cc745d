import { sql } from "drizzle-orm";
import { boolean, index, integer, pgEnum, pgTable, text, timestamp, uniqueIndex } from "drizzle-orm/pg-core";

export const roleEnum = pgEnum("role", ["researcher", "curator", "admin"]);

/** People who sign in. E-mail is stored lower-cased; uniqueness is on that form. */
export const users = pgTable(
  "users",
  {
    id: integer().primaryKey().generatedAlwaysAsIdentity(),
    email: text().notNull(),
    name: text().notNull(),
    affiliation: text(),
    /** The ORCID iD the person typed in: shown as "not verified". */
    orcid: text(),
    /** The ORCID iD proven by signing in at the ORCID provider: at most one account per iD. */
    verifiedOrcid: text(),
    orcidLinkedAt: timestamp({ withTimezone: true }),
    /** False for an account made through ORCID until its holder chooses a password (the hash is then unusable). */
    passwordSet: boolean().notNull().default(true),
    /** Whether the public profile appears in the /people list (the page itself is public either way). */
    profileListed: boolean().notNull().default(true),
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
  (t) => [
    uniqueIndex("users_email_key").on(sql`lower(${t.email})`),
    index("users_role_idx").on(t.role),
    uniqueIndex("users_verified_orcid_key").on(t.verifiedOrcid),
  ],
);

export type Role = (typeof roleEnum.enumValues)[number];
