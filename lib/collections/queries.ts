import "server-only";
// Collections: a person's chosen set of published dataset versions, citable once published. Every
// change is one transaction that locks the collection, checks its owner and draft, writes an audit
// event, and leaves nothing half-stored; drizzle/0035's triggers refuse any change to a published
// collection version whatever the caller.
import { and, asc, desc, eq, sql } from "drizzle-orm";
import { getDb, type Transaction } from "@/db/client";
import { collectionMembers, collections, collectionVersions } from "@/db/collections";
import { identifierRegistrations } from "@/db/datasets";
import { watches } from "@/db/watches";
import { recordAuditEvent } from "@/lib/audit/record";
import { AppError, type FieldError } from "@/lib/errors";
import type { CollectionDoiInput } from "@/lib/identifiers/datacite";
import { doiPrefix } from "@/lib/identifiers/mint";
import { enqueueIdentifierRegistration } from "@/lib/identifiers/queue";
import { newSeriesIdentifier, versionIdentifierOf } from "@/lib/identifiers/series-code";
import { reactionDisplayEquation } from "@/lib/reactions/display-names";
import { COLLECTION_LIMITS, type MemberInput } from "./schemas";

export type CollectionVersionState = "draft" | "published";

/** One version of a collection, without its members. */
export interface CollectionVersionDto {
  id: number;
  number: number;
  state: CollectionVersionState;
  title: string;
  description: string;
  versionIdentifier: string | null;
  publishedAt: Date | null;
  memberCount: number;
}

/** A collection with every version (newest first) its reader may see. */
export interface CollectionDto {
  id: number;
  ownerId: number;
  ownerName: string;
  ownerOrcid: string | null;
  seriesIdentifier: string | null;
  versions: CollectionVersionDto[];
}

/** One member as pages and exports show it. */
export interface CollectionMemberDto {
  versionId: number;
  datasetId: number;
  number: number;
  title: string;
  equation: string;
  reactionKey: string | null;
  state: string;
  versionIdentifier: string | null;
  retractionNotice: string | null;
  /** The dataset's newest published version when it is newer than this member. */
  newer: { number: number; versionIdentifier: string | null } | null;
  note: string | null;
  position: number;
}

const STATE_WORDS: Record<string, string> = {
  draft: "a draft",
  submitted: "submitted for review",
  in_review: "in review",
  returned: "returned to its authors",
  declined: "declined",
};

async function lockCollection(tx: Transaction, collectionId: number) {
  const [row] = await tx.execute<{ id: number; owner_id: number; series_identifier: string | null }>(
    sql`select id, owner_id, series_identifier from collections where id = ${collectionId} for update`,
  );
  return row ? { id: Number(row.id), ownerId: Number(row.owner_id), seriesIdentifier: row.series_identifier } : null;
}

/**
 * The collection for a change by `actorId`: locked, and theirs. Someone else's collection is "not
 * found" while it has no published version (a draft is private), then "forbidden".
 */
async function ownedCollectionOrThrow(tx: Transaction, collectionId: number, actorId: number) {
  const found = await lockCollection(tx, collectionId);
  if (!found) throw new AppError("not_found", `No collection ${collectionId}`);
  if (found.ownerId !== actorId) {
    if (found.seriesIdentifier === null) throw new AppError("not_found", `No collection ${collectionId}`);
    throw new AppError("forbidden", `Collection ${collectionId} is not yours: only its owner changes it`);
  }
  return found;
}

/** The draft to change, or a 409 saying the latest version is published and how to go on. */
async function draftOrThrow(tx: Transaction, collectionId: number) {
  const [latest] = await tx
    .select({ id: collectionVersions.id, number: collectionVersions.number, state: collectionVersions.state })
    .from(collectionVersions)
    .where(eq(collectionVersions.collectionId, collectionId))
    .orderBy(desc(collectionVersions.number))
    .limit(1);
  if (!latest) throw new AppError("not_found", `No collection ${collectionId}`);
  if (latest.state !== "draft")
    throw new AppError(
      "conflict",
      `Version ${latest.number} of collection ${collectionId} is published and cannot change; start a new revision (POST /api/v1/collections/${collectionId}/revisions) and edit that`,
    );
  return latest;
}

/**
 * Checks members before any is written: each must be a published dataset version. A draft or
 * retracted version is refused naming it; someone else's unpublished version is "not a published
 * version" (its existence is not revealed). Every problem is listed with its JSON pointer.
 */
async function checkMembersOrThrow(tx: Transaction, members: MemberInput[], actorId: number, base = "/members"): Promise<void> {
  if (members.length === 0) return;
  const ids = [...new Set(members.map((m) => m.versionId))];
  const rows = await tx.execute<{ id: number; state: string; title: string; number: number; mine: boolean }>(sql`
    select v.id, v.state::text as state, v.title, v.number,
      exists (select 1 from dataset_members dm where dm.dataset_id = v.dataset_id and dm.user_id = ${actorId}) as mine
    from dataset_versions v where v.id = any(${`{${ids.join(",")}}`}::int[])`);
  const byId = new Map(rows.map((r) => [Number(r.id), r]));
  const errors: FieldError[] = [];
  members.forEach((m, i) => {
    const v = byId.get(m.versionId);
    const pointer = `${base}/${i}/versionId`;
    if (!v || (v.state !== "published" && v.state !== "retracted" && !v.mine)) {
      errors.push({
        pointer,
        message: `Version ${m.versionId} is not a published version: only published versions can join a collection`,
        value: m.versionId,
      });
    } else if (v.state === "retracted") {
      errors.push({
        pointer,
        message: `Version ${m.versionId} (“${v.title}”, version ${v.number}) was retracted and cannot join a collection`,
        value: m.versionId,
      });
    } else if (v.state !== "published") {
      errors.push({
        pointer,
        message: `Version ${m.versionId} (“${v.title}”, version ${v.number}) is ${STATE_WORDS[v.state] ?? v.state}: only published versions can join a collection`,
        value: m.versionId,
      });
    }
  });
  if (errors.length) throw new AppError("validation_failed", errors[0].message, errors);
}

/** Adds checked members to a draft (a member already there keeps its place; a new note replaces its note). */
/** Writes members into a draft; a version already in it keeps its place, and its note unless a note is given. How many were new. */
async function writeMembers(tx: Transaction, collectionVersionId: number, members: MemberInput[]): Promise<{ added: number }> {
  if (members.length === 0) return { added: 0 };
  const [{ count, top }] = await tx.execute<{ count: number; top: number }>(
    sql`select count(*)::int as count, coalesce(max(position), 0)::int as top from collection_members where collection_version_id = ${collectionVersionId}`,
  );
  const fresh = new Map<number, MemberInput>();
  for (const m of members) fresh.set(m.versionId, m);
  const existing = new Set(
    (
      await tx
        .select({ versionId: collectionMembers.versionId })
        .from(collectionMembers)
        .where(eq(collectionMembers.collectionVersionId, collectionVersionId))
    ).map((r) => r.versionId),
  );
  const added = [...fresh.values()].filter((m) => !existing.has(m.versionId));
  if (Number(count) + added.length > COLLECTION_LIMITS.members)
    throw new AppError("validation_failed", `A collection holds at most ${COLLECTION_LIMITS.members} versions`, [
      { pointer: "/members", message: `A collection holds at most ${COLLECTION_LIMITS.members} versions` },
    ]);
  let position = Number(top);
  for (const m of fresh.values()) {
    if (existing.has(m.versionId)) {
      if (m.note !== undefined)
        await tx
          .update(collectionMembers)
          .set({ note: m.note })
          .where(and(eq(collectionMembers.collectionVersionId, collectionVersionId), eq(collectionMembers.versionId, m.versionId)));
      continue;
    }
    position += 1;
    await tx.insert(collectionMembers).values({ collectionVersionId, versionId: m.versionId, note: m.note ?? null, position });
  }
  await tx
    .update(collectionVersions)
    .set({ updatedAt: sql`now()` })
    .where(eq(collectionVersions.id, collectionVersionId));
  return { added: added.length };
}

/**
 * A new collection: a draft of its first version, with its first members if given, and a watch of
 * it for its owner (so the owner hears when a member is retracted or superseded, and can stop that
 * from the mail's link like any watch).
 */
export async function createCollection({
  ownerId,
  title,
  description,
  members,
}: {
  ownerId: number;
  title: string;
  description: string;
  members: MemberInput[];
}): Promise<{ id: number; number: number }> {
  return getDb().transaction(async (tx) => {
    await checkMembersOrThrow(tx, members, ownerId);
    const [c] = await tx.insert(collections).values({ ownerId }).returning({ id: collections.id });
    const [v] = await tx
      .insert(collectionVersions)
      .values({ collectionId: c.id, number: 1, title, description, createdBy: ownerId })
      .returning({ id: collectionVersions.id });
    await writeMembers(tx, v.id, members);
    await tx.insert(watches).values({ userId: ownerId, collectionId: c.id }).onConflictDoNothing();
    await recordAuditEvent(tx, {
      actorId: ownerId,
      action: "collection.create",
      subjectType: "collection",
      subjectId: c.id,
      details: { members: members.length },
    });
    return { id: c.id, number: 1 };
  });
}

/** Changes the draft's title or description. */
export async function updateCollectionDraft({
  collectionId,
  actorId,
  title,
  description,
}: {
  collectionId: number;
  actorId: number;
  title?: string;
  description?: string;
}): Promise<void> {
  await getDb().transaction(async (tx) => {
    await ownedCollectionOrThrow(tx, collectionId, actorId);
    const draft = await draftOrThrow(tx, collectionId);
    await tx
      .update(collectionVersions)
      .set({ ...(title !== undefined ? { title } : {}), ...(description !== undefined ? { description } : {}), updatedAt: sql`now()` })
      .where(eq(collectionVersions.id, draft.id));
    await recordAuditEvent(tx, {
      actorId,
      action: "collection.edit",
      subjectType: "collection",
      subjectId: collectionId,
      details: {
        number: draft.number,
        fields: [title !== undefined && "title", description !== undefined && "description"].filter(Boolean),
      },
    });
  });
}

/** Adds members to the draft (all or none). */
export async function addCollectionMembers({
  collectionId,
  actorId,
  members,
}: {
  collectionId: number;
  actorId: number;
  members: MemberInput[];
}): Promise<{ number: number; memberCount: number; added: number }> {
  return getDb().transaction(async (tx) => {
    await ownedCollectionOrThrow(tx, collectionId, actorId);
    const draft = await draftOrThrow(tx, collectionId);
    await checkMembersOrThrow(tx, members, actorId);
    const { added } = await writeMembers(tx, draft.id, members);
    await recordAuditEvent(tx, {
      actorId,
      action: "collection.add",
      subjectType: "collection",
      subjectId: collectionId,
      details: { number: draft.number, versionIds: members.map((m) => m.versionId) },
    });
    const [{ n }] = await tx.execute<{ n: number }>(
      sql`select count(*)::int as n from collection_members where collection_version_id = ${draft.id}`,
    );
    return { number: draft.number, memberCount: Number(n), added };
  });
}

/** Sets (or, with null, clears) the note of one member of the draft; a 404 naming it when it is not there. */
export async function setCollectionMemberNote({
  collectionId,
  actorId,
  versionId,
  note,
}: {
  collectionId: number;
  actorId: number;
  versionId: number;
  note: string | null;
}): Promise<void> {
  await getDb().transaction(async (tx) => {
    await ownedCollectionOrThrow(tx, collectionId, actorId);
    const draft = await draftOrThrow(tx, collectionId);
    const changed = await tx
      .update(collectionMembers)
      .set({ note })
      .where(and(eq(collectionMembers.collectionVersionId, draft.id), eq(collectionMembers.versionId, versionId)))
      .returning({ versionId: collectionMembers.versionId });
    if (!changed.length) throw new AppError("not_found", `Version ${versionId} is not in this collection's draft`);
    await recordAuditEvent(tx, {
      actorId,
      action: "collection.note",
      subjectType: "collection",
      subjectId: collectionId,
      details: { number: draft.number, versionId },
    });
  });
}

/** Takes one member out of the draft; a 404 naming it when it is not there. */
export async function removeCollectionMember({
  collectionId,
  actorId,
  versionId,
}: {
  collectionId: number;
  actorId: number;
  versionId: number;
}): Promise<void> {
  await getDb().transaction(async (tx) => {
    await ownedCollectionOrThrow(tx, collectionId, actorId);
    const draft = await draftOrThrow(tx, collectionId);
    const gone = await tx
      .delete(collectionMembers)
      .where(and(eq(collectionMembers.collectionVersionId, draft.id), eq(collectionMembers.versionId, versionId)))
      .returning({ versionId: collectionMembers.versionId });
    if (gone.length === 0)
      throw new AppError("not_found", `Version ${versionId} is not a member of the draft of collection ${collectionId}`);
    await recordAuditEvent(tx, {
      actorId,
      action: "collection.remove",
      subjectType: "collection",
      subjectId: collectionId,
      details: { number: draft.number, versionId },
    });
  });
}

/**
 * Publishes the draft: every member must still be published (one retracted since it was added is
 * named), the collection's series identifier is minted on its first publication, the version gets
 * `<series>/<n>`, and its registration is queued in this transaction through the same queue as
 * dataset versions (the previous version's metadata is re-sent: it gains IsPreviousVersionOf).
 */
export async function publishCollection({
  collectionId,
  actorId,
}: {
  collectionId: number;
  actorId: number;
}): Promise<{ number: number; versionIdentifier: string }> {
  return getDb().transaction(async (tx) => {
    const collection = await ownedCollectionOrThrow(tx, collectionId, actorId);
    const draft = await draftOrThrow(tx, collectionId);
    const members = await tx.execute<{ version_id: number; state: string; title: string; number: number }>(sql`
      select m.version_id, v.state::text as state, v.title, v.number from collection_members m
      join dataset_versions v on v.id = m.version_id where m.collection_version_id = ${draft.id} order by m.position`);
    if (members.length === 0)
      throw new AppError("validation_failed", "A collection needs at least one member before it is published", [
        { pointer: "/members", message: "Add at least one published dataset version before publishing" },
      ]);
    const stale: FieldError[] = members.flatMap((m, i) =>
      m.state === "published"
        ? []
        : [
            {
              pointer: `/members/${i}/versionId`,
              message: `Member version ${m.version_id} (“${m.title}”, version ${m.number}) is ${m.state === "retracted" ? "retracted" : "no longer published"}: remove it before publishing`,
              value: Number(m.version_id),
            },
          ],
    );
    if (stale.length) throw new AppError("validation_failed", stale[0].message, stale);

    let series = collection.seriesIdentifier;
    if (!series) {
      // A fresh random code; drawn again in the unlikely case it is taken by a collection or a dataset.
      for (let attempt = 0; attempt < 5 && !series; attempt++) {
        const candidate = newSeriesIdentifier(doiPrefix());
        const [taken] = await tx.execute(
          sql`select 1 from collections where series_identifier = ${candidate} union all select 1 from datasets where series_identifier = ${candidate}`,
        );
        if (!taken) series = candidate;
      }
      if (!series) throw new Error("could not draw a free series identifier");
      await tx.update(collections).set({ seriesIdentifier: series }).where(eq(collections.id, collectionId));
    }
    const versionIdentifier = versionIdentifierOf(series, draft.number);
    await tx
      .update(collectionVersions)
      .set({ state: "published", versionIdentifier, publishedAt: sql`now()`, updatedAt: sql`now()` })
      .where(eq(collectionVersions.id, draft.id));
    await tx.insert(identifierRegistrations).values({ identifier: versionIdentifier, kind: "collection", collectionVersionId: draft.id });
    await recordAuditEvent(tx, {
      actorId,
      action: "collection.publish",
      subjectType: "collection",
      subjectId: collectionId,
      details: { number: draft.number, identifier: versionIdentifier, members: members.length },
    });
    await enqueueIdentifierRegistration(versionIdentifier, { tx });
    const [previous] = await tx
      .select({ versionIdentifier: collectionVersions.versionIdentifier })
      .from(collectionVersions)
      .where(
        and(
          eq(collectionVersions.collectionId, collectionId),
          eq(collectionVersions.state, "published"),
          sql`${collectionVersions.number} < ${draft.number}`,
        ),
      )
      .orderBy(desc(collectionVersions.number))
      .limit(1);
    if (previous?.versionIdentifier) await enqueueIdentifierRegistration(previous.versionIdentifier, { refresh: true, tx });
    return { number: draft.number, versionIdentifier };
  });
}

/**
 * A new revision: a draft copied from the latest published version (title, description, members
 * and notes). Members retracted since are left out and named in the answer; the old version stays
 * as it was, at its own address and identifier.
 */
export async function startCollectionRevision({
  collectionId,
  actorId,
}: {
  collectionId: number;
  actorId: number;
}): Promise<{ number: number; leftOut: { versionId: number; reason: string }[] }> {
  return getDb().transaction(async (tx) => {
    await ownedCollectionOrThrow(tx, collectionId, actorId);
    const [latest] = await tx
      .select()
      .from(collectionVersions)
      .where(eq(collectionVersions.collectionId, collectionId))
      .orderBy(desc(collectionVersions.number))
      .limit(1);
    if (!latest) throw new AppError("not_found", `No collection ${collectionId}`);
    if (latest.state === "draft")
      throw new AppError(
        "conflict",
        `Collection ${collectionId} already has a draft (version ${latest.number}): edit and publish that one`,
      );
    const [draft] = await tx
      .insert(collectionVersions)
      .values({ collectionId, number: latest.number + 1, title: latest.title, description: latest.description, createdBy: actorId })
      .returning({ id: collectionVersions.id, number: collectionVersions.number });
    const members = await tx.execute<{ version_id: number; note: string | null; state: string; retraction_notice: string | null }>(sql`
      select m.version_id, m.note, v.state::text as state, v.retraction_notice from collection_members m
      join dataset_versions v on v.id = m.version_id where m.collection_version_id = ${latest.id} order by m.position`);
    const kept = members.filter((m) => m.state === "published");
    await writeMembers(
      tx,
      draft.id,
      kept.map((m) => ({ versionId: Number(m.version_id), note: m.note })),
    );
    const leftOut = members
      .filter((m) => m.state !== "published")
      .map((m) => ({
        versionId: Number(m.version_id),
        reason: `retracted${m.retraction_notice ? `: ${m.retraction_notice}` : ""}`,
      }));
    await recordAuditEvent(tx, {
      actorId,
      action: "collection.revise",
      subjectType: "collection",
      subjectId: collectionId,
      details: { number: draft.number, leftOut: leftOut.map((l) => l.versionId) },
    });
    return { number: draft.number, leftOut };
  });
}

/** Deletes a collection that was never published (its draft and members with it). */
export async function deleteCollectionDraft({ collectionId, actorId }: { collectionId: number; actorId: number }): Promise<void> {
  await getDb().transaction(async (tx) => {
    const found = await ownedCollectionOrThrow(tx, collectionId, actorId);
    if (found.seriesIdentifier !== null)
      throw new AppError(
        "conflict",
        `Collection ${collectionId} has a published version and is never deleted; its draft can be emptied instead`,
      );
    const versions = await tx
      .select({ id: collectionVersions.id })
      .from(collectionVersions)
      .where(eq(collectionVersions.collectionId, collectionId));
    for (const v of versions) await tx.delete(collectionMembers).where(eq(collectionMembers.collectionVersionId, v.id));
    await tx.delete(collectionVersions).where(eq(collectionVersions.collectionId, collectionId));
    await tx.delete(watches).where(eq(watches.collectionId, collectionId));
    await tx.delete(collections).where(eq(collections.id, collectionId));
    await recordAuditEvent(tx, { actorId, action: "collection.delete", subjectType: "collection", subjectId: collectionId });
  });
}

// ---- reads ----

/**
 * A collection as `viewerId` may see it: its published versions for anyone, the draft too for its
 * owner. Null when there is nothing the viewer may see (a draft-only collection of someone else).
 */
export async function getCollection({
  collectionId,
  viewerId,
}: {
  collectionId: number;
  viewerId: number | null;
}): Promise<CollectionDto | null> {
  const db = getDb();
  const [c] = await db.execute<{
    id: number;
    owner_id: number;
    name: string;
    verified_orcid: string | null;
    series_identifier: string | null;
  }>(sql`
    select c.id, c.owner_id, u.name, u.verified_orcid, c.series_identifier from collections c join users u on u.id = c.owner_id
    where c.id = ${collectionId}`);
  if (!c) return null;
  const owner = viewerId !== null && Number(c.owner_id) === viewerId;
  const versions = await db
    .select({
      id: collectionVersions.id,
      number: collectionVersions.number,
      state: collectionVersions.state,
      title: collectionVersions.title,
      description: collectionVersions.description,
      versionIdentifier: collectionVersions.versionIdentifier,
      publishedAt: collectionVersions.publishedAt,
      memberCount: sql<number>`(select count(*)::int from collection_members m where m.collection_version_id = ${collectionVersions.id})`,
    })
    .from(collectionVersions)
    .where(and(eq(collectionVersions.collectionId, collectionId), owner ? undefined : eq(collectionVersions.state, "published")))
    .orderBy(desc(collectionVersions.number));
  if (versions.length === 0) return null;
  return {
    id: Number(c.id),
    ownerId: Number(c.owner_id),
    ownerName: c.name,
    ownerOrcid: c.verified_orcid,
    seriesIdentifier: c.series_identifier,
    versions: versions.map((v) => ({ ...v, memberCount: Number(v.memberCount) })),
  };
}

/** The members of one collection version, in their order. */
export async function listCollectionMembers({ collectionVersionId }: { collectionVersionId: number }): Promise<CollectionMemberDto[]> {
  const rows = await getDb().execute<{
    version_id: number;
    dataset_id: number;
    number: number;
    title: string;
    equation: string | null;
    reaction_key: string | null;
    state: string;
    version_identifier: string | null;
    retraction_notice: string | null;
    newer_number: number | null;
    newer_identifier: string | null;
    note: string | null;
    position: number;
  }>(sql`
    select v.id as version_id, v.dataset_id, v.number, v.title, ${reactionDisplayEquation(sql`v.reaction_id`)} as equation,
      (select r.key from reactions r where r.id = v.reaction_id) as reaction_key, v.state::text as state,
      v.version_identifier, v.retraction_notice, n.number as newer_number, n.version_identifier as newer_identifier, m.note, m.position
    from collection_members m join dataset_versions v on v.id = m.version_id
    left join lateral (select w.number, w.version_identifier from dataset_versions w where w.dataset_id = v.dataset_id
      and w.state = 'published' and w.number > v.number order by w.number desc limit 1) n on true
    where m.collection_version_id = ${collectionVersionId}
    order by m.position`);
  return rows.map((r) => ({
    versionId: Number(r.version_id),
    datasetId: Number(r.dataset_id),
    number: Number(r.number),
    title: r.title,
    equation: r.equation ?? "",
    reactionKey: r.reaction_key,
    state: r.state,
    versionIdentifier: r.version_identifier,
    retractionNotice: r.retraction_notice,
    newer: r.newer_number === null ? null : { number: Number(r.newer_number), versionIdentifier: r.newer_identifier },
    note: r.note,
    position: Number(r.position),
  }));
}

/** A listing row: a collection by its newest version the reader may see. */
export interface CollectionListItem {
  id: number;
  number: number;
  state: CollectionVersionState;
  title: string;
  versionIdentifier: string | null;
  publishedAt: Date | null;
  ownerName: string;
  memberCount: number;
}

const listColumns = sql`c.id, v.number, v.state::text as state, v.title, v.version_identifier, v.published_at, u.name as owner_name,
  (select count(*)::int from collection_members m where m.collection_version_id = v.id) as member_count`;

function listItem(r: Record<string, unknown>): CollectionListItem {
  return {
    id: Number(r.id),
    number: Number(r.number),
    state: r.state as CollectionVersionState,
    title: String(r.title),
    versionIdentifier: (r.version_identifier as string | null) ?? null,
    publishedAt: r.published_at ? new Date(r.published_at as string) : null,
    ownerName: String(r.owner_name),
    memberCount: Number(r.member_count),
  };
}

/** Published collections by their newest published version, most recently published first. */
export async function listPublishedCollections({ limit = 50, offset = 0 }: { limit?: number; offset?: number } = {}): Promise<
  CollectionListItem[]
> {
  const rows = await getDb().execute(sql`
    select ${listColumns} from collections c join users u on u.id = c.owner_id
    join lateral (select * from collection_versions x where x.collection_id = c.id and x.state = 'published' order by x.number desc limit 1) v on true
    order by v.published_at desc, c.id desc limit ${limit} offset ${offset}`);
  return rows.map(listItem);
}

/** Every published collection version's address parts (the sitemap's). */
export async function listPublishedCollectionVersionPages(): Promise<{ collectionId: number; number: number; publishedAt: Date | null }[]> {
  const rows = await getDb()
    .select({
      collectionId: collectionVersions.collectionId,
      number: collectionVersions.number,
      publishedAt: collectionVersions.publishedAt,
    })
    .from(collectionVersions)
    .where(eq(collectionVersions.state, "published"))
    .orderBy(collectionVersions.collectionId, collectionVersions.number);
  return rows;
}

/** A person's own collections by their newest version (a draft included), newest first. */
export async function listMyCollections({ ownerId }: { ownerId: number }): Promise<CollectionListItem[]> {
  const rows = await getDb().execute(sql`
    select ${listColumns} from collections c join users u on u.id = c.owner_id
    join lateral (select * from collection_versions x where x.collection_id = c.id order by x.number desc limit 1) v on true
    where c.owner_id = ${ownerId} order by c.id desc`);
  return rows.map(listItem);
}

/** What registering a collection version's identifier needs (the DataCite builder's input), or null when the identifier is not a collection's. */
export type CollectionRegistrationSubject = Omit<CollectionDoiInput, "doi" | "baseUrl" | "now"> & {
  identifier: string;
  registered: boolean;
};

export async function getCollectionRegistrationSubject({
  identifier,
}: {
  identifier: string;
}): Promise<CollectionRegistrationSubject | null> {
  const db = getDb();
  const [r] = await db.execute<{
    registered: boolean;
    cv_id: number;
    collection_id: number;
    number: number;
    title: string;
    description: string;
    published_at: string | null;
    name: string;
    verified_orcid: string | null;
  }>(sql`
    select g.registered, cv.id as cv_id, cv.collection_id, cv.number, cv.title, cv.description, cv.published_at, u.name, u.verified_orcid
    from identifier_registrations g join collection_versions cv on cv.id = g.collection_version_id
    join collections c on c.id = cv.collection_id join users u on u.id = c.owner_id
    where g.identifier = ${identifier} and g.kind = 'collection'`);
  if (!r) return null;
  const members = await db.execute<{ version_identifier: string }>(sql`
    select v.version_identifier from collection_members m join dataset_versions v on v.id = m.version_id
    where m.collection_version_id = ${r.cv_id} and v.version_identifier is not null order by m.position`);
  const siblings = await db
    .select({ number: collectionVersions.number, versionIdentifier: collectionVersions.versionIdentifier })
    .from(collectionVersions)
    .where(and(eq(collectionVersions.collectionId, Number(r.collection_id)), eq(collectionVersions.state, "published")))
    .orderBy(asc(collectionVersions.number));
  const number = Number(r.number);
  return {
    identifier,
    registered: r.registered,
    collectionId: Number(r.collection_id),
    versionNumber: number,
    title: r.title,
    description: r.description,
    publishedAt: r.published_at ? new Date(r.published_at) : null,
    ownerName: r.name,
    ownerOrcid: r.verified_orcid,
    memberIdentifiers: members.map((m) => m.version_identifier),
    previousVersionIdentifier: siblings.filter((s) => s.number < number).at(-1)?.versionIdentifier ?? null,
    nextVersionIdentifier: siblings.find((s) => s.number > number)?.versionIdentifier ?? null,
  };
}

/** Published versions by id (any other id is left out), for the list a new collection starts from. */
export async function listPublicVersionsById({ versionIds }: { versionIds: number[] }) {
  if (versionIds.length === 0) return [];
  const rows = await getDb().execute<{
    id: number;
    title: string;
    number: number;
    version_identifier: string | null;
    equation: string | null;
  }>(sql`
    select v.id, v.title, v.number, v.version_identifier, ${reactionDisplayEquation(sql`v.reaction_id`)} as equation
    from dataset_versions v where v.id = any(${`{${versionIds.join(",")}}`}::int[]) and v.state = 'published'`);
  const byId = new Map(rows.map((r) => [Number(r.id), r]));
  return versionIds.flatMap((id) => {
    const r = byId.get(id);
    return r
      ? [{ versionId: id, title: r.title, number: Number(r.number), versionIdentifier: r.version_identifier, equation: r.equation ?? "" }]
      : [];
  });
}
