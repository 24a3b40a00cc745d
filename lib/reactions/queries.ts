import "server-only";
import { and, eq, inArray, sql } from "drizzle-orm";
import { getDb, type Database, type Transaction } from "@/db/client";
import { reactionParticipants, reactions, species } from "@/db/chemistry";
import { consensusExclusions } from "@/db/consensus";
import { datasetMembers, datasetVersions, versionAnalyses, versionPoints } from "@/db/datasets";
import { searchReactionSummaries } from "@/db/search";
import { recordAuditEvent } from "@/lib/audit/record";
import { AppError } from "@/lib/errors";
import { writeReactionSummary } from "@/lib/search/documents";
import { oweInvalidation } from "@/db/owed-invalidations";
import { reactionTag, SEARCH_TAG } from "@/lib/public-cache";
import type { CuratorExclusion } from "./consensus-selection";
import { reactionDisplayEquation, speciesDisplayName } from "./display-names";

/** What the consensus reads of a version's document: its method category and reaction order. */
export type ConsensusPayload = { method: { category?: unknown }; reaction: { order?: unknown } };

/**
 * The version is its dataset's newest public one. Each version carries its own reaction, so a
 * dataset appears under the reaction of its newest public version, and no draft moves it.
 */
const isNewestPublic = and(
  inArray(datasetVersions.state, ["published", "retracted"]),
  sql`not exists (select 1 from dataset_versions newer where newer.dataset_id = ${datasetVersions.datasetId} and newer.state in ('published', 'retracted') and newer.number > ${datasetVersions.number})`,
);

/** A reaction with its species (and the names people gave them). */
export async function getReaction({ id, versionId }: { id: number; versionId?: number }) {
  const db = getDb();
  const [reaction] = await db
    .select({ id: reactions.id, key: reactions.key, equation: sql<string>`${reactionDisplayEquation(sql`${reactions.id}`)}` })
    .from(reactions)
    .where(eq(reactions.id, id));
  if (!reaction) return null;
  const participants = await db
    .select({
      side: reactionParticipants.side,
      coefficient: reactionParticipants.coefficient,
      speciesId: species.id,
      formula: species.formula,
      charge: species.charge,
      smiles: species.canonicalSmiles,
      inchiKey: species.inchiKey,
      molarMass: species.molarMass,
      /** The one name the species is shown by (lib/reactions/display-names.ts). */
      name: sql<string>`${speciesDisplayName(sql`${species.id}`, sql`${species.formula}`)}`,
      /** The name one version's document gave the species (`versionId` given), else null. */
      versionName: versionId
        ? sql<string | null>`(select e->>'name' from ${datasetVersions} v, jsonb_array_elements(v.participant_names) e
            where v.id = ${versionId} and (e->>'speciesId')::int = ${species.id} limit 1)`
        : sql<string | null>`null`,
      // Names come from the published versions of this reaction, the newest first: a draft never renames a species.
      names: sql<string[]>`coalesce((
        select array_agg(name order by newest desc, name) from (
          select e->>'name' as name, max(v.published_at) as newest
          from ${datasetVersions} v, jsonb_array_elements(v.participant_names) e
          where v.reaction_id = ${id} and v.state in ('published', 'retracted') and (e->>'speciesId')::int = ${species.id}
          group by e->>'name') named), '{}')`,
    })
    .from(reactionParticipants)
    .innerJoin(species, eq(species.id, reactionParticipants.speciesId))
    .where(eq(reactionParticipants.reactionId, id));
  return { ...reaction, participants };
}

/**
 * The newest public version (published or retracted) of every dataset whose newest public version
 * describes this reaction, with its stored points and what the consensus and the reaction page use
 * of its document and newest analysis — never the whole of either: from the document the method
 * category and the reaction order; from the analysis its outlier flag (the points its own fit
 * flagged) and the activation energy of its Arrhenius fit when that fit can be drawn. A reaction
 * with hundreds of datasets otherwise carried every band and residual of every analysis through
 * the page's data cache.
 */
export async function listPublicVersionsOfReaction({ reactionId, db = getDb() }: { reactionId: number; db?: Transaction | Database }) {
  return (await listPublicVersionsOfReactions({ reactionIds: [reactionId], db })).get(reactionId) ?? [];
}

/**
 * The same for many reactions in three statements (a mechanism check reads thousands of reactions: one round trip
 * each was most of its time). Every reaction asked for is in the map, with no versions when it has none.
 */
export async function listPublicVersionsOfReactions({
  reactionIds,
  db = getDb(),
}: {
  reactionIds: readonly number[];
  db?: Transaction | Database;
}) {
  const versions = reactionIds.length
    ? await db
        .select({
          reactionId: datasetVersions.reactionId,
          versionId: datasetVersions.id,
          datasetId: datasetVersions.datasetId,
          number: datasetVersions.number,
          title: datasetVersions.title,
          state: datasetVersions.state,
          versionIdentifier: datasetVersions.versionIdentifier,
          tMin: datasetVersions.tMin,
          tMax: datasetVersions.tMax,
          pointCount: datasetVersions.pointCount,
          payload: sql<ConsensusPayload>`jsonb_build_object(
        'method', jsonb_build_object('category', ${datasetVersions.payload} -> 'method' -> 'category'),
        'reaction', jsonb_build_object('order', ${datasetVersions.payload} -> 'reaction' -> 'order'))`,
        })
        .from(datasetVersions)
        .where(and(inArray(datasetVersions.reactionId, [...reactionIds]), isNewestPublic))
        .orderBy(datasetVersions.datasetId)
    : [];
  const ids = versions.map((v) => v.versionId);
  const points = ids.length
    ? await db
        .select({
          versionId: versionPoints.versionId,
          T: versionPoints.temperatureK,
          k: versionPoints.rateConstant,
          sigmaLnK: versionPoints.sigmaLnK,
        })
        .from(versionPoints)
        .where(inArray(versionPoints.versionId, ids))
        .orderBy(versionPoints.versionId, versionPoints.idx)
    : [];
  // The stored result is read out of line once per row (the `||` makes one in-memory copy that every
  // expression below reads): each `->` on the stored value read it again, seven times a row (a reaction
  // of 692 datasets: 125 → 36 ms in PostgreSQL). `r` is the stored value for any JSON (null stays null).
  const analyses = ids.length
    ? (
        await db.execute<{ version_id: number; summary: { flags?: unknown[] } | null; ea: number | null }>(sql`
          select distinct on (a.version_id) a.version_id,
            -- Only the outlier flag (storedOutliers in ./consensus-selection.ts); no flag list at all stays absent.
            case when d.r is null then null
              when jsonb_typeof(d.r -> 'flags') = 'array' then jsonb_build_object('flags', coalesce(
                (select jsonb_agg(f) from jsonb_array_elements(d.r -> 'flags') f where f ->> 'code' = 'outlier'), '[]'::jsonb))
              else '{}'::jsonb end as summary,
            -- As drawableFit (lib/datasets/version-json.ts) decides: a fit with parameters and a band of two or more temperatures.
            case when jsonb_typeof(d.r -> 'arrhenius' -> 'params') = 'object'
              and jsonb_typeof(d.r -> 'band' -> 'T') = 'array' and jsonb_array_length(d.r -> 'band' -> 'T') > 1
              then (d.r -> 'arrhenius' -> 'params' ->> 'Ea')::float8 end as ea
          from ${versionAnalyses} a
          cross join lateral (select a.result || '{}'::jsonb as r offset 0) d
          where a.version_id in ${sql`(${sql.join(
            ids.map((id) => sql`${id}`),
            sql`, `,
          )})`}
          order by a.version_id, a.id desc`)
      ).map((row) => ({ versionId: Number(row.version_id), summary: row.summary, ea: row.ea === null ? null : Number(row.ea) }))
    : [];
  const pointsOf = new Map<number, { T: number; k: number; sigmaLnK?: number }[]>();
  for (const p of points) {
    const list = pointsOf.get(p.versionId) ?? [];
    list.push({ T: p.T, k: p.k, ...(p.sigmaLnK !== null ? { sigmaLnK: p.sigmaLnK } : {}) });
    pointsOf.set(p.versionId, list);
  }
  const analysisOf = new Map(analyses.map((a) => [a.versionId, a]));
  const withData = (row: (typeof versions)[number]) => {
    const { reactionId, ...v } = row;
    void reactionId; // the map's key, not part of a version
    return {
      ...v,
      points: pointsOf.get(v.versionId) ?? [],
      analysis: analysisOf.get(v.versionId)?.summary ?? null,
      /** Activation energy (J/mol) of the dataset's own Arrhenius fit, when it can be drawn. */
      ea: analysisOf.get(v.versionId)?.ea ?? null,
    };
  };
  const out = new Map(reactionIds.map((id) => [id, [] as ReturnType<typeof withData>[]]));
  for (const v of versions) if (v.reactionId !== null) out.get(v.reactionId)?.push(withData(v));
  return out;
}

/** Reactions that have at least one public dataset, with their counts (for listings). */
export async function listReactionsWithPublicData() {
  return getDb()
    .select({
      id: reactions.id,
      key: reactions.key,
      equation: sql<string>`${reactionDisplayEquation(sql`${reactions.id}`)}`,
      datasets: sql<number>`count(distinct ${datasetVersions.datasetId})::int`,
    })
    .from(reactions)
    .innerJoin(datasetVersions, and(eq(datasetVersions.reactionId, reactions.id), isNewestPublic, eq(datasetVersions.state, "published")))
    .groupBy(reactions.id)
    .orderBy(sql`3`);
}

/**
 * Live figures for the home page: published datasets, the reactions they cover, their points. Each
 * dataset counts once, by its newest public version, as the reactions list shows it: a revised
 * dataset's earlier versions (still published, still citable) add no points of their own, and a
 * dataset whose newest version was retracted is not counted.
 */
export async function countPublicData() {
  const [row] = await getDb().execute<{ datasets: number; reactions: number; points: string }>(sql`
    with newest as (
      select distinct on (v.dataset_id) v.dataset_id, v.reaction_id, v.point_count, v.state
      from dataset_versions v where v.state in ('published', 'retracted') order by v.dataset_id, v.number desc)
    select count(*)::int as datasets, count(distinct reaction_id)::int as reactions, coalesce(sum(point_count), 0)::bigint::text as points
    from newest where state = 'published'`);
  return { datasets: Number(row?.datasets ?? 0), reactions: Number(row?.reactions ?? 0), points: Number(row?.points ?? 0) };
}

/** The consensus kept with the reaction's search summary (lib/reactions/stored-consensus.ts), as stored; null when none. */
export async function readKeptConsensus({ reactionId, db = getDb() }: { reactionId: number; db?: Database | Transaction }) {
  const [row] = await db
    .select({ kept: searchReactionSummaries.consensusResult })
    .from(searchReactionSummaries)
    .where(eq(searchReactionSummaries.reactionId, reactionId));
  return (row?.kept ?? null) as unknown;
}

/** Curators' exclusions from the consensus of one reaction (the versions that describe it). */
export async function listConsensusExclusions({
  reactionId,
  db = getDb(),
}: {
  reactionId: number;
  db?: Transaction | Database;
}): Promise<CuratorExclusion[]> {
  return (await listConsensusExclusionsOfReactions({ reactionIds: [reactionId], db })).get(reactionId) ?? [];
}

/** The same for many reactions in one statement; every reaction asked for is in the map. */
export async function listConsensusExclusionsOfReactions({
  reactionIds,
  db = getDb(),
}: {
  reactionIds: readonly number[];
  db?: Transaction | Database;
}): Promise<Map<number, CuratorExclusion[]>> {
  const out = new Map(reactionIds.map((id) => [id, [] as CuratorExclusion[]]));
  if (!reactionIds.length) return out;
  const rows = await db
    .select({
      reactionId: datasetVersions.reactionId,
      versionId: consensusExclusions.versionId,
      reason: consensusExclusions.reason,
      excludedAt: consensusExclusions.excludedAt,
    })
    .from(consensusExclusions)
    .innerJoin(datasetVersions, eq(datasetVersions.id, consensusExclusions.versionId))
    .where(inArray(datasetVersions.reactionId, [...reactionIds]))
    .orderBy(consensusExclusions.versionId);
  for (const { reactionId, ...e } of rows) if (reactionId !== null) out.get(reactionId)?.push(e);
  return out;
}

/** The version, locked against a concurrent retraction until the transaction ends; 409 unless published. */
async function lockPublishedVersion(tx: Transaction, versionId: number) {
  const [row] = await tx
    .select({ state: datasetVersions.state, reactionId: datasetVersions.reactionId })
    .from(datasetVersions)
    .where(eq(datasetVersions.id, versionId))
    .for("share");
  if (!row) throw new AppError("not_found", "No such dataset version");
  if (row.state !== "published") throw new AppError("conflict", "Only published versions enter a consensus");
  return row;
}

/**
 * Leaves a published version out of its reaction's consensus with a reason (or changes the reason),
 * audited in the same transaction. Touches nothing of the version itself.
 */
export async function saveConsensusExclusion({ versionId, actorId, reason }: { versionId: number; actorId: number; reason: string }) {
  return getDb().transaction(async (tx) => {
    const { reactionId } = await lockPublishedVersion(tx, versionId);
    const [before] = await tx
      .select({ reason: consensusExclusions.reason })
      .from(consensusExclusions)
      .where(eq(consensusExclusions.versionId, versionId))
      .for("update");
    await tx
      .insert(consensusExclusions)
      .values({ versionId, reason, excludedBy: actorId })
      .onConflictDoUpdate({ target: consensusExclusions.versionId, set: { reason, excludedBy: actorId, excludedAt: sql`now()` } });
    await recordAuditEvent(tx, {
      actorId,
      action: before ? "consensus.exclusion_changed" : "consensus.excluded",
      subjectType: "dataset_version",
      subjectId: versionId,
      details: { reactionId, reason, ...(before ? { previousReason: before.reason } : {}) },
    });
    // The reactions view of search shows this consensus: rewritten with the exclusion.
    if (reactionId !== null) await writeReactionSummary(tx, reactionId);
    return { reactionId, changed: !!before, invalidation: await oweConsensusInvalidation(tx, reactionId) };
  });
}

/** Takes a version back into its reaction's consensus, audited; 409 when it was not left out. */
export async function deleteConsensusExclusion({ versionId, actorId }: { versionId: number; actorId: number }) {
  return getDb().transaction(async (tx) => {
    const { reactionId } = await lockPublishedVersion(tx, versionId);
    const [removed] = await tx
      .delete(consensusExclusions)
      .where(eq(consensusExclusions.versionId, versionId))
      .returning({ reason: consensusExclusions.reason });
    if (!removed) throw new AppError("conflict", "This version is not left out of the consensus");
    await recordAuditEvent(tx, {
      actorId,
      action: "consensus.included",
      subjectType: "dataset_version",
      subjectId: versionId,
      details: { reactionId, previousReason: removed.reason },
    });
    if (reactionId !== null) await writeReactionSummary(tx, reactionId);
    return { reactionId, invalidation: await oweConsensusInvalidation(tx, reactionId) };
  });
}

/**
 * The pages a consensus change shows on (the reaction's, its datasets', its species', search),
 * owed from the change's transaction (db/owed-invalidations.ts): made by the caller once committed,
 * or by the front server's sweep if the caller never gets to it.
 */
async function oweConsensusInvalidation(tx: Transaction, reactionId: number | null) {
  if (reactionId === null) return null;
  const tags = [reactionTag(reactionId), SEARCH_TAG];
  return { tags, owed: await oweInvalidation(tx, tags) };
}

/** The person's role on each of these datasets (absent when they hold none), for per-version capabilities. */
export async function listDatasetRolesOf({ userId, datasetIds }: { userId: number; datasetIds: number[] }) {
  if (!datasetIds.length) return new Map<number, (typeof datasetMembers.$inferSelect)["role"]>();
  const rows = await getDb()
    .select({ datasetId: datasetMembers.datasetId, role: datasetMembers.role })
    .from(datasetMembers)
    .where(and(eq(datasetMembers.userId, userId), inArray(datasetMembers.datasetId, datasetIds)));
  return new Map(rows.map((r) => [r.datasetId, r.role]));
}
