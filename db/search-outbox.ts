import { bigint, index, integer, pgTable, text, timestamp } from "drizzle-orm/pg-core";
import { datasetVersions } from "./datasets";

/**
 * Changes to searchable versions not yet confirmed by the Meilisearch service: one row per change,
 * written in the transaction of the change (publication, retraction, re-fit), deleted by the
 * search-sync job only after the service reports the write succeeded. A row that could not be
 * delivered waits `next_attempt_at` (doubling back-off) before it is tried again.
 */
export const searchOutbox = pgTable(
  "search_outbox",
  {
    id: bigint({ mode: "number" }).primaryKey().generatedAlwaysAsIdentity(),
    versionId: integer()
      .notNull()
      .references(() => datasetVersions.id, { onDelete: "cascade" }),
    createdAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
    attempts: integer().notNull().default(0),
    nextAttemptAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
    lastError: text(),
  },
  (t) => [index("search_outbox_due_idx").on(t.nextAttemptAt, t.id)],
);
