import "server-only";
import { and, eq, sql } from "drizzle-orm";
import { getDb, type Transaction } from "@/db/client";
import { watches, watchNotices, watchSettings } from "@/db/watches";
import { recordAuditEvent } from "@/lib/audit/record";
import { AppError } from "@/lib/errors";
import { reactionDisplayEquation, speciesDisplayName } from "@/lib/reactions/display-names";
import type { NewsVersion } from "@/lib/mail/watch-templates";

/** What can be watched, as pages and forms name it. */
export type WatchSubject =
  | { kind: "reaction"; id: number }
  | { kind: "species"; inchiKey: string }
  | { kind: "dataset"; id: number }
  | { kind: "collection"; id: number };

export interface WatchDto {
  id: number;
  kind: "reaction" | "species" | "dataset" | "collection";
  /** "the reaction hydroxyl + methane → water + methyl", "the species methane", "the dataset “…”". */
  label: string;
  /** The page of what is watched (relative path pieces: a reaction key, an InChIKey, a dataset id). */
  reactionKey: string | null;
  inchiKey: string | null;
  datasetId: number | null;
  collectionId: number | null;
  createdAt: string;
}

/** The words a mail and the watch list use for a watch's subject, from public data only. */
const labelOf = sql`(case
  when w.reaction_id is not null then 'the reaction ' || ${reactionDisplayEquation(sql`w.reaction_id`)}
  when w.species_id is not null then 'the species ' || ${speciesDisplayName(sql`w.species_id`, sql`(select s.formula from species s where s.id = w.species_id)`)}
  when w.collection_id is not null then 'the collection “' || coalesce((select cv.title from collection_versions cv where cv.collection_id = w.collection_id
    order by (cv.state = 'published') desc, cv.number desc limit 1), 'collection ' || w.collection_id) || '”'
  else 'the dataset “' || coalesce((select v.title from dataset_versions v where v.dataset_id = w.dataset_id
    and v.state in ('published', 'retracted') order by v.number desc limit 1), 'dataset ' || w.dataset_id) || '”' end)`;

/**
 * The row id of a subject a person may watch: only what has public data (a draft's reaction or an
 * unpublished dataset is "not found", so watching cannot reveal that it exists).
 */
async function subjectColumns(
  subject: WatchSubject,
): Promise<{ reactionId?: number; speciesId?: number; datasetId?: number; collectionId?: number }> {
  const db = getDb();
  const publicVersion = sql`v.state in ('published', 'retracted')`;
  if (subject.kind === "reaction") {
    const [row] = await db.execute(sql`select 1 from dataset_versions v where v.reaction_id = ${subject.id} and ${publicVersion} limit 1`);
    if (row) return { reactionId: subject.id };
  } else if (subject.kind === "species") {
    const [row] = await db.execute<{ id: number }>(sql`
      select s.id from species s where s.inchi_key = ${subject.inchiKey} and exists (
        select 1 from reaction_participants rp join dataset_versions v on v.reaction_id = rp.reaction_id
        where rp.species_id = s.id and ${publicVersion})`);
    if (row) return { speciesId: Number(row.id) };
  } else if (subject.kind === "collection") {
    const [row] = await db.execute(
      sql`select 1 from collection_versions cv where cv.collection_id = ${subject.id} and cv.state = 'published' limit 1`,
    );
    if (row) return { collectionId: subject.id };
  } else {
    const [row] = await db.execute(sql`select 1 from dataset_versions v where v.dataset_id = ${subject.id} and ${publicVersion} limit 1`);
    if (row) return { datasetId: subject.id };
  }
  throw new AppError("not_found", `No public ${subject.kind} to watch there`);
}

const subjectMatch = (columns: { reactionId?: number; speciesId?: number; datasetId?: number; collectionId?: number }) =>
  columns.reactionId !== undefined
    ? eq(watches.reactionId, columns.reactionId)
    : columns.speciesId !== undefined
      ? eq(watches.speciesId, columns.speciesId)
      : columns.collectionId !== undefined
        ? eq(watches.collectionId, columns.collectionId)
        : eq(watches.datasetId, columns.datasetId!);

/** Starts watching (nothing changes when already watching). */
export async function addWatch({ userId, subject }: { userId: number; subject: WatchSubject }): Promise<void> {
  const columns = await subjectColumns(subject);
  await getDb().transaction(async (tx) => {
    const [row] = await tx
      .insert(watches)
      .values({ userId, ...columns })
      .onConflictDoNothing()
      .returning({ id: watches.id });
    if (row)
      await recordAuditEvent(tx, { actorId: userId, action: "watch.add", subjectType: "watch", subjectId: row.id, details: { subject } });
  });
}

/** Stops watching a subject (nothing changes when not watching). */
export async function removeWatch({ userId, subject }: { userId: number; subject: WatchSubject }): Promise<void> {
  const columns = await subjectColumns(subject);
  await getDb().transaction(async (tx) => {
    const gone = await tx
      .delete(watches)
      .where(and(eq(watches.userId, userId), subjectMatch(columns)))
      .returning({ id: watches.id });
    for (const row of gone)
      await recordAuditEvent(tx, {
        actorId: userId,
        action: "watch.remove",
        subjectType: "watch",
        subjectId: row.id,
        details: { subject },
      });
  });
}

/** Ends one watch by its id, only if it is this person's; true when one was ended. */
export async function removeWatchById({ userId, watchId }: { userId: number; watchId: number }): Promise<boolean> {
  return getDb().transaction(async (tx) => {
    const gone = await tx
      .delete(watches)
      .where(and(eq(watches.id, watchId), eq(watches.userId, userId)))
      .returning({ id: watches.id });
    for (const row of gone)
      await recordAuditEvent(tx, { actorId: userId, action: "watch.remove", subjectType: "watch", subjectId: row.id });
    return gone.length > 0;
  });
}

/** Whether the person watches this subject (false for anything not public). */
export async function isWatching({ userId, subject }: { userId: number; subject: WatchSubject }): Promise<boolean> {
  let columns;
  try {
    columns = await subjectColumns(subject);
  } catch {
    return false;
  }
  const [row] = await getDb()
    .select({ id: watches.id })
    .from(watches)
    .where(and(eq(watches.userId, userId), subjectMatch(columns)));
  return Boolean(row);
}

/** One watch's label (for the stop page), or null when it is gone. */
export async function findWatchLabel({ watchId, userId }: { watchId: number; userId: number }): Promise<string | null> {
  const [row] = await getDb().execute<{ label: string }>(
    sql`select ${labelOf} as label from watches w where w.id = ${watchId} and w.user_id = ${userId}`,
  );
  return row?.label ?? null;
}

/** Everything a person watches, newest first. */
export async function listWatches({ userId }: { userId: number }): Promise<WatchDto[]> {
  const rows = await getDb().execute<{
    id: number;
    reaction_id: number | null;
    species_id: number | null;
    dataset_id: number | null;
    collection_id: number | null;
    label: string;
    reaction_key: string | null;
    inchi_key: string | null;
    created_at: string;
  }>(sql`
    select w.id, w.reaction_id, w.species_id, w.dataset_id, w.collection_id, ${labelOf} as label,
      (select r.key from reactions r where r.id = w.reaction_id) as reaction_key,
      (select s.inchi_key from species s where s.id = w.species_id) as inchi_key,
      to_char(w.created_at at time zone 'UTC', 'YYYY-MM-DD"T"HH24:MI:SS"Z"') as created_at
    from watches w where w.user_id = ${userId} order by w.created_at desc, w.id desc`);
  return rows.map((r) => ({
    id: Number(r.id),
    kind: r.reaction_id !== null ? "reaction" : r.species_id !== null ? "species" : r.collection_id !== null ? "collection" : "dataset",
    label: r.label,
    reactionKey: r.reaction_key,
    inchiKey: r.inchi_key,
    datasetId: r.dataset_id === null ? null : Number(r.dataset_id),
    collectionId: r.collection_id === null ? null : Number(r.collection_id),
    createdAt: r.created_at,
  }));
}

export async function getDailyDigest({ userId }: { userId: number }): Promise<boolean> {
  const [row] = await getDb().select({ digest: watchSettings.dailyDigest }).from(watchSettings).where(eq(watchSettings.userId, userId));
  return row?.digest ?? false;
}

export async function setDailyDigest({ userId, dailyDigest }: { userId: number; dailyDigest: boolean }): Promise<void> {
  await getDb().transaction(async (tx) => {
    await tx
      .insert(watchSettings)
      .values({ userId, dailyDigest })
      .onConflictDoUpdate({ target: watchSettings.userId, set: { dailyDigest, updatedAt: sql`now()` } });
    await recordAuditEvent(tx, {
      actorId: userId,
      action: "watch.digest",
      subjectType: "user",
      subjectId: userId,
      details: { dailyDigest },
    });
  });
}

/** A person to tell of one event, with the watches that make it their news. */
export interface Watcher {
  userId: number;
  email: string;
  name: string;
  dailyDigest: boolean;
  reasons: { watchId: number; label: string }[];
}

/**
 * Everyone whose watches cover a version: its reaction, a species of its reaction, or its dataset;
 * and, when it is retracted or superseded, a collection that holds it (a published version of the
 * collection, or any version for the collection's owner). A `superseded` event reaches collection
 * watches only. Only active accounts with a confirmed address.
 */
export async function listWatchersOfVersion({ versionId, event }: { versionId: number; event?: string }): Promise<Watcher[]> {
  const collectionWatch =
    event === "retracted" || event === "superseded"
      ? sql`w.collection_id in (select cv.collection_id from collection_members m
          join collection_versions cv on cv.id = m.collection_version_id join collections c on c.id = cv.collection_id
          where m.version_id = v.id and (cv.state = 'published' or c.owner_id = w.user_id))`
      : sql`false`;
  const otherWatch =
    event === "superseded"
      ? sql`false`
      : sql`w.reaction_id = v.reaction_id or w.dataset_id = v.dataset_id
      or w.species_id in (select rp.species_id from reaction_participants rp where rp.reaction_id = v.reaction_id)`;
  const rows = await getDb().execute<{
    user_id: number;
    email: string;
    name: string;
    digest: boolean;
    watch_id: number;
    label: string;
  }>(sql`
    with v as (select id, dataset_id, reaction_id from dataset_versions where id = ${versionId})
    select w.user_id, u.email, u.name, coalesce(ws.daily_digest, false) as digest, w.id as watch_id, ${labelOf} as label
    from v join watches w on ${otherWatch} or ${collectionWatch}
    join users u on u.id = w.user_id
    left join watch_settings ws on ws.user_id = w.user_id
    where u.deactivated_at is null and u.email_verified_at is not null
    order by w.user_id, w.id`);
  const byUser = new Map<number, Watcher>();
  for (const r of rows) {
    const userId = Number(r.user_id);
    const watcher = byUser.get(userId) ?? { userId, email: r.email, name: r.name, dailyDigest: r.digest, reasons: [] };
    watcher.reasons.push({ watchId: Number(r.watch_id), label: r.label });
    byUser.set(userId, watcher);
  }
  return [...byUser.values()];
}

/** What a notice tells of one version. */
/** What a notice tells of one version: the mail's view of it, with its id and state. */
export interface NoticeVersion extends NewsVersion {
  versionId: number;
  state: string;
}

export async function getNoticeVersion({ versionId }: { versionId: number }): Promise<NoticeVersion | null> {
  const [r] = await getDb().execute<{
    id: number;
    dataset_id: number;
    number: number;
    title: string;
    equation: string | null;
    state: string;
    point_count: number;
    t_min: number | null;
    t_max: number | null;
    version_identifier: string | null;
    retraction_notice: string | null;
    newer_number: number | null;
    newer_title: string | null;
    flag_codes: string[] | null;
  }>(sql`
    select v.id, v.dataset_id, v.number, v.title, ${reactionDisplayEquation(sql`v.reaction_id`)} as equation, v.state::text as state,
      v.point_count, v.t_min, v.t_max, v.version_identifier, v.retraction_notice, v.flag_codes,
      n.number as newer_number, n.title as newer_title
    from dataset_versions v
    left join lateral (select w.number, w.title from dataset_versions w where w.dataset_id = v.dataset_id
      and w.state = 'published' and w.number > v.number order by w.number desc limit 1) n on true
    where v.id = ${versionId}`);
  if (!r) return null;
  return {
    versionId: Number(r.id),
    datasetId: Number(r.dataset_id),
    number: Number(r.number),
    title: r.title,
    equation: r.equation ?? "",
    state: r.state,
    pointCount: Number(r.point_count),
    tMin: r.t_min === null ? null : Number(r.t_min),
    tMax: r.t_max === null ? null : Number(r.t_max),
    identifier: r.version_identifier,
    retractionNotice: r.retraction_notice,
    newer: r.newer_number === null ? null : { number: Number(r.newer_number), title: r.newer_title ?? "" },
    flags: r.flag_codes ?? [],
  };
}

/**
 * Records that a person is told of an event; false when they were already (a job run twice).
 * `mailed` is false for a notice that waits for the daily digest.
 */
export async function recordNotice(
  tx: Transaction,
  notice: { userId: number; versionId: number; event: string; eventAt: Date; reasons: Watcher["reasons"]; mailed: boolean },
): Promise<boolean> {
  const rows = await tx
    .insert(watchNotices)
    .values({
      userId: notice.userId,
      versionId: notice.versionId,
      event: notice.event,
      eventAt: notice.eventAt,
      reasons: notice.reasons,
      mailedAt: notice.mailed ? sql`now()` : null,
    })
    .onConflictDoNothing()
    .returning({ id: watchNotices.id });
  return rows.length > 0;
}

/** People with notices waiting for a digest. */
export async function listDigestRecipients(): Promise<number[]> {
  const rows = await getDb().execute<{ user_id: number }>(sql`select distinct user_id from watch_notices where mailed_at is null`);
  return rows.map((r) => Number(r.user_id));
}

/** A person's waiting notices, locked for this transaction (another digest run skips them). */
export async function takeWaitingNotices(tx: Transaction, { userId }: { userId: number }) {
  const rows = await tx.execute<{
    id: number;
    version_id: number;
    event: string;
    reasons: Watcher["reasons"];
    email: string;
    name: string;
    active: boolean;
  }>(sql`
    select n.id, n.version_id, n.event, n.reasons, u.email, u.name, (u.deactivated_at is null and u.email_verified_at is not null) as active
    from watch_notices n join users u on u.id = n.user_id
    where n.user_id = ${userId} and n.mailed_at is null
    order by n.event_at, n.id
    for update of n skip locked`);
  return rows.map((r) => ({
    id: Number(r.id),
    versionId: Number(r.version_id),
    event: r.event,
    reasons: r.reasons,
    email: r.email,
    name: r.name,
    active: r.active,
  }));
}

export async function markNoticesMailed(tx: Transaction, ids: number[]): Promise<void> {
  if (ids.length === 0) return;
  await tx.execute(sql`update watch_notices set mailed_at = now() where id = any(${`{${ids.join(",")}}`}::int[])`);
}

/**
 * The older published versions of a version's dataset that some collection holds: a newer version
 * was just published, so each is superseded for those collections.
 */
export async function listSupersededMembers({ versionId }: { versionId: number }): Promise<number[]> {
  const rows = await getDb().execute<{ id: number }>(sql`
    select distinct o.id from dataset_versions v join dataset_versions o on o.dataset_id = v.dataset_id and o.number < v.number
    where v.id = ${versionId} and o.state = 'published' and exists (select 1 from collection_members m where m.version_id = o.id)`);
  return rows.map((r) => Number(r.id));
}
