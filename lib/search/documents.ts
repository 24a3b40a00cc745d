import "server-only";
import { and, desc, eq, getTableColumns, sql } from "drizzle-orm";
import { getDb, type Transaction } from "@/db/client";
import { reactionParticipants, reactions, species, speciesNames } from "@/db/chemistry";
import { datasetVersions, versionAnalyses } from "@/db/datasets";
import { searchDocuments, searchReactionSummaries } from "@/db/search";
import { reactionClassFor } from "@/lib/deposits/vocabulary";
import { getCanonicalRateConstantUnit, type ReactionOrder } from "@/lib/kinetics";
import { DEFAULT_CONSENSUS_CHOICE, runSelectedConsensus, selectConsensusDatasets } from "@/lib/reactions/consensus-selection";
import { listConsensusExclusions, listPublicVersionsOfReaction } from "@/lib/reactions/queries";
import { ENGINE_VERSION } from "@/lib/datasets/prepare";
import { comparisonBasisOf } from "@/lib/mechanisms/judge";
import type { StoredComparisonBasis } from "@/lib/mechanisms/stored-basis";
import { storedConsensusOf, type StoredConsensus } from "@/lib/reactions/stored-consensus";
import type { ReactionHit, SearchFlag } from "./types";
import { datasetSpread, preferredFitOf } from "./spread";
import { recordSearchChange } from "@/lib/search/outbox";
import { movePublicPagesMark } from "@/db/public-pages-mark";

/**
 * The PostgreSQL engine's documents: `buildSearchDocument` (re)writes the one of a version inside
 * the caller's transaction — acceptance, retraction and re-fit call it (lib/curation/transitions.ts,
 * lib/datasets/refit.ts), so the document commits or rolls back with the change — and keeps
 * `latest` and the reaction summary of the reactions view in step. `rebuildSearchDocuments` is the
 * backfill (`npm run search:reindex`, scripts/migrate.ts after migrating, the web benchmark's
 * fill): the same builder over batches of versions, so there is one definition of a document.
 */

/** Analysis flag codes (lib/kinetics) and stored check codes behind each search flag. */
const FLAG_CODES: Record<Exclude<SearchFlag, "none">, string[]> = {
  outliers: ["outlier"],
  curved: ["curvature"],
  // A per-dataset unit suspicion: k outside the usual range for its order (lib/datasets/prepare-document.ts).
  unit_suspect: ["implausible_magnitude"],
  reported_disagrees: ["reported_fit_disagrees"],
};

/** The search flags of a version from its flag codes; "none" when it has none of the others. */
export function searchFlagsOf(codes: readonly string[]): SearchFlag[] {
  const flags = (Object.keys(FLAG_CODES) as Exclude<SearchFlag, "none">[]).filter((f) => FLAG_CODES[f].some((c) => codes.includes(c)));
  return flags.length ? flags : ["none"];
}

interface CslName {
  family?: string;
  given?: string;
  literal?: string;
}

/** The source publication in one line (authors, title, container, year, DOI), and its year. */
export function describeSource(source: unknown): { line: string; year: number | null } {
  const s = (source ?? {}) as { doi?: string; reference?: Record<string, unknown> };
  const ref = s.reference ?? {};
  const authors = ((ref.author as CslName[] | undefined) ?? [])
    .map((a) => a.literal ?? [a.given, a.family].filter(Boolean).join(" "))
    .filter(Boolean);
  const issued = (ref.issued as { "date-parts"?: unknown[][] } | undefined)?.["date-parts"]?.[0]?.[0];
  const year =
    typeof issued === "number" && Number.isInteger(issued)
      ? issued
      : typeof issued === "string" && /^\d{4}$/.test(issued)
        ? Number(issued)
        : null;
  const parts = [authors.join(", "), ref.title, ref["container-title"], year, s.doi ?? ref.DOI].filter(
    (p) => p !== undefined && p !== null && p !== "",
  );
  return { line: parts.map(String).join(". "), year };
}

/** Versions per statement of the bulk builder (38 parameters a row stay under PostgreSQL's 65 535). */
const BATCH = 1000;
/** Reactions per transaction when their summaries are rewritten in bulk. */
const SUMMARY_BATCH = 200;

/** A literal PostgreSQL integer array of ids (numbers only), for `= any(…::int[])`. */
const idArray = (ids: readonly number[]) => `{${ids.map((id) => Math.trunc(Number(id))).join(",")}}`;

/** The columns the builder writes, in snake_case as stored (the client's casing), with their types. */
const writtenColumns = Object.entries(getTableColumns(searchDocuments))
  .filter(([key]) => !["tSpan", "document", "head", "namesText"].includes(key))
  .map(([key, column]) => ({ key, name: key.replace(/[A-Z]/g, (c) => `_${c.toLowerCase()}`), type: column.getSQLType() }));
/**
 * On conflict, every written column but `latest` (refreshLatest sets it right after) takes the new
 * row's value, and only when one differs: rebuilding an unchanged document writes nothing (no
 * index maintenance). The generated ones (t_span, document, head, names_text) follow.
 */
const replaced = writtenColumns.filter((c) => !["versionId", "latest"].includes(c.key)).map((c) => c.name);
/**
 * Inserts or replaces document rows in one statement whatever their number: the rows travel as one
 * JSON parameter read by jsonb_to_recordset (numbers keep their shortest round-trip digits, so
 * every double arrives exactly), not as tens of thousands of bound parameters.
 */
const upsertDocuments = (rows: (typeof searchDocuments.$inferInsert)[]) =>
  sql`insert into search_documents (${sql.raw(writtenColumns.map((c) => c.name).join(", "))})
    select ${sql.raw(writtenColumns.map((c) => c.name).join(", "))}
    from jsonb_to_recordset(${JSON.stringify(rows.map((r) => Object.fromEntries(writtenColumns.map((c) => [c.name, r[c.key as keyof typeof r] ?? null]))))}::jsonb)
      as x(${sql.raw(writtenColumns.map((c) => `${c.name} ${c.type}`).join(", "))})
    on conflict (version_id) do update set ${sql.raw(replaced.map((c) => `${c} = excluded.${c}`).join(", "))}
    where (${sql.raw(replaced.map((c) => `search_documents.${c}`).join(", "))}) is distinct from (${sql.raw(replaced.map((c) => `excluded.${c}`).join(", "))})`;

/**
 * Writes the search documents of these versions as they now stand — the one definition of a
 * document, used by the publishing transaction (one version) and by the bulk rebuild (a batch):
 * five set-based reads for the whole batch, one insert … on conflict (rows that changed only), one delete of the versions
 * no longer public. `latest` and the summaries are left to the caller. Returns the dataset ids
 * of the versions (to refresh `latest`).
 */
async function writeDocuments(tx: Transaction, versionIds: readonly number[]): Promise<number[]> {
  if (!versionIds.length) return [];
  const ids = idArray(versionIds);
  const versions = await tx
    .select({
      id: datasetVersions.id,
      datasetId: datasetVersions.datasetId,
      number: datasetVersions.number,
      state: datasetVersions.state,
      title: datasetVersions.title,
      payload: datasetVersions.payload,
      reactionId: datasetVersions.reactionId,
      versionIdentifier: datasetVersions.versionIdentifier,
      publishedAt: datasetVersions.publishedAt,
      tMin: datasetVersions.tMin,
      tMax: datasetVersions.tMax,
      pointCount: datasetVersions.pointCount,
      reactionKey: reactions.key,
      equation: reactions.equation,
    })
    .from(datasetVersions)
    .leftJoin(reactions, eq(reactions.id, datasetVersions.reactionId))
    .where(sql`${datasetVersions.id} = any(${ids}::int[])`);
  const publicVersions = versions.filter(
    (v) =>
      (v.state === "published" || v.state === "retracted") &&
      v.reactionId !== null &&
      v.publishedAt !== null &&
      v.tMin !== null &&
      v.tMax !== null &&
      v.reactionKey !== null,
  );
  const publicIds = idArray(publicVersions.map((v) => v.id));
  const reactionIds = idArray([...new Set(publicVersions.map((v) => v.reactionId!))]);
  const participants = await tx
    .select({
      reactionId: reactionParticipants.reactionId,
      side: reactionParticipants.side,
      speciesId: species.id,
      inchiKey: species.inchiKey,
      formula: species.formula,
    })
    .from(reactionParticipants)
    .innerJoin(species, eq(species.id, reactionParticipants.speciesId))
    .where(sql`${reactionParticipants.reactionId} = any(${reactionIds}::int[])`)
    .orderBy(reactionParticipants.reactionId, reactionParticipants.speciesId, reactionParticipants.side);
  const names = await tx
    .select({ speciesId: speciesNames.speciesId, name: speciesNames.name })
    .from(speciesNames)
    .where(sql`${speciesNames.speciesId} = any(${idArray([...new Set(participants.map((p) => p.speciesId))])}::int[])`)
    // In the order they were recorded (a species' own name first, as its deposit gave it).
    .orderBy(sql`ctid`);
  const analyses = await tx
    .selectDistinctOn([versionAnalyses.versionId], {
      versionId: versionAnalyses.versionId,
      result: versionAnalyses.result,
      checks: versionAnalyses.checks,
    })
    .from(versionAnalyses)
    .where(sql`${versionAnalyses.versionId} = any(${publicIds}::int[])`)
    .orderBy(versionAnalyses.versionId, desc(versionAnalyses.id));
  const conditions = await tx.execute<{ version_id: number; p_min: number | null; p_max: number | null; bath_gases: string[] | null }>(sql`
    select version_id, min(pressure_pa) as p_min, max(pressure_pa) as p_max,
      array_agg(distinct bath_gas) filter (where bath_gas is not null) as bath_gases
    from version_points where version_id = any(${publicIds}::int[]) group by version_id`);

  const group = <T, K>(xs: T[], key: (x: T) => K) => {
    const m = new Map<K, T[]>();
    for (const x of xs) m.set(key(x), [...(m.get(key(x)) ?? []), x]);
    return m;
  };
  const participantsOf = group(participants, (p) => p.reactionId);
  const namesOfReaction = new Map<number, typeof names>();
  const reactionNames = (reactionId: number, parts: typeof participants) => {
    if (!namesOfReaction.has(reactionId)) {
      const ofReaction = new Set(parts.map((p) => p.speciesId));
      namesOfReaction.set(
        reactionId,
        names.filter((n) => ofReaction.has(n.speciesId)),
      );
    }
    return namesOfReaction.get(reactionId)!;
  };
  const analysisOf = new Map(analyses.map((a) => [a.versionId, a]));
  const conditionsOf = new Map(conditions.map((c) => [Number(c.version_id), c]));
  const rows = publicVersions.map((v) => {
    const parts = participantsOf.get(v.reactionId!) ?? [];
    return documentRow({
      ...v,
      reactionId: v.reactionId!,
      publishedAt: v.publishedAt!,
      tMin: v.tMin!,
      tMax: v.tMax!,
      reaction: { key: v.reactionKey!, equation: v.equation! },
      participants: parts,
      names: reactionNames(v.reactionId!, parts),
      analysis: analysisOf.get(v.id),
      conditions: conditionsOf.get(v.id),
    });
  });
  if (rows.length) await tx.execute(upsertDocuments(rows));
  const written = new Set(rows.map((r) => r.versionId));
  const gone = versionIds.filter((id) => !written.has(id));
  if (gone.length) await tx.delete(searchDocuments).where(sql`${searchDocuments.versionId} = any(${idArray(gone)}::int[])`);
  return [...new Set(versions.map((v) => v.datasetId))];
}

/**
 * Writes the search document of one version as it now stands: inserted or replaced while the
 * version is published or retracted, removed otherwise; then `latest` of its dataset's documents
 * and the summaries of the reactions concerned. Call it inside the transaction of the change.
 * Returns the ids of the species whose display name it changed (their `name:<id>` tag, lib/public-cache.ts).
 */
export async function buildSearchDocument(
  tx: Transaction,
  versionId: number,
  { summaries = true }: { summaries?: boolean } = {},
): Promise<number[]> {
  const [v] = await tx
    .select({ datasetId: datasetVersions.datasetId, reactionId: datasetVersions.reactionId })
    .from(datasetVersions)
    .where(eq(datasetVersions.id, versionId));
  const reactionsBefore = await tx
    .selectDistinct({ reactionId: searchDocuments.reactionId })
    .from(searchDocuments)
    .where(eq(searchDocuments.datasetId, v?.datasetId ?? -1));
  await writeDocuments(tx, [versionId]);
  // The Meilisearch outbox (when a service is configured) commits with the same change.
  await recordSearchChange(tx, versionId);
  if (!v) return [];
  await refreshLatest(tx, [v.datasetId]);
  if (!summaries) return v.reactionId !== null ? writeSpeciesDisplayNames(tx, { reactionIds: [v.reactionId] }) : [];
  const affected = new Set([...reactionsBefore.map((r) => r.reactionId), ...(v.reactionId !== null ? [v.reactionId] : [])]);
  const renamed = await writeSpeciesDisplayNames(tx, { reactionIds: [...affected] });
  await writeReactionSummaries(tx, [...affected]);
  return renamed;
}

/**
 * Rewrites the display name (db/search.ts speciesDisplayNames) of the species of these reactions,
 * or of every species: the name their public versions give them most often, ties broken by the
 * lower-case then the exact spelling (drizzle/0024 backfills by the same rule); a species no
 * public version names loses its row and is shown by its formula. Returns the ids of the species
 * whose name it wrote, changed or took away.
 */
export async function writeSpeciesDisplayNames(tx: Transaction, of: { reactionIds: readonly number[] } | "all"): Promise<number[]> {
  if (of !== "all" && !of.reactionIds.length) return [];
  const ids =
    of === "all"
      ? sql`select id as sid from species`
      : sql`select distinct species_id as sid from reaction_participants where reaction_id = any(${idArray(of.reactionIds)}::int[])`;
  // Per species, only the versions that name it (GIN on participant_names, drizzle/0024); one pass over all of them for a full rebuild.
  const uses =
    of === "all"
      ? sql`select (e->>'speciesId')::int as sid, e->>'name' as name, count(*) as uses
          from dataset_versions v cross join lateral jsonb_array_elements(v.participant_names) e
          where v.state in ('published', 'retracted') and coalesce(e->>'name', '') <> ''
            and (e->>'speciesId')::int in (select sid from ids)
          group by 1, 2`
      : sql`select ids.sid, e->>'name' as name, count(*) as uses
          from ids join dataset_versions v on v.participant_names @> jsonb_build_array(jsonb_build_object('speciesId', ids.sid))
          cross join lateral jsonb_array_elements(v.participant_names) e
          where v.state in ('published', 'retracted') and (e->>'speciesId')::int = ids.sid and coalesce(e->>'name', '') <> ''
          group by 1, 2`;
  const changed = await tx.execute<{ sid: number }>(sql`
    with ids as (${ids}), named as (
      select distinct on (sid) sid, name from (${uses}) x
      order by sid, uses desc, lower(name), name
    ), gone as (
      delete from species_display_names d where d.species_id in (select sid from ids)
        and not exists (select 1 from named where named.sid = d.species_id)
      returning d.species_id as sid
    ), written as (
      insert into species_display_names (species_id, name) select sid, name from named
      on conflict (species_id) do update set name = excluded.name where species_display_names.name is distinct from excluded.name
      returning species_id as sid
    )
    select sid from gone union select sid from written`);
  return changed.map((r) => Number(r.sid));
}

/** Marks the newest public version of each dataset as its listed document, every older one not. */
async function refreshLatest(tx: Transaction, datasetIds: readonly number[]) {
  if (!datasetIds.length) return;
  await tx.execute(sql`
    update search_documents d set latest = (d.version_number = m.newest)
    from (select dataset_id, max(version_number) as newest from search_documents
          where dataset_id = any(${idArray(datasetIds)}::int[]) group by dataset_id) m
    where d.dataset_id = m.dataset_id and d.latest is distinct from (d.version_number = m.newest)`);
}

/** A version's document from its stored parts (a pure function of what writeDocuments read). */
function documentRow(v: {
  id: number;
  datasetId: number;
  number: number;
  state: string;
  title: string;
  payload: Record<string, unknown>;
  reactionId: number;
  versionIdentifier: string | null;
  publishedAt: Date;
  tMin: number;
  tMax: number;
  pointCount: number;
  reaction: { key: string; equation: string };
  participants: { side: string; inchiKey: string; formula: string }[];
  names: { name: string }[];
  analysis: { result: unknown; checks: { code: string }[] } | undefined;
  conditions: { p_min: number | null; p_max: number | null; bath_gases: string[] | null } | undefined;
}): typeof searchDocuments.$inferInsert {
  const { reaction, participants, names, analysis, conditions } = v;
  const p = v.payload as {
    description?: string;
    keywords?: string[];
    license?: string;
    creators?: { name: string }[];
    reaction?: { class?: string; phase?: string; order?: ReactionOrder };
    method?: { category?: string; technique?: string };
    source?: unknown;
  };
  const result = analysis?.result as { arrhenius?: { params?: { A: number | null; Ea: number } }; flags?: { code: string }[] } | null;
  const codes = [...(analysis?.checks ?? []).map((c) => c.code), ...(result?.flags ?? []).map((f) => f.code)];
  const source = describeSource(p.source);
  const order = p.reaction?.order;
  const fit = result?.arrhenius?.params;
  const uniq = (xs: string[]) => [...new Set(xs.filter(Boolean))];
  return {
    versionId: v.id,
    datasetId: v.datasetId,
    versionNumber: v.number,
    // Set by refreshLatest right after.
    latest: false,
    retracted: v.state === "retracted",
    versionIdentifier: v.versionIdentifier,
    title: v.title,
    description: p.description ?? "",
    keywords: p.keywords ?? [],
    creators: (p.creators ?? []).map((c) => c.name),
    technique: p.method?.technique ?? "",
    source: source.line,
    sourceYear: source.year,
    reactionId: v.reactionId,
    reactionKey: reaction.key,
    equation: reaction.equation,
    reactantKeys: uniq(participants.filter((x) => x.side === "reactant").map((x) => x.inchiKey)),
    productKeys: uniq(participants.filter((x) => x.side === "product").map((x) => x.inchiKey)),
    speciesNames: uniq(names.map((n) => n.name)),
    formulas: uniq(participants.map((x) => x.formula)),
    reactionClass: reactionClassFor(p.reaction?.class)?.id ?? p.reaction?.class ?? "other",
    phase: p.reaction?.phase ?? "gas",
    methodCategory: p.method?.category ?? "experiment",
    bathGases: conditions?.bath_gases ?? [],
    licence: p.license ?? "CC-BY-4.0",
    tMin: v.tMin,
    tMax: v.tMax,
    pMin: conditions?.p_min ?? null,
    pMax: conditions?.p_max ?? null,
    pointCount: v.pointCount,
    flags: searchFlagsOf(codes),
    ea: fit && Number.isFinite(fit.Ea) ? fit.Ea : null,
    a: fit?.A ?? null,
    // A's unit as files write it (lib/unit-labels.ts unitText); pages show it through unitLabel.
    aUnit: order ? getCanonicalRateConstantUnit(order) : null,
    publishedAt: v.publishedAt,
  };
}

/** Rewrites the reactions view's summary of one reaction: the consensus over the reader's default choice and the spread. */
export async function writeReactionSummary(tx: Transaction, reactionId: number): Promise<void> {
  await writeReactionSummaries(tx, [reactionId]);
}

/**
 * Rewrites the summaries of these reactions: one read of their listed documents, the consensus
 * once per reaction with two or more, one insert … on conflict and one delete (reactions with
 * nothing listed).
 */
export async function writeReactionSummaries(tx: Transaction, reactionIds: readonly number[]): Promise<void> {
  if (!reactionIds.length) return;
  // Retracted versions are listed (and marked) but are no evidence: neither consensus nor spread counts them.
  const listed = await tx
    .select({
      reactionId: searchDocuments.reactionId,
      versionId: searchDocuments.versionId,
      aUnit: searchDocuments.aUnit,
      tMin: searchDocuments.tMin,
      tMax: searchDocuments.tMax,
    })
    .from(searchDocuments)
    .where(
      and(
        sql`${searchDocuments.reactionId} = any(${idArray(reactionIds)}::int[])`,
        eq(searchDocuments.latest, true),
        eq(searchDocuments.retracted, false),
      ),
    )
    .orderBy(searchDocuments.reactionId, searchDocuments.versionId);
  const analyses = listed.length
    ? await tx
        .selectDistinctOn([versionAnalyses.versionId], {
          versionId: versionAnalyses.versionId,
          // Only what preferredFitOf reads (a stored result also holds every residual).
          result: sql<unknown>`jsonb_build_object('band', jsonb_build_object('model', ${versionAnalyses.result} -> 'band' -> 'model'),
            'arrhenius', jsonb_build_object('params', ${versionAnalyses.result} -> 'arrhenius' -> 'params'),
            'modifiedArrhenius', jsonb_build_object('params', ${versionAnalyses.result} -> 'modifiedArrhenius' -> 'params'))`,
        })
        .from(versionAnalyses)
        .where(sql`${versionAnalyses.versionId} = any(${idArray(listed.map((l) => l.versionId))}::int[])`)
        .orderBy(versionAnalyses.versionId, desc(versionAnalyses.id))
    : [];
  const preferredOf = new Map(analyses.map((a) => [a.versionId, preferredFitOf(a.result)]));
  const listedOf = new Map<number, typeof listed>();
  for (const row of listed) listedOf.set(row.reactionId, [...(listedOf.get(row.reactionId) ?? []), row]);
  const empty = reactionIds.filter((id) => !listedOf.has(id));
  if (empty.length)
    await tx.delete(searchReactionSummaries).where(sql`${searchReactionSummaries.reactionId} = any(${idArray(empty)}::int[])`);
  const rows: (typeof searchReactionSummaries.$inferInsert)[] = [];
  for (const [reactionId, fits] of listedOf) {
    const { expression, comparison, kept } = await consensusOf(tx, reactionId);
    rows.push({
      reactionId,
      consensus: fits.length >= 2 ? expression : null,
      comparison: comparison as unknown as Record<string, unknown>,
      consensusResult: kept as unknown as Record<string, unknown>,
      spread: datasetSpread(
        fits.map((f) => {
          const own = preferredOf.get(f.versionId);
          return own ? { ...own, aUnit: f.aUnit, tMin: f.tMin, tMax: f.tMax } : null;
        }),
      ),
      updatedAt: new Date(),
    });
  }
  if (!rows.length) return;
  await tx
    .insert(searchReactionSummaries)
    .values(rows)
    .onConflictDoUpdate({
      target: searchReactionSummaries.reactionId,
      set: {
        consensus: sql`excluded.consensus`,
        comparison: sql`excluded.comparison`,
        consensusResult: sql`excluded.consensus_result`,
        spread: sql`excluded.spread`,
        updatedAt: sql`excluded.updated_at`,
      },
    });
}

/**
 * The consensus over the reader's default choice, as the reactions view shows it (null when none can
 * be drawn), and what a mechanism check's verdicts need of the same data (lib/mechanisms/judge.ts).
 */
async function consensusOf(
  tx: Transaction,
  reactionId: number,
): Promise<{ expression: ReactionHit["consensus"]; comparison: StoredComparisonBasis; kept: StoredConsensus }> {
  const versions = await listPublicVersionsOfReaction({ reactionId, db: tx });
  const exclusions = await listConsensusExclusions({ reactionId, db: tx });
  const selection = selectConsensusDatasets({ versions, exclusions, choice: DEFAULT_CONSENSUS_CHOICE });
  const run = runSelectedConsensus(selection);
  const { result } = run;
  const comparison = { engine: ENGINE_VERSION, ...comparisonBasisOf({ versions, exclusions, selection, result }) };
  const kept = storedConsensusOf(selection, run, ENGINE_VERSION);
  const preferred = result && (result.preferred === "modified_arrhenius" ? result.modifiedArrhenius : result.arrhenius);
  if (!result || !preferred || preferred.params.A === null) return { expression: null, comparison, kept };
  return {
    kept,
    expression: {
      model: result.preferred,
      a: preferred.params.A,
      n: "n" in preferred.params ? (preferred.params.n as number) : 0,
      ea: preferred.params.Ea,
      aUnit: getCanonicalRateConstantUnit(result.order),
      tMin: result.range.Tmin,
      tMax: result.range.Tmax,
    },
    comparison,
  };
}

/**
 * Rewrites the summaries whose comparison basis or kept consensus is missing (rows from before they
 * were kept) or of another engine version, SUMMARY_BATCH reactions a transaction; returns how many.
 * Run by the migration, so a mechanism check reads bases rather than points, and reaction pages the
 * kept consensus, from the first start on.
 */
export async function rebuildStaleComparisonBases({ onProgress }: { onProgress?: (done: number, total: number) => void } = {}) {
  const db = getDb();
  const ids = (
    await db.execute<{ id: number }>(sql`
      select reaction_id as id from search_reaction_summaries
      where comparison is null or comparison ->> 'engine' is distinct from ${ENGINE_VERSION}
        or consensus_result is null or consensus_result ->> 'engine' is distinct from ${ENGINE_VERSION} order by 1`)
  ).map((r) => Number(r.id));
  for (let i = 0; i < ids.length; i += SUMMARY_BATCH) {
    await db.transaction((tx) => writeReactionSummaries(tx, ids.slice(i, i + SUMMARY_BATCH)));
    onProgress?.(Math.min(i + SUMMARY_BATCH, ids.length), ids.length);
  }
  // Reaction pages show the kept consensus: a server already running renders them again (below).
  if (ids.length) await movePublicPagesMark();
  return ids.length;
}

/**
 * Rebuilds every document (the backfill, `npm run search:reindex`, the benchmark's fill): versions
 * in batches of a thousand, one transaction each (so a long rebuild holds no lock for long), each
 * batch written by the same builder as the publishing transaction; documents of versions no longer
 * public are removed; then the summaries, each reaction once, a couple of hundred per transaction.
 * Reports progress per batch (versions done, then reactions done).
 */
export async function rebuildSearchDocuments({
  onProgress,
  onSummaryProgress,
  onlyMissing = false,
}: {
  onProgress?: (done: number, total: number) => void;
  onSummaryProgress?: (done: number, total: number) => void;
  /** Only public versions without a document (after migrating a database that had none). */
  onlyMissing?: boolean;
} = {}): Promise<number> {
  const db = getDb();
  const rows = onlyMissing
    ? await db.execute<{ id: number }>(sql`
        select v.id from dataset_versions v where v.state in ('published', 'retracted')
        and not exists (select 1 from search_documents d where d.version_id = v.id) order by 1`)
    : await db.execute<{ id: number }>(sql`
        select id from dataset_versions where state in ('published', 'retracted')
        union select version_id from search_documents order by 1`);
  if (!rows.length) return 0;
  const ids = rows.map((r) => Number(r.id));
  for (let i = 0; i < ids.length; i += BATCH) {
    const batch = ids.slice(i, i + BATCH);
    await db.transaction(async (tx) => {
      const datasetIds = await writeDocuments(tx, batch);
      await recordSearchChange(tx, batch);
      await refreshLatest(tx, datasetIds);
    });
    onProgress?.(Math.min(i + BATCH, ids.length), ids.length);
  }
  await db.transaction((tx) => writeSpeciesDisplayNames(tx, "all"));
  const reactionIds = (
    await db.execute<{ id: number }>(sql`
      select reaction_id as id from search_documents union select reaction_id from search_reaction_summaries order by 1`)
  ).map((r) => Number(r.id));
  for (let i = 0; i < reactionIds.length; i += SUMMARY_BATCH) {
    await db.transaction((tx) => writeReactionSummaries(tx, reactionIds.slice(i, i + SUMMARY_BATCH)));
    onSummaryProgress?.(Math.min(i + SUMMARY_BATCH, reactionIds.length), reactionIds.length);
  }
  // The species' display names and the kept consensus may have changed on any public page: a server
  // already running (this is also `npm run search:reindex` and the migration, beside it) renders its
  // pages again from the new rows, not from what it kept (lib/public-cache.ts, lib/html-cache.ts).
  await movePublicPagesMark();
  return ids.length;
}
