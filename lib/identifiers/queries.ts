import "server-only";
import { getVerifiedCreatorIds } from "@/lib/people/queries";
import { and, asc, desc, eq, inArray, isNotNull, sql } from "drizzle-orm";
import { getDb } from "@/db/client";
import { datasets, datasetVersions, identifierRegistrations } from "@/db/datasets";
import { collections, collectionVersions } from "@/db/collections";
import type { VersionState } from "@/lib/curation/lifecycle";

/** What registering one identifier needs to know, read in one go. */
export interface RegistrationSubject {
  identifier: string;
  kind: "version" | "series";
  datasetId: number;
  registered: boolean;
  attempts: number;
  seriesIdentifier: string | null;
  /** The version whose deposit the metadata describes: the version itself, or a series' newest published one. */
  described: {
    id: number;
    number: number;
    title: string;
    payload: Record<string, unknown>;
    publishedAt: Date | null;
    /** Optional so callers that build a subject by hand (tests) need not give them; the query always does. */
    state?: VersionState;
    retractedAt?: Date | null;
    retractionNotice?: string | null;
    /** Position in the document's `creators` → the iD verified on the account linked to that entry (creator_people). */
    verifiedCreatorIds?: ReadonlyMap<number, string>;
  } | null;
  /** Every version of the dataset that has an identifier (published or retracted), oldest first. */
  versions: { id: number; number: number; versionIdentifier: string; state: VersionState; publishedAt: Date | null }[];
}

/** Registration state of one identifier, or null when no such row exists. */
export interface IdentifierRegistrationDto {
  identifier: string;
  kind: string;
  /** Null for a collection version's identifier. */
  datasetId: number | null;
  versionId: number | null;
  collectionVersionId: number | null;
  registered: boolean;
  attempts: number;
  lastError: string | null;
  registeredAt: Date | null;
}

export async function getIdentifierRegistration({ identifier }: { identifier: string }): Promise<IdentifierRegistrationDto | null> {
  const [row] = await getDb()
    .select({
      identifier: identifierRegistrations.identifier,
      kind: identifierRegistrations.kind,
      datasetId: identifierRegistrations.datasetId,
      versionId: identifierRegistrations.versionId,
      collectionVersionId: identifierRegistrations.collectionVersionId,
      registered: identifierRegistrations.registered,
      attempts: identifierRegistrations.attempts,
      lastError: identifierRegistrations.lastError,
      registeredAt: identifierRegistrations.registeredAt,
    })
    .from(identifierRegistrations)
    .where(eq(identifierRegistrations.identifier, identifier));
  return row ?? null;
}

/** A dataset version's or series' registration subject; null for an unknown identifier or a collection's (lib/collections). */
export async function getRegistrationSubject({ identifier }: { identifier: string }): Promise<RegistrationSubject | null> {
  const db = getDb();
  const [reg] = await db
    .select({
      identifier: identifierRegistrations.identifier,
      kind: identifierRegistrations.kind,
      datasetId: identifierRegistrations.datasetId,
      versionId: identifierRegistrations.versionId,
      registered: identifierRegistrations.registered,
      attempts: identifierRegistrations.attempts,
      seriesIdentifier: datasets.seriesIdentifier,
    })
    .from(identifierRegistrations)
    .innerJoin(datasets, eq(datasets.id, identifierRegistrations.datasetId))
    .where(eq(identifierRegistrations.identifier, identifier));
  if (!reg || reg.datasetId === null) return null;
  const datasetId = reg.datasetId;

  const versions = (
    await db
      .select({
        id: datasetVersions.id,
        number: datasetVersions.number,
        versionIdentifier: datasetVersions.versionIdentifier,
        state: datasetVersions.state,
        publishedAt: datasetVersions.publishedAt,
      })
      .from(datasetVersions)
      .where(and(eq(datasetVersions.datasetId, datasetId), isNotNull(datasetVersions.versionIdentifier)))
      .orderBy(asc(datasetVersions.number))
  ).map((v) => ({ ...v, versionIdentifier: v.versionIdentifier! }));

  // A series describes its newest published version; if all are retracted, the newest of those.
  const describedId =
    reg.kind === "version"
      ? reg.versionId
      : ([...versions].reverse().find((v) => v.state === "published") ?? versions[versions.length - 1])?.id;
  const [described] = describedId
    ? await db
        .select({
          id: datasetVersions.id,
          number: datasetVersions.number,
          title: datasetVersions.title,
          payload: datasetVersions.payload,
          publishedAt: datasetVersions.publishedAt,
          state: datasetVersions.state,
          retractedAt: datasetVersions.retractedAt,
          retractionNotice: datasetVersions.retractionNotice,
        })
        .from(datasetVersions)
        .where(eq(datasetVersions.id, describedId))
    : [];

  return {
    identifier: reg.identifier,
    kind: reg.kind === "version" ? "version" : "series",
    datasetId,
    registered: reg.registered,
    attempts: reg.attempts,
    seriesIdentifier: reg.seriesIdentifier,
    described: described
      ? { ...described, verifiedCreatorIds: (await getVerifiedCreatorIds({ versionIds: [described.id] })).get(described.id) }
      : null,
    versions,
  };
}

/** Identifiers not yet registered, versions before series, oldest first. */
export async function listPendingIdentifiers({ datasetId }: { datasetId?: number } = {}): Promise<string[]> {
  const rows = await getDb()
    .select({ identifier: identifierRegistrations.identifier })
    .from(identifierRegistrations)
    .where(
      and(
        eq(identifierRegistrations.registered, false),
        datasetId === undefined ? undefined : eq(identifierRegistrations.datasetId, datasetId),
      ),
    )
    .orderBy(desc(identifierRegistrations.kind), asc(identifierRegistrations.createdAt), asc(identifierRegistrations.identifier));
  return rows.map((r) => r.identifier);
}

/** Identifiers already registered of these datasets (versions and series): their metadata can be sent again. */
export async function listRegisteredIdentifiers({ datasetIds }: { datasetIds: number[] }): Promise<string[]> {
  if (datasetIds.length === 0) return [];
  const rows = await getDb()
    .select({ identifier: identifierRegistrations.identifier })
    .from(identifierRegistrations)
    .where(and(eq(identifierRegistrations.registered, true), inArray(identifierRegistrations.datasetId, datasetIds)))
    .orderBy(desc(identifierRegistrations.kind), asc(identifierRegistrations.identifier));
  return rows.map((r) => r.identifier);
}

/** Marks one accepted registration (or metadata update): counts the attempt, clears the last error. */
export async function recordRegistrationSuccess({ identifier }: { identifier: string }): Promise<void> {
  await getDb()
    .update(identifierRegistrations)
    .set({
      registered: true,
      registeredAt: sql`coalesce(${identifierRegistrations.registeredAt}, now())`,
      attempts: sql`${identifierRegistrations.attempts} + 1`,
      lastError: null,
    })
    .where(eq(identifierRegistrations.identifier, identifier));
}

/** Counts one failed attempt and keeps its message (first 2 000 characters) for admins. */
export async function recordRegistrationFailure({ identifier, error }: { identifier: string; error: string }): Promise<void> {
  await getDb()
    .update(identifierRegistrations)
    .set({ attempts: sql`${identifierRegistrations.attempts} + 1`, lastError: error.slice(0, 2000) })
    .where(eq(identifierRegistrations.identifier, identifier));
}

/** Where a minted identifier leads: a public version, or a series (its newest public version). */
export type ResolvedIdentifier =
  | { kind: "version"; identifier: string; datasetId: number; versionNumber: number; state: VersionState }
  | { kind: "series"; identifier: string; datasetId: number }
  | { kind: "collection_version"; identifier: string; collectionId: number; versionNumber: number }
  | { kind: "collection"; identifier: string; collectionId: number };

/** Looks up an identifier exactly as minted (either scheme); drafts and declined versions never have one. */
export async function resolveIdentifier({ identifier }: { identifier: string }): Promise<ResolvedIdentifier | null> {
  const db = getDb();
  const [version] = await db
    .select({ datasetId: datasetVersions.datasetId, number: datasetVersions.number, state: datasetVersions.state })
    .from(datasetVersions)
    .where(eq(datasetVersions.versionIdentifier, identifier));
  if (version) return { kind: "version", identifier, datasetId: version.datasetId, versionNumber: version.number, state: version.state };
  const [series] = await db.select({ id: datasets.id }).from(datasets).where(eq(datasets.seriesIdentifier, identifier));
  if (series) return { kind: "series", identifier, datasetId: series.id };
  // A collection's identifiers come from the same minting (lib/collections/queries.ts publishCollection).
  const [collectionVersion] = await db
    .select({ collectionId: collectionVersions.collectionId, number: collectionVersions.number })
    .from(collectionVersions)
    .where(and(eq(collectionVersions.versionIdentifier, identifier), eq(collectionVersions.state, "published")));
  if (collectionVersion)
    return {
      kind: "collection_version",
      identifier,
      collectionId: collectionVersion.collectionId,
      versionNumber: collectionVersion.number,
    };
  const [collection] = await db.select({ id: collections.id }).from(collections).where(eq(collections.seriesIdentifier, identifier));
  return collection ? { kind: "collection", identifier, collectionId: collection.id } : null;
}
