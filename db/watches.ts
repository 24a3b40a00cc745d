import { sql } from "drizzle-orm";
import { boolean, check, index, integer, jsonb, pgTable, text, timestamp, uniqueIndex } from "drizzle-orm/pg-core";
import { collections } from "./collections";
import { reactions, species } from "./chemistry";
import { datasets, datasetVersions } from "./datasets";
import { users } from "./users";

/**
 * What a person watches: one reaction, one species, one dataset or one collection (exactly one of them). A
 * watch says "tell me when a version of this is published or retracted, or its re-fit changes
 * its flags"; lib/watches/notify.ts turns those events into mail.
 */
export const watches = pgTable(
  "watches",
  {
    id: integer().primaryKey().generatedAlwaysAsIdentity(),
    userId: integer()
      .notNull()
      .references(() => users.id, { onDelete: "cascade" }),
    reactionId: integer().references(() => reactions.id, { onDelete: "cascade" }),
    speciesId: integer().references(() => species.id, { onDelete: "cascade" }),
    datasetId: integer().references(() => datasets.id, { onDelete: "cascade" }),
    /** A collection: told when one of its member versions is retracted or superseded by a newer version. */
    collectionId: integer().references(() => collections.id, { onDelete: "cascade" }),
    createdAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [
    check("watches_one_subject", sql`num_nonnulls(${t.reactionId}, ${t.speciesId}, ${t.datasetId}, ${t.collectionId}) = 1`),
    uniqueIndex("watches_user_reaction_key").on(t.userId, t.reactionId),
    uniqueIndex("watches_user_species_key").on(t.userId, t.speciesId),
    uniqueIndex("watches_user_dataset_key").on(t.userId, t.datasetId),
    uniqueIndex("watches_user_collection_key").on(t.userId, t.collectionId),
    index("watches_reaction_idx").on(t.reactionId),
    index("watches_species_idx").on(t.speciesId),
    index("watches_dataset_idx").on(t.datasetId),
    index("watches_collection_idx").on(t.collectionId),
  ],
);

/** How a person wants to hear of what they watch: a mail per event (default) or one daily digest. */
export const watchSettings = pgTable("watch_settings", {
  userId: integer()
    .primaryKey()
    .references(() => users.id, { onDelete: "cascade" }),
  dailyDigest: boolean().notNull().default(false),
  updatedAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
});

/**
 * One event told (or to be told) to one person: unique per person, version and event, so a job
 * run twice never mails twice. `mailedAt` null: waiting for the daily digest.
 */
export const watchNotices = pgTable(
  "watch_notices",
  {
    id: integer().primaryKey().generatedAlwaysAsIdentity(),
    userId: integer()
      .notNull()
      .references(() => users.id, { onDelete: "cascade" }),
    versionId: integer()
      .notNull()
      .references(() => datasetVersions.id, { onDelete: "cascade" }),
    /** published | retracted | flags_changed | superseded (a collection's member), with the time of the event (a re-fit can change flags more than once). */
    event: text().notNull(),
    eventAt: timestamp({ withTimezone: true }).notNull(),
    /** The watches that made it this person's news: [{ watchId, label }]. */
    reasons: jsonb().$type<{ watchId: number; label: string }[]>().notNull(),
    createdAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
    mailedAt: timestamp({ withTimezone: true }),
  },
  (t) => [
    uniqueIndex("watch_notices_once_key").on(t.userId, t.versionId, t.event, t.eventAt),
    index("watch_notices_waiting_idx")
      .on(t.userId)
      .where(sql`${t.mailedAt} is null`),
  ],
);
