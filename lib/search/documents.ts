import "server-only";
import { and, desc, eq, inArray, sql } from "drizzle-orm";
import { getDb, type Transaction } from "@/db/client";
import { reactionParticipants, reactions, species, speciesNames } from "@/db/chemistry";
import { datasetVersions, versionAnalyses } from "@/db/datasets";
import { searchDocuments, searchReactionSummaries } from "@/db/search";
import { reactionClassFor } from "@/lib/deposits/vocabulary";
import { GAS_CONSTANT, type ReactionOrder } from "@/lib/kinetics";
import { loadReactionConsensus } from "@/lib/reactions/consensus-view";
import { DEFAULT_CONSENSUS_CHOICE } from "@/lib/reactions/consensus-selection";
import type { ReactionHit, SearchFlag } from "./types";

/**
 * The PostgreSQL engine's documents: `buildSearchDocument` (re)writes the one of a version inside
 * the caller's transaction — acceptance, retraction and re-fit call it (lib/curation/transitions.ts,
 * lib/datasets/refit.ts), so the document commits or rolls back with the change — and keeps
 * `latest` and the reaction summary of the reactions view in step. `rebuildSearchDocuments` is the
 * backfill (`npm run search:reindex`, and scripts/migrate.ts after migrating).
 */

/** The canonical unit of k (and A) for a reaction order, as shown. */
export const RATE_UNIT_LABELS: Record<ReactionOrder, string> = {
  1: "s⁻¹",
  2: "cm³ molecule⁻¹ s⁻¹",
  3: "cm⁶ molecule⁻² s⁻¹",
};

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

/**
 * Writes the search document of one version as it now stands: inserted or replaced while the
 * version is published or retracted, removed otherwise; then `latest` of its dataset's documents
 * and the summaries of the reactions concerned. Call it inside the transaction of the change.
 */
export async function buildSearchDocument(
  tx: Transaction,
  versionId: number,
  { summaries = true }: { summaries?: boolean } = {},
): Promise<void> {
  const [v] = await tx
    .select({
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
    })
    .from(datasetVersions)
    .where(eq(datasetVersions.id, versionId));
  const reactionsBefore = await tx
    .selectDistinct({ reactionId: searchDocuments.reactionId })
    .from(searchDocuments)
    .where(eq(searchDocuments.datasetId, v?.datasetId ?? -1));
  const isPublic = v && (v.state === "published" || v.state === "retracted") && v.reactionId !== null && v.publishedAt !== null;
  if (!v || !isPublic || v.tMin === null || v.tMax === null) {
    await tx.delete(searchDocuments).where(eq(searchDocuments.versionId, versionId));
  } else {
    const row = await documentRow(tx, versionId, {
      ...v,
      reactionId: v.reactionId!,
      publishedAt: v.publishedAt!,
      tMin: v.tMin,
      tMax: v.tMax,
    });
    await tx.insert(searchDocuments).values(row).onConflictDoUpdate({ target: searchDocuments.versionId, set: row });
  }
  if (!v) return;
  await refreshLatest(tx, v.datasetId);
  if (!summaries) return;
  const affected = new Set([...reactionsBefore.map((r) => r.reactionId), ...(v.reactionId !== null ? [v.reactionId] : [])]);
  for (const reactionId of affected) await writeReactionSummary(tx, reactionId);
}

/** Marks the newest public version of the dataset as its listed document, every older one not. */
async function refreshLatest(tx: Transaction, datasetId: number) {
  await tx.execute(sql`
    update search_documents d set latest = (d.version_number = m.newest)
    from (select max(version_number) as newest from search_documents where dataset_id = ${datasetId}) m
    where d.dataset_id = ${datasetId} and d.latest is distinct from (d.version_number = m.newest)`);
}

async function documentRow(
  tx: Transaction,
  versionId: number,
  v: {
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
  },
): Promise<typeof searchDocuments.$inferInsert> {
  const [reaction] = await tx
    .select({ key: reactions.key, equation: reactions.equation })
    .from(reactions)
    .where(eq(reactions.id, v.reactionId));
  const participants = await tx
    .select({ side: reactionParticipants.side, speciesId: species.id, inchiKey: species.inchiKey, formula: species.formula })
    .from(reactionParticipants)
    .innerJoin(species, eq(species.id, reactionParticipants.speciesId))
    .where(eq(reactionParticipants.reactionId, v.reactionId));
  const names = participants.length
    ? await tx
        .select({ name: speciesNames.name })
        .from(speciesNames)
        .where(
          inArray(
            speciesNames.speciesId,
            participants.map((p) => p.speciesId),
          ),
        )
    : [];
  const [analysis] = await tx
    .select({ result: versionAnalyses.result, checks: versionAnalyses.checks })
    .from(versionAnalyses)
    .where(eq(versionAnalyses.versionId, versionId))
    .orderBy(desc(versionAnalyses.id))
    .limit(1);
  const [conditions] = await tx.execute<{ p_min: number | null; p_max: number | null; bath_gases: string[] | null }>(sql`
    select min(pressure_pa) as p_min, max(pressure_pa) as p_max,
      array_agg(distinct bath_gas) filter (where bath_gas is not null) as bath_gases
    from version_points where version_id = ${versionId}`);

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
    versionId,
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
    aUnit: order ? RATE_UNIT_LABELS[order] : null,
    publishedAt: v.publishedAt,
  };
}

/**
 * Spread of a reaction's datasets: largest over smallest k of their own Arrhenius fits at the
 * middle, in 1/T, of the range they cover together; null with fewer than two fits of one unit.
 */
export function datasetSpread(
  fits: { a: number | null; ea: number | null; aUnit: string | null; tMin: number; tMax: number }[],
): number | null {
  const usable = fits.filter((f) => f.a !== null && f.ea !== null && f.a > 0 && f.aUnit === fits[0]?.aUnit);
  if (usable.length < 2) return null;
  const tMin = Math.min(...usable.map((f) => f.tMin));
  const tMax = Math.max(...usable.map((f) => f.tMax));
  const tMid = 2 / (1 / tMin + 1 / tMax);
  const lnk = usable.map((f) => Math.log(f.a!) - f.ea! / (GAS_CONSTANT * tMid));
  const factor = Math.exp(Math.max(...lnk) - Math.min(...lnk));
  return Number.isFinite(factor) ? factor : null;
}

/** Rewrites the reactions view's summary of one reaction: the consensus over the reader's default choice and the spread. */
export async function writeReactionSummary(tx: Transaction, reactionId: number): Promise<void> {
  const listed = await tx
    .select({
      a: searchDocuments.a,
      ea: searchDocuments.ea,
      aUnit: searchDocuments.aUnit,
      tMin: searchDocuments.tMin,
      tMax: searchDocuments.tMax,
    })
    .from(searchDocuments)
    .where(and(eq(searchDocuments.reactionId, reactionId), eq(searchDocuments.latest, true), eq(searchDocuments.retracted, false)));
  if (!listed.length) {
    await tx.delete(searchReactionSummaries).where(eq(searchReactionSummaries.reactionId, reactionId));
    return;
  }
  let consensus: ReactionHit["consensus"] = null;
  if (listed.length >= 2) {
    const { result } = await loadReactionConsensus({ reactionId, choice: DEFAULT_CONSENSUS_CHOICE, db: tx });
    const preferred = result && (result.preferred === "modified_arrhenius" ? result.modifiedArrhenius : result.arrhenius);
    if (result && preferred && preferred.params.A !== null) {
      consensus = {
        model: result.preferred,
        a: preferred.params.A,
        n: "n" in preferred.params ? (preferred.params.n as number) : 0,
        ea: preferred.params.Ea,
        aUnit: RATE_UNIT_LABELS[result.order],
        tMin: result.range.Tmin,
        tMax: result.range.Tmax,
      };
    }
  }
  const row = { reactionId, consensus, spread: datasetSpread(listed), updatedAt: new Date() };
  await tx.insert(searchReactionSummaries).values(row).onConflictDoUpdate({ target: searchReactionSummaries.reactionId, set: row });
}

/**
 * Rebuilds every document (the backfill): one transaction per version, so a long rebuild holds no
 * lock for long; documents of versions no longer public are removed. Reports progress per version.
 */
export async function rebuildSearchDocuments({
  onProgress,
  onlyMissing = false,
}: {
  onProgress?: (done: number, total: number) => void;
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
  for (const [i, id] of ids.entries()) {
    // Summaries once per reaction below, not once per version.
    await db.transaction((tx) => buildSearchDocument(tx, id, { summaries: false }));
    onProgress?.(i + 1, ids.length);
  }
  const reactionIds = await db.execute<{ id: number }>(sql`
    select distinct reaction_id as id from search_documents union select reaction_id from search_reaction_summaries`);
  for (const r of reactionIds) await db.transaction((tx) => writeReactionSummary(tx, Number(r.id)));
  return ids.length;
}
