import { check, integer, pgTable, text, timestamp } from "drizzle-orm/pg-core";
import { sql } from "drizzle-orm";
import { datasetVersions } from "./datasets";
import { users } from "./users";

/**
 * A curator's judgement that one published version stays out of its reaction's consensus, with the
 * reason shown to readers. It lives beside the version, never in it: the deposit and the frozen
 * version are untouched, and removing the row includes the version again (both audited).
 */
export const consensusExclusions = pgTable(
  "consensus_exclusions",
  {
    versionId: integer()
      .primaryKey()
      .references(() => datasetVersions.id, { onDelete: "cascade" }),
    reason: text().notNull(),
    excludedBy: integer()
      .notNull()
      .references(() => users.id),
    excludedAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [check("consensus_exclusions_reason_length", sql`char_length(${t.reason}) between 3 and 1000`)],
);
