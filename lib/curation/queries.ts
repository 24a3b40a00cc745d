import "server-only";
import { and, asc, count, desc, eq, inArray, isNotNull, isNull, lt, ne, or, sql, type SQL } from "drizzle-orm";
import { getDb } from "@/db/client";
import { datasets, datasetVersions, decisions, submissionSnapshots, versionAnalyses } from "@/db/datasets";
import { users } from "@/db/users";
import { RETIRED_REACTION_CLASS_IDS } from "@/lib/deposits/vocabulary";
import type { Flag } from "@/lib/kinetics";
import { readerFlagMessage } from "@/lib/flag-words";
import { summariseFindings, type CheckSummary } from "./check-summary";
import type { VersionState } from "./lifecycle";

/** Versions that wait for a curator: submitted, or taken into review and not yet decided. */
export const WAITING_STATES: VersionState[] = ["submitted", "in_review"];
/** Versions returned to their authors: they wait for the authors, not for a curator. */
export const WITH_AUTHORS_STATES: VersionState[] = ["returned"];
export const QUEUE_STATES: VersionState[] = [...WAITING_STATES, ...WITH_AUTHORS_STATES];
export const QUEUE_SORTS = ["submitted", "title", "severity", "points"] as const;
export type QueueSort = (typeof QUEUE_SORTS)[number];

export interface QueueQuery {
  /** Default: the versions waiting for a curator (never the returned ones). */
  states?: VersionState[];
  reactionClass?: string;
  flag?: string;
  /** Only versions waiting longer than this many days. */
  olderThanDays?: number;
  sort?: QueueSort;
  direction?: "asc" | "desc";
  page?: number;
  pageSize?: number;
}

const severityOrder = sql`case ${datasetVersions.worstFlag} when 'error' then 3 when 'warn' then 2 when 'info' then 1 else 0 end`;
const reactionClass = sql<string>`${datasetVersions.payload} -> 'reaction' ->> 'class'`;

/**
 * Who holds a queued version: the curator who took it into review (in review), or who returned it
 * (returned), from the newest such event on its audit trail.
 */
const handledBy = sql<string | null>`case ${datasetVersions.state}
  when 'in_review' then (select u.name from audit_events e join users u on u.id = e.actor_id
    where e.subject_type = 'dataset_version' and e.subject_id = ${datasetVersions.id}::text and e.action = 'dataset.start_review'
    order by e.id desc limit 1)
  when 'returned' then (select u.name from decisions d join users u on u.id = d.curator_id
    where d.version_id = ${datasetVersions.id} and d.decision = 'return' order by d.id desc limit 1)
  end`;

/** When the newest return of a version was decided (null unless it was returned). */
const returnedAt = sql`(select max(d.created_at) from decisions d where d.version_id = ${datasetVersions.id} and d.decision = 'return')`;

/** Since when a queued version has waited: for its authors since its newest return, else for a curator since its submission. */
const waitingSince = sql`coalesce(case when ${datasetVersions.state} = 'returned' then ${returnedAt} end, ${datasetVersions.submittedAt})`;

/** The filters of a queue query other than the state. */
function queueFilters(q: QueueQuery): SQL[] {
  const where: SQL[] = [];
  if (q.reactionClass) {
    // Published versions keep the class id they were published with, retired ones included.
    const retired = Object.entries(RETIRED_REACTION_CLASS_IDS).filter(([, id]) => id === q.reactionClass);
    where.push(inArray(reactionClass, [q.reactionClass, ...retired.map(([old]) => old)]));
  }
  if (q.flag) where.push(sql`${q.flag} = any(${datasetVersions.flagCodes})`);
  // The cut-off on the database's clock (the one that stamped the waits); a whole number of days.
  if (q.olderThanDays) where.push(sql`${waitingSince} < now() - make_interval(days => ${Math.trunc(q.olderThanDays)}::int)`);
  return where;
}

/** The curators' queue: filtered, sorted and paginated in the database. */
export async function listReviewQueue(q: QueueQuery) {
  const db = getDb();
  const pageSize = Math.min(Math.max(q.pageSize ?? 20, 5), 100);
  const page = Math.max(q.page ?? 1, 1);
  const where: SQL[] = [inArray(datasetVersions.state, q.states?.length ? q.states : WAITING_STATES), ...queueFilters(q)];
  const dir = q.direction === "desc" ? desc : asc;
  const order =
    q.sort === "title"
      ? dir(datasetVersions.title)
      : q.sort === "severity"
        ? dir(severityOrder)
        : q.sort === "points"
          ? dir(datasetVersions.pointCount)
          : dir(waitingSince);
  const rows = await db
    .select({
      versionId: datasetVersions.id,
      datasetId: datasetVersions.datasetId,
      number: datasetVersions.number,
      title: datasetVersions.title,
      state: datasetVersions.state,
      submittedAt: datasetVersions.submittedAt,
      worstFlag: datasetVersions.worstFlag,
      flagCodes: datasetVersions.flagCodes,
      reactionClass,
      pointCount: datasetVersions.pointCount,
      tMin: datasetVersions.tMin,
      tMax: datasetVersions.tMax,
      owner: users.name,
      handledBy,
      /** Seconds since submission, by the database's clock. */
      waitingSeconds: sql<number | null>`extract(epoch from now() - ${datasetVersions.submittedAt})::float8`,
      /** Seconds since it was returned to its authors (returned versions only), by the database's clock. */
      returnedSeconds: sql<number | null>`case when ${datasetVersions.state} = 'returned'
        then extract(epoch from now() - ${returnedAt})::float8 end`,
    })
    .from(datasetVersions)
    .innerJoin(datasets, eq(datasets.id, datasetVersions.datasetId))
    .innerJoin(users, eq(users.id, datasets.ownerId))
    .where(and(...where))
    .orderBy(order, asc(datasetVersions.id))
    .limit(pageSize)
    .offset((page - 1) * pageSize);
  const [{ n }] = await db
    .select({ n: count() })
    .from(datasetVersions)
    .where(and(...where));
  return { rows, total: n, page, pageSize };
}

/**
 * How many queued versions there are in each state with the same filters (class, check, age):
 * the queue's counts, so "waiting for a curator" never counts the versions with their authors.
 */
export async function countReviewQueue(q: QueueQuery) {
  const rows = await getDb()
    .select({ state: datasetVersions.state, n: count() })
    .from(datasetVersions)
    .where(and(inArray(datasetVersions.state, QUEUE_STATES), ...queueFilters(q)))
    .groupBy(datasetVersions.state);
  const by = (s: VersionState) => rows.find((r) => r.state === s)?.n ?? 0;
  return {
    submitted: by("submitted"),
    inReview: by("in_review"),
    returned: by("returned"),
    waiting: by("submitted") + by("in_review"),
  };
}

/**
 * The findings of each version's newest analysis (its checks and the fit's flags, each message in
 * the default units) summed up in words, by version id. Only the flags are read from the stored
 * result, never its fits.
 */
export async function listCheckSummaries(versionIds: number[]): Promise<Map<number, CheckSummary>> {
  const out = new Map<number, CheckSummary>();
  if (versionIds.length === 0) return out;
  const rows = await getDb()
    .selectDistinctOn([versionAnalyses.versionId], {
      versionId: versionAnalyses.versionId,
      checks: versionAnalyses.checks,
      flags: sql<Flag[] | null>`${versionAnalyses.result} -> 'flags'`,
    })
    .from(versionAnalyses)
    .where(inArray(versionAnalyses.versionId, versionIds))
    .orderBy(versionAnalyses.versionId, desc(versionAnalyses.id));
  for (const r of rows) {
    const flags = Array.isArray(r.flags) ? r.flags : [];
    out.set(
      r.versionId,
      summariseFindings([
        ...(r.checks ?? []),
        ...flags.map((f) => ({ code: f.code, severity: f.severity, message: readerFlagMessage(f) })),
      ]),
    );
  }
  return out;
}

/** Other versions that may hold the same data: same reaction with overlapping temperatures, or the same source DOI. */
export async function findPossibleDuplicates({ versionId }: { versionId: number }) {
  const db = getDb();
  const [me] = await db
    .select({
      datasetId: datasetVersions.datasetId,
      reactionId: datasetVersions.reactionId,
      tMin: datasetVersions.tMin,
      tMax: datasetVersions.tMax,
      doi: sql<string | null>`${datasetVersions.payload} -> 'source' ->> 'doi'`,
    })
    .from(datasetVersions)
    .where(eq(datasetVersions.id, versionId));
  if (!me) return [];
  const sameReactionOverlap =
    me.reactionId !== null && me.tMin !== null && me.tMax !== null
      ? and(
          eq(datasetVersions.reactionId, me.reactionId),
          sql`${datasetVersions.tMin} <= ${me.tMax}`,
          sql`${datasetVersions.tMax} >= ${me.tMin}`,
        )
      : undefined;
  const sameDoi = me.doi ? sql`lower(${datasetVersions.payload} -> 'source' ->> 'doi') = lower(${me.doi})` : undefined;
  const match = [sameReactionOverlap, sameDoi].filter(Boolean) as SQL[];
  if (!match.length) return [];
  return db
    .select({
      versionId: datasetVersions.id,
      datasetId: datasetVersions.datasetId,
      number: datasetVersions.number,
      title: datasetVersions.title,
      state: datasetVersions.state,
      tMin: datasetVersions.tMin,
      tMax: datasetVersions.tMax,
      sameDoi: sameDoi ? sql<boolean>`${sameDoi}` : sql<boolean>`false`,
    })
    .from(datasetVersions)
    .where(
      and(
        ne(datasetVersions.datasetId, me.datasetId),
        inArray(datasetVersions.state, ["submitted", "in_review", "returned", "published"]),
        or(...match),
      ),
    )
    .limit(20);
}

/** The version before this one of the same dataset (the newest published, else the newest older). */
export async function getPreviousVersion({ datasetId, number }: { datasetId: number; number: number }) {
  const [row] = await getDb()
    .select({ id: datasetVersions.id, number: datasetVersions.number, payload: datasetVersions.payload, state: datasetVersions.state })
    .from(datasetVersions)
    .where(and(eq(datasetVersions.datasetId, datasetId), lt(datasetVersions.number, number)))
    .orderBy(desc(datasetVersions.number))
    .limit(1);
  return row ?? null;
}

/** Every submission snapshot of a version, newest first, with who sent it and the authors' reply. */
export async function listSubmissionSnapshots({ versionId }: { versionId: number }) {
  return getDb()
    .select({
      id: submissionSnapshots.id,
      sequence: submissionSnapshots.sequence,
      reply: submissionSnapshots.reply,
      payload: submissionSnapshots.payload,
      points: submissionSnapshots.points,
      createdAt: submissionSnapshots.createdAt,
      submittedBy: users.name,
    })
    .from(submissionSnapshots)
    .leftJoin(users, eq(users.id, submissionSnapshots.submittedBy))
    .where(eq(submissionSnapshots.versionId, versionId))
    .orderBy(desc(submissionSnapshots.sequence));
}

/** The authors' replies sent with the submissions of a version, oldest first (no documents). */
export async function listSubmissionReplies({ versionId }: { versionId: number }) {
  return getDb()
    .select({ reply: submissionSnapshots.reply, createdAt: submissionSnapshots.createdAt, submittedBy: users.name })
    .from(submissionSnapshots)
    .leftJoin(users, eq(users.id, submissionSnapshots.submittedBy))
    .where(and(eq(submissionSnapshots.versionId, versionId), isNotNull(submissionSnapshots.reply)))
    .orderBy(asc(submissionSnapshots.sequence));
}

/** Active curators who returned this version to its authors, each once, with their latest reason. */
export async function listReturningCurators({ versionId }: { versionId: number }) {
  const rows = await getDb()
    .select({ id: users.id, email: users.email, name: users.name, reason: decisions.reason })
    .from(decisions)
    .innerJoin(users, eq(users.id, decisions.curatorId))
    .where(and(eq(decisions.versionId, versionId), eq(decisions.decision, "return"), isNull(users.deactivatedAt)))
    .orderBy(desc(decisions.createdAt), desc(decisions.id));
  const seen = new Set<number>();
  return rows.filter((r) => (seen.has(r.id) ? false : (seen.add(r.id), true)));
}
