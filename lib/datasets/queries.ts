import "server-only";
import { and, desc, eq, inArray, sql } from "drizzle-orm";
import { getDb, type Transaction } from "@/db/client";
import { findingsOnly } from "@/lib/curation/check-summary";
import { datasetMembers, datasets, datasetVersions, decisions, versionAnalyses, versionFiles, versionPoints } from "@/db/datasets";
import { users } from "@/db/users";
import { recordAuditEvent } from "@/lib/audit/record";
import type { CoEditorRole, VersionState } from "@/lib/curation/lifecycle";
import { reactionClassFor } from "@/lib/deposits/vocabulary";
import { AppError } from "@/lib/errors";
import { buildSearchDocument } from "@/lib/search/documents";
import { listVersionCacheTags } from "@/lib/reactions/public-queries";
import { oweInvalidation } from "@/db/owed-invalidations";
import { upsertReaction, type ResolvedParticipant } from "./species-queries";

export interface ReactionInput {
  key: string;
  equation: string;
  participants: ResolvedParticipant[];
}

/** A canonical point ready to store. */
export interface StoredPoint {
  T: number;
  k: number;
  sigmaLnK?: number;
  pressurePa?: number;
  bathGas?: string;
  note?: string;
  original: Record<string, unknown>;
}

/** What the draft's checks found, summarised for lists and the review queue. */
export interface AnalysisSummary {
  engineVersion: string;
  result: Record<string, unknown> | null;
  checks: { code: string; severity: string; message: string }[];
  error?: string | null;
}

export interface VersionDto {
  id: number;
  datasetId: number;
  number: number;
  state: VersionState;
  title: string;
  /** The reaction this version describes (its own: a later draft never changes it). */
  reactionId: number | null;
  payload: Record<string, unknown>;
  /** The editor's latest document when it is not valid yet (null when `payload` is the latest). */
  draftDocument: Record<string, unknown> | null;
  /** What keeps `draftDocument` from being submitted, each with its JSON pointer. */
  draftProblems: { pointer: string; message: string }[] | null;
  lockVersion: number;
  versionIdentifier: string | null;
  payloadSha256: string | null;
  worstFlag: string | null;
  pointCount: number;
  tMin: number | null;
  tMax: number | null;
  submittedAt: Date | null;
  publishedAt: Date | null;
  retractedAt: Date | null;
  retractionNotice: string | null;
  updatedAt: Date;
}

const versionColumns = {
  id: datasetVersions.id,
  datasetId: datasetVersions.datasetId,
  number: datasetVersions.number,
  state: datasetVersions.state,
  title: datasetVersions.title,
  reactionId: datasetVersions.reactionId,
  payload: datasetVersions.payload,
  draftDocument: datasetVersions.draftDocument,
  draftProblems: datasetVersions.draftProblems,
  lockVersion: datasetVersions.lockVersion,
  versionIdentifier: datasetVersions.versionIdentifier,
  payloadSha256: datasetVersions.payloadSha256,
  worstFlag: datasetVersions.worstFlag,
  pointCount: datasetVersions.pointCount,
  tMin: datasetVersions.tMin,
  tMax: datasetVersions.tMax,
  submittedAt: datasetVersions.submittedAt,
  publishedAt: datasetVersions.publishedAt,
  retractedAt: datasetVersions.retractedAt,
  retractionNotice: datasetVersions.retractionNotice,
  updatedAt: datasetVersions.updatedAt,
};

const severityRank: Record<string, number> = { info: 1, warn: 2, error: 3 };

/** The summary columns of a version (worst flag, flag codes, point count, measured range) from its points and analysis. */
export function summarise(points: StoredPoint[], analysis: AnalysisSummary) {
  const flags = [...analysis.checks, ...((analysis.result?.flags as { code: string; severity: string }[] | undefined) ?? [])];
  // A passed check (elements and charge balanced) is no finding, so never the worst one.
  const worst = findingsOnly(flags).reduce((w, f) => ((severityRank[f.severity] ?? 0) > (severityRank[w] ?? 0) ? f.severity : w), "none");
  const Ts = points.map((p) => p.T);
  return {
    worstFlag: worst,
    flagCodes: [...new Set(flags.map((f) => f.code))],
    pointCount: points.length,
    tMin: Ts.length ? Math.min(...Ts) : null,
    tMax: Ts.length ? Math.max(...Ts) : null,
  };
}

/** Rows per INSERT: each statement's JSON stays a few megabytes at most. */
const POINTS_PER_STATEMENT = 10_000;

async function writePointsAndAnalysis(tx: Transaction, versionId: number, points: StoredPoint[], analysis: AnalysisSummary) {
  await tx.delete(versionPoints).where(eq(versionPoints.versionId, versionId));
  // One JSON text per chunk of rows, unpacked by PostgreSQL: building a multi-row VALUES list
  // value by value held the request thread ~0.4 s per 5 000 rows (every other request waited);
  // serialising them takes milliseconds. JSON numbers are the shortest round-trip decimals, and
  // float8 reads them back to the same doubles.
  for (let i = 0; i < points.length; i += POINTS_PER_STATEMENT) {
    const rows = points.slice(i, i + POINTS_PER_STATEMENT).map((p, j) => ({
      i: i + j,
      t: p.T,
      k: p.k,
      s: p.sigmaLnK ?? null,
      p: p.pressurePa ?? null,
      g: p.bathGas ?? null,
      n: p.note ?? null,
      o: p.original,
    }));
    await tx.execute(sql`
      insert into version_points (version_id, idx, temperature_k, rate_constant, sigma_ln_k, pressure_pa, bath_gas, note, original)
      select ${versionId}, r.i, r.t, r.k, r.s, r.p, r.g, r.n, r.o::jsonb
      from json_to_recordset(${JSON.stringify(rows)}::json) as r(i integer, t float8, k float8, s float8, p float8, g text, n text, o json)`);
  }
  await tx.delete(versionAnalyses).where(eq(versionAnalyses.versionId, versionId));
  await tx.insert(versionAnalyses).values({
    versionId,
    engineVersion: analysis.engineVersion,
    result: analysis.result,
    checks: analysis.checks,
    error: analysis.error ?? null,
  });
}

/** An editor's document that is not valid yet: kept as typed, with its problems; no rows are derived from it. */
export interface IncompleteDraft {
  document: Record<string, unknown>;
  problems: { pointer: string; message: string }[];
}

/**
 * Creates a dataset with its owner and a first draft version, all or nothing. An incomplete first
 * draft stores its document (as payload and as the draft document, with its problems) and no
 * points or analysis until a valid save.
 */
export async function createDatasetDraft(input: {
  ownerId: number;
  title: string;
  payload: Record<string, unknown>;
  points: StoredPoint[];
  analysis: AnalysisSummary | null;
  incomplete?: IncompleteDraft;
  reaction?: ReactionInput;
  /** Work that commits or rolls back with the new dataset (an Idempotency-Key's record). */
  beforeCommit?: (tx: Transaction, created: VersionDto) => Promise<void>;
}) {
  return getDb().transaction(async (tx) => {
    const { reactionId, participantNames } = input.reaction
      ? await upsertReaction(tx, input.reaction)
      : { reactionId: null, participantNames: [] };
    const [dataset] = await tx.insert(datasets).values({ ownerId: input.ownerId }).returning({ id: datasets.id });
    await tx.insert(datasetMembers).values({ datasetId: dataset.id, userId: input.ownerId, role: "owner" });
    const [version] = await tx
      .insert(datasetVersions)
      .values({
        datasetId: dataset.id,
        number: 1,
        title: input.title,
        reactionId,
        payload: input.payload,
        draftDocument: input.incomplete?.document ?? null,
        draftProblems: input.incomplete?.problems ?? null,
        participantNames,
        createdBy: input.ownerId,
        ...(input.analysis ? summarise(input.points, input.analysis) : {}),
      })
      .returning(versionColumns);
    if (input.analysis) await writePointsAndAnalysis(tx, version.id, input.points, input.analysis);
    await recordAuditEvent(tx, {
      actorId: input.ownerId,
      action: "dataset.created",
      subjectType: "dataset_version",
      subjectId: version.id,
      details: { datasetId: dataset.id },
    });
    await input.beforeCommit?.(tx, version);
    return version;
  });
}

/** Versions whose document may still change. */
const EDITABLE_STATES: VersionState[] = ["draft", "returned"];

/** Why a guarded update matched no row: gone, no longer editable, or saved by someone else first. */
async function staleSaveError(tx: Transaction, versionId: number): Promise<AppError> {
  const [current] = await tx.select({ state: datasetVersions.state }).from(datasetVersions).where(eq(datasetVersions.id, versionId));
  if (!current) return new AppError("not_found", "No such dataset version");
  if (!EDITABLE_STATES.includes(current.state))
    return new AppError("conflict", `This version is ${current.state.replace("_", " ")} and can no longer be edited`);
  return new AppError("conflict", STALE_SAVE_MESSAGE);
}

/** The message of a save that lost the optimistic lock (the editor recognises it and offers a merge). */
export const STALE_SAVE_MESSAGE = "Someone saved this draft after you opened it. Reload to see their changes; nothing of yours was stored.";

/**
 * Saves a draft if nobody saved it since `expectedLockVersion` (optimistic locking). A stale save
 * changes nothing and answers 409, so a co-editor's work is never overwritten. A valid document
 * replaces the payload and its rows and clears any incomplete draft document; an incomplete one is
 * stored on its own (`draftDocument`, `draftProblems`) and leaves the last valid payload, points and
 * analysis as they were.
 */
export async function saveDraft(
  input: {
    versionId: number;
    actorId: number;
    expectedLockVersion: number;
    title: string;
  } & (
    | {
        payload: Record<string, unknown>;
        points: StoredPoint[];
        analysis: AnalysisSummary;
        reaction?: ReactionInput;
        incomplete?: undefined;
      }
    | { incomplete: IncompleteDraft; payload?: undefined; points?: undefined; analysis?: undefined; reaction?: undefined }
  ),
) {
  return getDb().transaction(async (tx) => {
    // The reaction is stored on this version only: published versions keep the one they showed.
    const { reactionId, participantNames } = input.reaction
      ? await upsertReaction(tx, input.reaction)
      : { reactionId: undefined, participantNames: undefined };
    const contents = input.incomplete
      ? { draftDocument: input.incomplete.document, draftProblems: input.incomplete.problems }
      : {
          reactionId,
          payload: input.payload,
          participantNames,
          draftDocument: null,
          draftProblems: null,
          ...summarise(input.points, input.analysis),
        };
    const [row] = await tx
      .update(datasetVersions)
      .set({ title: input.title, ...contents, lockVersion: input.expectedLockVersion + 1, updatedAt: new Date() })
      .where(
        and(
          eq(datasetVersions.id, input.versionId),
          eq(datasetVersions.lockVersion, input.expectedLockVersion),
          inArray(datasetVersions.state, EDITABLE_STATES),
        ),
      )
      .returning(versionColumns);
    if (!row) throw await staleSaveError(tx, input.versionId);
    if (!input.incomplete) await writePointsAndAnalysis(tx, row.id, input.points, input.analysis);
    await recordAuditEvent(tx, {
      actorId: input.actorId,
      action: "dataset.draft_saved",
      subjectType: "dataset_version",
      subjectId: row.id,
      details: { lockVersion: row.lockVersion, ...(input.incomplete ? { problems: input.incomplete.problems.length } : {}) },
    });
    return row;
  });
}

/** A version with the caller's role on its dataset (null when they have none). */
export async function getVersionWithRole({ versionId, userId }: { versionId: number; userId: number | null }) {
  const db = getDb();
  const [version] = await db
    .select({ ...versionColumns, ownerId: datasets.ownerId })
    .from(datasetVersions)
    .innerJoin(datasets, eq(datasets.id, datasetVersions.datasetId))
    .where(eq(datasetVersions.id, versionId));
  if (!version) return null;
  let datasetRole: CoEditorRole | null = null;
  if (userId !== null) {
    const [m] = await db
      .select({ role: datasetMembers.role })
      .from(datasetMembers)
      .where(and(eq(datasetMembers.datasetId, version.datasetId), eq(datasetMembers.userId, userId)));
    datasetRole = m?.role ?? null;
  }
  return { version, datasetRole };
}

export async function getLatestAnalysis({ versionId }: { versionId: number }) {
  const [row] = await getDb()
    .select({
      engineVersion: versionAnalyses.engineVersion,
      result: versionAnalyses.result,
      checks: versionAnalyses.checks,
      error: versionAnalyses.error,
      createdAt: versionAnalyses.createdAt,
    })
    .from(versionAnalyses)
    .where(eq(versionAnalyses.versionId, versionId))
    .orderBy(desc(versionAnalyses.id))
    .limit(1);
  return row ?? null;
}

/** The engine version and checks of a version's newest analysis (not its result), null when it has none. */
export async function getLatestAnalysisEngine({ versionId }: { versionId: number }) {
  const [row] = await getDb()
    .select({ engineVersion: versionAnalyses.engineVersion, checks: versionAnalyses.checks })
    .from(versionAnalyses)
    .where(eq(versionAnalyses.versionId, versionId))
    .orderBy(desc(versionAnalyses.id))
    .limit(1);
  return row ?? null;
}

/** The flag codes of a version's newest fit and whether the version is public (a re-fit compares them with its own). */
export async function getLatestFitFlags({ versionId }: { versionId: number }): Promise<{ codes: string[]; isPublic: boolean }> {
  const [row] = await getDb().execute<{ codes: string[] | null; public: boolean | null }>(sql`
    select (select array_agg(distinct f ->> 'code' order by f ->> 'code') from jsonb_array_elements(coalesce(a.result -> 'flags', '[]'::jsonb)) f) as codes,
      (select v.state in ('published', 'retracted') from dataset_versions v where v.id = ${versionId}) as public
    from (select result from version_analyses where version_id = ${versionId} order by id desc limit 1) a`);
  return { codes: row?.codes ?? [], isPublic: row?.public ?? false };
}

/**
 * A version's stored deposit document as JSON text, null when there is no such version. As text:
 * the re-fit sends it to an analysis worker as text, and parsing 100 000 points here first would
 * cost the calling thread twice.
 */
export async function getVersionPayloadText({ versionId }: { versionId: number }): Promise<string | null> {
  const [row] = await getDb()
    .select({ payload: sql<string>`${datasetVersions.payload}::text` })
    .from(datasetVersions)
    .where(eq(datasetVersions.id, versionId));
  return row?.payload ?? null;
}

/** Ids of the versions whose newest analysis came from another engine version (or that have none), in id order. */
export async function listVersionIdsNotAnalysedBy({ engineVersion }: { engineVersion: string }): Promise<number[]> {
  const rows = await getDb().execute<{ id: number }>(sql`
    select v.id from dataset_versions v
    left join lateral (select engine_version from version_analyses a where a.version_id = v.id order by a.id desc limit 1) a on true
    where a.engine_version is distinct from ${engineVersion}
    order by v.id`);
  return rows.map((r) => Number(r.id));
}

/** The engine version the database records as current (drizzle/0013; written by scripts/migrate.ts), null when none. */
export async function getRecordedEngineVersion(): Promise<string | null> {
  const [row] = await getDb().execute<{ engine_version: string }>(sql`select engine_version from arrhenia_engine where only_row`);
  return row?.engine_version ?? null;
}

/** The datasets a person owns or co-edits, newest version of each. */
export async function listMyVersions({ userId }: { userId: number }) {
  return getDb()
    .selectDistinctOn([datasetVersions.datasetId], { ...versionColumns, role: datasetMembers.role })
    .from(datasetMembers)
    .innerJoin(datasetVersions, eq(datasetVersions.datasetId, datasetMembers.datasetId))
    .where(eq(datasetMembers.userId, userId))
    .orderBy(datasetVersions.datasetId, desc(datasetVersions.number));
}

export async function addDatasetMember({
  datasetId,
  userId,
  role,
  actorId,
}: {
  datasetId: number;
  userId: number;
  role: CoEditorRole;
  actorId: number;
}) {
  await getDb().transaction(async (tx) => {
    await tx
      .insert(datasetMembers)
      .values({ datasetId, userId, role })
      .onConflictDoUpdate({ target: [datasetMembers.datasetId, datasetMembers.userId], set: { role } });
    await recordAuditEvent(tx, {
      actorId,
      action: "dataset.member_added",
      subjectType: "dataset",
      subjectId: datasetId,
      details: { userId, role },
    });
  });
}

export async function listDatasetMembers({ datasetId }: { datasetId: number }) {
  return getDb()
    .select({ userId: datasetMembers.userId, role: datasetMembers.role, name: users.name, email: users.email })
    .from(datasetMembers)
    .innerJoin(users, eq(users.id, datasetMembers.userId))
    .where(eq(datasetMembers.datasetId, datasetId));
}

export async function listDecisions({ versionId }: { versionId: number }) {
  return getDb()
    .select({
      id: decisions.id,
      decision: decisions.decision,
      reason: decisions.reason,
      createdAt: decisions.createdAt,
      curator: users.name,
    })
    .from(decisions)
    .innerJoin(users, eq(users.id, decisions.curatorId))
    .where(eq(decisions.versionId, versionId))
    .orderBy(desc(decisions.createdAt));
}

/** Stored canonical points of a version, in order. */
export async function getVersionPoints({ versionId }: { versionId: number }) {
  return getDb()
    .select({ T: versionPoints.temperatureK, k: versionPoints.rateConstant, sigmaLnK: versionPoints.sigmaLnK })
    .from(versionPoints)
    .where(eq(versionPoints.versionId, versionId))
    .orderBy(versionPoints.idx);
}

/** Every stored column of a version's points (canonical numbers and what was deposited), in deposit order. */
export async function getVersionPointRows({ versionId }: { versionId: number }) {
  return getDb()
    .select({
      T: versionPoints.temperatureK,
      k: versionPoints.rateConstant,
      sigmaLnK: versionPoints.sigmaLnK,
      pressurePa: versionPoints.pressurePa,
      bathGas: versionPoints.bathGas,
      note: versionPoints.note,
      original: versionPoints.original,
    })
    .from(versionPoints)
    .where(eq(versionPoints.versionId, versionId))
    .orderBy(versionPoints.idx);
}

/** True when the person owns a dataset whose first version has this title (keeps seeding idempotent). */
export async function hasDatasetTitled({ ownerId, title }: { ownerId: number; title: string }): Promise<boolean> {
  const [row] = await getDb()
    .select({ id: datasetVersions.id })
    .from(datasetVersions)
    .innerJoin(datasets, eq(datasets.id, datasetVersions.datasetId))
    .where(and(eq(datasets.ownerId, ownerId), eq(datasetVersions.number, 1), eq(datasetVersions.title, title)))
    .limit(1);
  return Boolean(row);
}

/**
 * Starts the next version of a dataset as a draft copy of its newest version (document, points,
 * analysis). Only when the newest version is published or retracted: one open draft at a time.
 */
export async function createNextVersion({
  datasetId,
  actorId,
  beforeCommit,
}: {
  datasetId: number;
  actorId: number;
  /** Work that commits or rolls back with the new version (an Idempotency-Key's record). */
  beforeCommit?: (tx: Transaction, created: VersionDto) => Promise<void>;
}) {
  return getDb().transaction(async (tx) => {
    const [latest] = await tx
      .select({
        id: datasetVersions.id,
        number: datasetVersions.number,
        state: datasetVersions.state,
        title: datasetVersions.title,
        reactionId: datasetVersions.reactionId,
        payload: datasetVersions.payload,
        participantNames: datasetVersions.participantNames,
      })
      .from(datasetVersions)
      .where(eq(datasetVersions.datasetId, datasetId))
      .orderBy(desc(datasetVersions.number))
      .limit(1)
      .for("update");
    if (!latest) throw new AppError("not_found", "No such dataset");
    if (latest.state !== "published" && latest.state !== "retracted") {
      throw new AppError(
        "conflict",
        `Version ${latest.number} is still ${latest.state.replace("_", " ")}; finish it before starting another`,
      );
    }
    const points = await tx.select().from(versionPoints).where(eq(versionPoints.versionId, latest.id)).orderBy(versionPoints.idx);
    const [analysis] = await tx
      .select()
      .from(versionAnalyses)
      .where(eq(versionAnalyses.versionId, latest.id))
      .orderBy(desc(versionAnalyses.id))
      .limit(1);
    const stored: StoredPoint[] = points.map((p) => ({
      T: p.temperatureK,
      k: p.rateConstant,
      sigmaLnK: p.sigmaLnK ?? undefined,
      pressurePa: p.pressurePa ?? undefined,
      bathGas: p.bathGas ?? undefined,
      note: p.note ?? undefined,
      original: p.original,
    }));
    const summary: AnalysisSummary = {
      engineVersion: analysis?.engineVersion ?? "unknown",
      result: analysis?.result ?? null,
      checks: analysis?.checks ?? [],
      error: analysis?.error,
    };
    const [version] = await tx
      .insert(datasetVersions)
      .values({
        datasetId,
        number: latest.number + 1,
        title: latest.title,
        reactionId: latest.reactionId,
        payload: withCurrentReactionClass(latest.payload),
        participantNames: latest.participantNames,
        createdBy: actorId,
        ...summarise(stored, summary),
      })
      .returning(versionColumns);
    await writePointsAndAnalysis(tx, version.id, stored, summary);
    // Files are immutable objects: the new draft lists the same ones (removal keeps shared objects).
    const files = await tx.select().from(versionFiles).where(eq(versionFiles.versionId, latest.id));
    if (files.length) {
      await tx.insert(versionFiles).values(
        files.map((f) => ({
          versionId: version.id,
          filename: f.filename,
          contentType: f.contentType,
          sizeBytes: f.sizeBytes,
          sha256: f.sha256,
          storageKey: f.storageKey,
        })),
      );
    }
    await recordAuditEvent(tx, {
      actorId,
      action: "dataset.version_started",
      subjectType: "dataset_version",
      subjectId: version.id,
      details: { from: latest.id, number: version.number },
    });
    await beforeCommit?.(tx, version);
    return version;
  });
}

/** The public versions of a dataset, newest first (published or retracted only). */
export async function listPublicVersions({ datasetId }: { datasetId: number }) {
  return getDb()
    .select({
      id: datasetVersions.id,
      number: datasetVersions.number,
      state: datasetVersions.state,
      versionIdentifier: datasetVersions.versionIdentifier,
      publishedAt: datasetVersions.publishedAt,
      retractedAt: datasetVersions.retractedAt,
    })
    .from(datasetVersions)
    .where(and(eq(datasetVersions.datasetId, datasetId), inArray(datasetVersions.state, ["published", "retracted"])))
    .orderBy(desc(datasetVersions.number));
}

/** A dataset's series identifier (the reaction belongs to each version: `VersionDto.reactionId`). */
export async function getDatasetSummary({ datasetId }: { datasetId: number }) {
  const [row] = await getDb()
    .select({ id: datasets.id, seriesIdentifier: datasets.seriesIdentifier })
    .from(datasets)
    .where(eq(datasets.id, datasetId));
  return row ?? null;
}

/**
 * Adds a re-fit's analysis to a version (published ones included) through the database function
 * that alone may (drizzle/0011): append-only, and only when the newest analysis came from another
 * engine version. Not appended when the version is already fitted by `engineVersion`; a public
 * version's appended fit comes with the invalidation it owes its pages (db/owed-invalidations.ts).
 */
export async function appendRefitAnalysis({
  versionId,
  engineVersion,
  result,
  checks,
  error,
}: {
  versionId: number;
  engineVersion: string;
  result: Record<string, unknown> | null;
  checks: AnalysisSummary["checks"];
  error?: string;
}): Promise<{ appended: false } | { appended: true; invalidation: { tags: string[]; owed: number } | null }> {
  try {
    const invalidation = await getDb().transaction(async (tx) => {
      await tx.execute(
        sql`select arrhenia_append_refit_analysis(${versionId}, ${engineVersion}, ${result === null ? null : JSON.stringify(result)}::jsonb, ${JSON.stringify(checks)}::jsonb, ${error ?? null})`,
      );
      // A public version's search document carries the re-fit's Ea, A and flags: rewritten in the same transaction.
      const [v] = await tx.select({ state: datasetVersions.state }).from(datasetVersions).where(eq(datasetVersions.id, versionId));
      if (v?.state !== "published" && v?.state !== "retracted") return null;
      await buildSearchDocument(tx, versionId);
      // Its pages show the newest fit (or none, when it failed): invalidated once committed, owed until then.
      const tags = await listVersionCacheTags({ versionId, db: tx });
      return { tags, owed: await oweInvalidation(tx, tags) };
    });
    return { appended: true, invalidation };
  } catch (err) {
    // Another run of the job fitted it meanwhile.
    if ((err as { code?: string }).code === "23505" || (err as { cause?: { code?: string } }).cause?.code === "23505")
      return { appended: false };
    throw err;
  }
}

/** A published document may carry a retired reaction-class id; its next version starts with the current one. */
function withCurrentReactionClass(payload: Record<string, unknown>): Record<string, unknown> {
  const reaction = payload.reaction as { class?: unknown } | undefined;
  const current = reactionClassFor(reaction?.class);
  if (!reaction || !current || current.id === reaction.class) return payload;
  return { ...payload, reaction: { ...reaction, class: current.id } };
}
