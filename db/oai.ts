import { index, integer, pgTable, timestamp } from "drizzle-orm/pg-core";
import { datasetVersions } from "./datasets";

/**
 * The OAI-PMH datestamp of each public version: when its record last changed (OAI-PMH 2.0 §2.7.1).
 * A version's record changes when it is published, when it is retracted, and when a neighbouring
 * version of its dataset is published (its DataCite record gains IsNewVersionOf /
 * IsPreviousVersionOf). Published versions are frozen, so the time lives here. Written only by the
 * trigger of drizzle/0028 on the state change of dataset_versions, in the transaction of the change;
 * the runtime role may only read it (db/privileges.ts).
 */
export const oaiRecordDatestamps = pgTable(
  "oai_record_datestamps",
  {
    versionId: integer()
      .primaryKey()
      .references(() => datasetVersions.id, { onDelete: "cascade" }),
    changedAt: timestamp({ withTimezone: true }).notNull(),
  },
  // Lists run in (datestamp, id) order and page by keyset.
  (t) => [index("oai_record_datestamps_changed_idx").on(t.changedAt, t.versionId)],
);
