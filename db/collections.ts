import { sql } from "drizzle-orm";
import { check, index, integer, pgEnum, pgTable, primaryKey, text, timestamp, uniqueIndex } from "drizzle-orm/pg-core";
import { datasetVersions } from "./datasets";
import { recordedAt } from "./recorded-at";
import { users } from "./users";

/** A collection version is a draft (its owner's alone) or published (frozen, with its own identifier). */
export const collectionVersionStateEnum = pgEnum("collection_version_state", ["draft", "published"]);

/** A person's chosen set of dataset versions, all its versions together. */
export const collections = pgTable(
  "collections",
  {
    id: integer().primaryKey().generatedAlwaysAsIdentity(),
    ownerId: integer()
      .notNull()
      .references(() => users.id),
    /** The identifier of every version of the collection; minted with its first publication, never changed. */
    seriesIdentifier: text(),
    createdAt: timestamp({ withTimezone: true }).notNull().default(recordedAt),
  },
  (t) => [index("collections_owner_idx").on(t.ownerId), uniqueIndex("collections_series_identifier_key").on(t.seriesIdentifier)],
);

/** One state of a collection: its title, description and members. Frozen from publication on (drizzle/0035). */
export const collectionVersions = pgTable(
  "collection_versions",
  {
    id: integer().primaryKey().generatedAlwaysAsIdentity(),
    collectionId: integer()
      .notNull()
      .references(() => collections.id),
    number: integer().notNull(),
    state: collectionVersionStateEnum().notNull().default("draft"),
    title: text().notNull(),
    description: text().notNull().default(""),
    versionIdentifier: text(),
    publishedAt: timestamp({ withTimezone: true }),
    createdBy: integer().references(() => users.id),
    createdAt: timestamp({ withTimezone: true }).notNull().default(recordedAt),
    updatedAt: timestamp({ withTimezone: true }).notNull().default(recordedAt),
  },
  (t) => [
    uniqueIndex("collection_versions_number_key").on(t.collectionId, t.number),
    uniqueIndex("collection_versions_identifier_key").on(t.versionIdentifier),
    // At most one draft per collection: a new revision is made from the latest published version.
    uniqueIndex("collection_versions_one_draft_key")
      .on(t.collectionId)
      .where(sql`${t.state} = 'draft'`),
    index("collection_versions_state_idx").on(t.state),
  ],
);

/** One dataset version in one collection version, with the owner's note ("used for R12"). */
export const collectionMembers = pgTable(
  "collection_members",
  {
    collectionVersionId: integer()
      .notNull()
      .references(() => collectionVersions.id),
    versionId: integer()
      .notNull()
      .references(() => datasetVersions.id),
    /** Order on the page and in the exports: as added. */
    position: integer().notNull(),
    note: text(),
    addedAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [
    primaryKey({ columns: [t.collectionVersionId, t.versionId] }),
    index("collection_members_version_idx").on(t.versionId),
    check("collection_members_note_length", sql`${t.note} is null or char_length(${t.note}) <= 500`),
  ],
);
