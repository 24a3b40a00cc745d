import { sql } from "drizzle-orm";
import {
  bigint,
  check,
  boolean,
  doublePrecision,
  index,
  integer,
  jsonb,
  pgEnum,
  pgTable,
  primaryKey,
  text,
  timestamp,
  uniqueIndex,
} from "drizzle-orm/pg-core";
import { collectionVersions } from "./collections";
import { recordedAt } from "./recorded-at";
import { reactions } from "./chemistry";
import { users } from "./users";

/** Lifecycle of one version: draft → submitted → in_review → returned → … → published | declined; published → retracted. */
export const versionStateEnum = pgEnum("version_state", [
  "draft",
  "submitted",
  "in_review",
  "returned",
  "published",
  "declined",
  "retracted",
]);
export const coEditorRoleEnum = pgEnum("co_editor_role", ["owner", "editor", "viewer"]);
export const decisionEnum = pgEnum("decision", ["accept", "return", "decline"]);

/** One deposited body of data, all its versions together. */
export const datasets = pgTable(
  "datasets",
  {
    id: integer().primaryKey().generatedAlwaysAsIdentity(),
    ownerId: integer()
      .notNull()
      .references(() => users.id),
    /** DOI-style identifier of all versions; minted with the first publication. */
    seriesIdentifier: text(),
    createdAt: timestamp({ withTimezone: true }).notNull().default(recordedAt),
    updatedAt: timestamp({ withTimezone: true })
      .notNull()
      .defaultNow()
      .$onUpdate(() => new Date()),
  },
  (t) => [index("datasets_owner_idx").on(t.ownerId), uniqueIndex("datasets_series_identifier_key").on(t.seriesIdentifier)],
);

/** People working together on a dataset, with their role on it. */
export const datasetMembers = pgTable(
  "dataset_members",
  {
    datasetId: integer()
      .notNull()
      .references(() => datasets.id, { onDelete: "cascade" }),
    userId: integer()
      .notNull()
      .references(() => users.id, { onDelete: "cascade" }),
    role: coEditorRoleEnum().notNull(),
    addedAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [primaryKey({ columns: [t.datasetId, t.userId] }), index("dataset_members_user_idx").on(t.userId)],
);

/** Invitations to co-edit, sent by e-mail; the link's secret is stored hashed. */
export const datasetInvitations = pgTable(
  "dataset_invitations",
  {
    id: integer().primaryKey().generatedAlwaysAsIdentity(),
    datasetId: integer()
      .notNull()
      .references(() => datasets.id, { onDelete: "cascade" }),
    email: text().notNull(),
    role: coEditorRoleEnum().notNull(),
    tokenHash: text().notNull(),
    invitedBy: integer()
      .notNull()
      .references(() => users.id),
    expiresAt: timestamp({ withTimezone: true }).notNull(),
    acceptedAt: timestamp({ withTimezone: true }),
    createdAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [uniqueIndex("dataset_invitations_hash_key").on(t.tokenHash)],
);

/**
 * One state of a dataset. Drafts change (guarded by `lockVersion` for optimistic locking); from
 * publication on, a trigger refuses every change except retraction.
 */
export const datasetVersions = pgTable(
  "dataset_versions",
  {
    id: integer().primaryKey().generatedAlwaysAsIdentity(),
    datasetId: integer()
      .notNull()
      .references(() => datasets.id, { onDelete: "cascade" }),
    number: integer().notNull(),
    state: versionStateEnum().notNull().default("draft"),
    title: text().notNull(),
    /** The reaction this version's document describes: each version keeps its own, so a new draft never moves a published one. */
    reactionId: integer().references(() => reactions.id),
    /** The deposit document (schemas/deposit.v1.schema.json) as last saved. */
    payload: jsonb().$type<Record<string, unknown>>().notNull(),
    /**
     * The names this version's document gives its species. Public pages show names from published
     * versions only, and they join the species' names at publication: a draft never renames anything.
     */
    participantNames: jsonb().$type<{ speciesId: number; name: string }[]>().notNull().default([]),
    /**
     * The editor's latest document when it is not yet valid (an incomplete draft), with what is
     * missing or wrong. Null when `payload` is the latest. The points, analysis and summary columns
     * always describe the last valid document; a version is submitted only with both null.
     */
    draftDocument: jsonb().$type<Record<string, unknown>>(),
    draftProblems: jsonb().$type<{ pointer: string; message: string }[]>(),
    lockVersion: integer().notNull().default(1),
    /** SHA-256 of the canonical payload, fixed at publication. */
    payloadSha256: text(),
    versionIdentifier: text(),
    /** Highest severity among the stored checks: none, info, warn, error. */
    worstFlag: text(),
    flagCodes: text().array(),
    tMin: doublePrecision(),
    tMax: doublePrecision(),
    pointCount: integer().notNull().default(0),
    createdBy: integer().references(() => users.id),
    submittedAt: timestamp({ withTimezone: true }),
    publishedAt: timestamp({ withTimezone: true }),
    retractedAt: timestamp({ withTimezone: true }),
    retractionNotice: text(),
    createdAt: timestamp({ withTimezone: true }).notNull().default(recordedAt),
    updatedAt: timestamp({ withTimezone: true }).notNull().default(recordedAt),
  },
  (t) => [
    uniqueIndex("dataset_versions_number_key").on(t.datasetId, t.number),
    uniqueIndex("dataset_versions_identifier_key").on(t.versionIdentifier),
    index("dataset_versions_state_idx").on(t.state),
    index("dataset_versions_reaction_idx").on(t.reactionId),
    // The versions that name a species (participant_names @> [{"speciesId": …}]), for its display name.
    index("dataset_versions_participant_names_idx").using("gin", t.participantNames.op("jsonb_path_ops")),
  ],
);

/** The normalised points of a version, in canonical units, with what was deposited. */
export const versionPoints = pgTable(
  "version_points",
  {
    versionId: integer()
      .notNull()
      .references(() => datasetVersions.id, { onDelete: "cascade" }),
    idx: integer().notNull(),
    temperatureK: doublePrecision().notNull(),
    rateConstant: doublePrecision().notNull(),
    sigmaLnK: doublePrecision(),
    pressurePa: doublePrecision(),
    bathGas: text(),
    note: text(),
    original: jsonb().$type<Record<string, unknown>>().notNull(),
  },
  (t) => [primaryKey({ columns: [t.versionId, t.idx] })],
);

/** Fits and flags of one version by one engine version (re-fits add rows; the newest wins). */
export const versionAnalyses = pgTable(
  "version_analyses",
  {
    id: integer().primaryKey().generatedAlwaysAsIdentity(),
    versionId: integer()
      .notNull()
      .references(() => datasetVersions.id, { onDelete: "cascade" }),
    engineVersion: text().notNull(),
    result: jsonb().$type<Record<string, unknown>>(),
    /** Checks outside the kinetics engine: schema, balance, units sanity, duplicates. */
    checks: jsonb().$type<{ code: string; severity: string; message: string }[]>().notNull().default([]),
    error: text(),
    createdAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [index("version_analyses_version_idx").on(t.versionId, t.createdAt)],
);

/** A curator's decision on a submitted version, with its reason. */
export const decisions = pgTable(
  "decisions",
  {
    id: integer().primaryKey().generatedAlwaysAsIdentity(),
    versionId: integer()
      .notNull()
      .references(() => datasetVersions.id, { onDelete: "cascade" }),
    curatorId: integer()
      .notNull()
      .references(() => users.id),
    decision: decisionEnum().notNull(),
    reason: text().notNull(),
    createdAt: timestamp({ withTimezone: true }).notNull().default(recordedAt),
  },
  (t) => [index("decisions_version_idx").on(t.versionId)],
);

/** One point of a submission snapshot: the normalised numbers (canonical units) and what was deposited. */
export interface SnapshotPoint {
  T: number;
  k: number;
  sigmaLnK: number | null;
  pressurePa: number | null;
  bathGas: string | null;
  note: string | null;
  original: Record<string, unknown>;
}

/**
 * Every submission of a version, as it was sent: the document and its points, and the authors'
 * reply when it answers a return. Append-only (drizzle/0018): curators compare submissions with it.
 */
export const submissionSnapshots = pgTable(
  "submission_snapshots",
  {
    id: integer().primaryKey().generatedAlwaysAsIdentity(),
    versionId: integer()
      .notNull()
      .references(() => datasetVersions.id),
    /** 1 for the version's first submission, 2 for the next, … */
    sequence: integer().notNull(),
    submittedBy: integer().references(() => users.id),
    /** The authors' answer to the return this submission follows; null for a first submission. */
    reply: text(),
    payload: jsonb().$type<Record<string, unknown>>().notNull(),
    points: jsonb().$type<SnapshotPoint[]>().notNull(),
    createdAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [uniqueIndex("submission_snapshots_sequence_key").on(t.versionId, t.sequence)],
);

/** Supplementary files of a version; content lives in the storage backend under `storageKey`. */
export const versionFiles = pgTable(
  "version_files",
  {
    id: integer().primaryKey().generatedAlwaysAsIdentity(),
    versionId: integer()
      .notNull()
      .references(() => datasetVersions.id, { onDelete: "cascade" }),
    filename: text().notNull(),
    contentType: text().notNull(),
    sizeBytes: bigint({ mode: "number" }).notNull(),
    sha256: text().notNull(),
    storageKey: text().notNull(),
    createdAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [index("version_files_version_idx").on(t.versionId)],
);

/** Registration of identifiers with the DOI agency; one row per identifier, so retries never mint twice. */
export const identifierRegistrations = pgTable(
  "identifier_registrations",
  {
    identifier: text().primaryKey(),
    kind: text().notNull(), // "version" | "series" | "collection"
    versionId: integer().references(() => datasetVersions.id),
    /** The dataset of a version or series identifier; null for a collection version's. */
    datasetId: integer().references(() => datasets.id),
    /** The collection version a `collection` identifier names. */
    collectionVersionId: integer().references(() => collectionVersions.id),
    registered: boolean().notNull().default(false),
    attempts: integer().notNull().default(0),
    lastError: text(),
    registeredAt: timestamp({ withTimezone: true }),
    createdAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [
    index("identifier_registrations_pending_idx").on(t.registered),
    check("identifier_registrations_one_subject", sql`num_nonnulls(${t.datasetId}, ${t.collectionVersionId}) = 1`),
  ],
);
