import "server-only";
import { and, asc, eq, gt, inArray, sql, type SQL } from "drizzle-orm";
import { getDb } from "@/db/client";
import { reactions, species, speciesNames } from "@/db/chemistry";
import { searchDocuments, searchReactionSummaries } from "@/db/search";
import { reactionDisplayEquation, speciesDisplayName } from "@/lib/reactions/display-names";
import type { ParsedQuery, ReactionHit, SearchDocument } from "@/lib/search/types";

/**
 * The search's reads: species lookups (the InChIKeys a typed name, synonym or formula may mean),
 * the header box's suggestions, and the stored documents and reaction summaries the Meilisearch
 * engine, its outbox and its reindex send on. Species and names are shared by every version, so only species of a
 * reaction with a public version are offered (a draft's new species is never suggested).
 */

/** InChIKeys of species known by one of these names (case-insensitive), formulas (exact Hill form) or keys. */
export async function findSpeciesKeys({
  names = [],
  formulas = [],
}: {
  names?: string[];
  formulas?: string[];
}): Promise<Map<string, string[]>> {
  const found = new Map<string, string[]>();
  const add = (term: string, key: string) => found.set(term, [...new Set([...(found.get(term) ?? []), key])]);
  const db = getDb();
  if (names.length) {
    const lowered = names.map((n) => n.toLowerCase());
    const rows = await db
      .selectDistinct({ name: sql<string>`lower(${speciesNames.name})`, inchiKey: species.inchiKey })
      .from(speciesNames)
      .innerJoin(species, eq(species.id, speciesNames.speciesId))
      .where(inArray(sql`lower(${speciesNames.name})`, lowered));
    for (const r of rows) for (const n of names) if (n.toLowerCase() === r.name) add(`name:${n}`, r.inchiKey);
  }
  if (formulas.length) {
    const rows = await db
      .select({ formula: species.formula, inchiKey: species.inchiKey })
      .from(species)
      // Only species of public data: a species first seen in a draft is never offered (its names join at publication; formulas are checked here).
      .where(
        and(
          inArray(species.formula, formulas),
          sql`exists (select 1 from search_documents d where d.reactant_keys @> array[${species.inchiKey}] or d.product_keys @> array[${species.inchiKey}])`,
        ),
      );
    for (const r of rows) add(`formula:${r.formula}`, r.inchiKey);
  }
  return found;
}

/** A species takes part in a listed (public) version: search_documents holds public versions only. */
const isPublicSpecies = (inchiKey: SQL) =>
  sql`exists (select 1 from search_documents d where d.reactant_keys @> array[${inchiKey}] or d.product_keys @> array[${inchiKey}])`;

/**
 * The display name of each of these species that public data describe (lib/reactions/display-names.ts),
 * for saying what was understood. A species known only from drafts is left out, exactly like one
 * nobody deposited: neither its names nor its formula may show that it exists.
 */
export async function nameSpecies({ inchiKeys }: { inchiKeys: string[] }): Promise<Map<string, string>> {
  if (!inchiKeys.length) return new Map();
  const rows = await getDb()
    .select({ inchiKey: species.inchiKey, name: sql<string>`${speciesDisplayName(sql`${species.id}`, sql`${species.formula}`)}` })
    .from(species)
    .where(and(inArray(species.inchiKey, inchiKeys), isPublicSpecies(sql`${species.inchiKey}`)));
  return new Map(rows.map((r) => [r.inchiKey, r.name]));
}

/** The equation of each of these reactions in display names (search rows show these, not a depositor's words). */
export async function listDisplayEquations({ reactionKeys }: { reactionKeys: string[] }): Promise<Map<string, string>> {
  if (!reactionKeys.length) return new Map();
  const rows = await getDb()
    .select({ key: reactions.key, equation: sql<string>`${reactionDisplayEquation(sql`${reactions.id}`)}` })
    .from(reactions)
    .where(inArray(reactions.key, reactionKeys));
  return new Map(rows.map((r) => [r.key, r.equation]));
}

export interface SpeciesSuggestion {
  inchiKey: string;
  name: string;
  formula: string;
  /** The name or formula that matched what was typed. */
  matched: string;
  /** Its public datasets (newest public version published, not retracted), whatever was typed. */
  datasetCount: number;
}

export interface ReactionSuggestion {
  reactionId: number;
  reactionKey: string;
  equation: string;
  /** Its public datasets (newest public version published, not retracted), whatever was typed. */
  datasetCount: number;
}

const SUGGESTIONS = 8;

/** A reaction pattern the search page understands, resolved to InChIKeys (lib/search/resolve-query.ts). */
export type SuggestPattern = Extract<ParsedQuery, { kind: "reaction" } | { kind: "reactionKey" }>;

/** The SQL condition a listed document meets when its reaction fits the pattern (as the engines match it). */
function patternCondition(pattern: SuggestPattern): SQL {
  if (pattern.kind === "reactionKey") return sql`d.reaction_key = ${pattern.key}`;
  const side = (column: SQL, terms: string[][]) =>
    terms.map(
      (keys) =>
        sql`${column} && array[${sql.join(
          keys.map((k) => sql`${k}`),
          sql`, `,
        )}]::text[]`,
    );
  const conditions = [...side(sql`d.reactant_keys`, pattern.reactants), ...side(sql`d.product_keys`, pattern.products)];
  // A pattern whose every term resolved to nothing matches nothing (resolveQuery turns it into text before this).
  if (conditions.length === 0 || [...pattern.reactants, ...pattern.products].some((keys) => keys.length === 0)) return sql`false`;
  return sql.join(conditions, sql` and `);
}

/**
 * What the header box offers for `q`: species by name, synonym or formula prefix (then by trigram
 * similarity, for typos), and reactions whose equation matches; published data only, ≤ 8 each.
 * With a reaction `pattern` ("OH + CH4", "CH4 -> CH3", a reaction key, resolved by the caller), the
 * reactions the search page would find for it come first and no species are offered: the text is
 * a reaction, not a name.
 */
export async function suggestSearch({
  q,
  pattern = null,
}: {
  q: string;
  pattern?: SuggestPattern | null;
}): Promise<{ species: SpeciesSuggestion[]; reactions: ReactionSuggestion[] }> {
  const text = q.trim().toLowerCase();
  if (!text) return { species: [], reactions: [] };
  const db = getDb();
  const prefix = `${text.replace(/[\\%_]/g, (c) => `\\${c}`)}%`;
  // Names and formulas first (a few thousand rows at most), then only species of a listed reaction
  // (search_documents holds public versions only; the GIN indexes on the key arrays answer @>).
  const speciesRows = pattern
    ? []
    : await db.execute<{ inchi_key: string; name: string; formula: string; matched: string; datasets: number }>(sql`
    with candidates as (
      select s.inchi_key, s.formula, n.name as matched,
        case when lower(n.name) = ${text} then 0 when lower(n.name) like ${prefix} then 1 else 2 end as rank,
        similarity(lower(n.name), ${text}) as sim
      from species s join species_names n on n.species_id = s.id
      where lower(n.name) like ${prefix} or similarity(lower(n.name), ${text}) > 0.35
      union all
      select s.inchi_key, s.formula, s.formula, case when lower(s.formula) = ${text} then 0 else 1 end, 1
      from species s where lower(s.formula) like ${prefix}
    ), best as (
      select distinct on (c.inchi_key) c.* from candidates c
      where exists (select 1 from search_documents d where d.reactant_keys @> array[c.inchi_key])
         or exists (select 1 from search_documents d where d.product_keys @> array[c.inchi_key])
      order by c.inchi_key, c.rank, c.sim desc
    )
    select b.inchi_key, b.formula, b.matched,
      ${speciesDisplayName(sql`(select s.id from species s where s.inchi_key = b.inchi_key)`, sql`b.formula`)} as name,
      (select count(*)::int from search_documents d where d.latest and not d.retracted
        and (d.reactant_keys @> array[b.inchi_key] or d.product_keys @> array[b.inchi_key])) as datasets
    from best b order by b.rank, b.sim desc, b.matched limit ${SUGGESTIONS}`);
  const speciesHits = speciesRows.map((r) => ({
    inchiKey: r.inchi_key,
    name: r.name,
    formula: r.formula,
    matched: r.matched,
    datasetCount: Number(r.datasets),
  }));
  // names_text holds the equation too, lower-cased, under a trigram index. What was typed only
  // chooses the reactions; each is then counted over all its listed documents. Reactions the
  // pattern finds rank before those whose equation merely contains the text.
  const contains = `%${text.replace(/[\\%_]/g, (c) => `\\${c}`)}%`;
  const byPattern = pattern ? patternCondition(pattern) : sql`false`;
  const reactionRows = await db.execute<{ reaction_id: number; reaction_key: string; equation: string; datasets: number }>(sql`
    with matched as (
      select d.reaction_id, bool_or(${byPattern}) as fits from search_documents d
      where d.latest and not d.retracted and (d.names_text like ${contains} or ${byPattern})
      group by d.reaction_id
    ), counted as (
      select d.reaction_id, min(d.reaction_key) as reaction_key, count(*)::int as datasets, bool_or(m.fits) as fits
      from search_documents d join matched m on m.reaction_id = d.reaction_id
      where d.latest and not d.retracted group by d.reaction_id
      order by bool_or(m.fits) desc, count(*) desc, min(d.reaction_key) limit ${SUGGESTIONS}
    )
    select c.reaction_id, c.reaction_key, c.datasets, ${reactionDisplayEquation(sql`c.reaction_id`)} as equation
    from counted c order by c.fits desc, c.datasets desc, c.reaction_key`);
  return {
    species: speciesHits,
    reactions: reactionRows.map((r) => ({
      reactionId: Number(r.reaction_id),
      reactionKey: r.reaction_key,
      equation: r.equation,
      datasetCount: Number(r.datasets),
    })),
  };
}

/**
 * The current search documents of these versions, as the PostgreSQL engine keeps them (written in
 * the transaction of each change, lib/search/documents.ts): Meilisearch receives exactly what
 * PostgreSQL searches. A version without a row is no longer public.
 */
export async function loadSearchDocuments(versionIds: number[]): Promise<SearchDocument[]> {
  if (!versionIds.length) return [];
  const rows = await getDb()
    .select({
      versionId: searchDocuments.versionId,
      datasetId: searchDocuments.datasetId,
      versionNumber: searchDocuments.versionNumber,
      latest: searchDocuments.latest,
      retracted: searchDocuments.retracted,
      versionIdentifier: searchDocuments.versionIdentifier,
      title: searchDocuments.title,
      description: searchDocuments.description,
      keywords: searchDocuments.keywords,
      creators: searchDocuments.creators,
      technique: searchDocuments.technique,
      source: searchDocuments.source,
      sourceYear: searchDocuments.sourceYear,
      reactionId: searchDocuments.reactionId,
      reactionKey: searchDocuments.reactionKey,
      equation: searchDocuments.equation,
      reactantKeys: searchDocuments.reactantKeys,
      productKeys: searchDocuments.productKeys,
      speciesNames: searchDocuments.speciesNames,
      formulas: searchDocuments.formulas,
      reactionClass: searchDocuments.reactionClass,
      phase: searchDocuments.phase,
      methodCategory: searchDocuments.methodCategory,
      bathGases: searchDocuments.bathGases,
      licence: searchDocuments.licence,
      tMin: searchDocuments.tMin,
      tMax: searchDocuments.tMax,
      pMin: searchDocuments.pMin,
      pMax: searchDocuments.pMax,
      pointCount: searchDocuments.pointCount,
      flags: searchDocuments.flags,
      ea: searchDocuments.ea,
      a: searchDocuments.a,
      aUnit: searchDocuments.aUnit,
      publishedAt: searchDocuments.publishedAt,
    })
    .from(searchDocuments)
    .where(inArray(searchDocuments.versionId, versionIds));
  return rows.map((r) => ({
    ...r,
    id: String(r.versionId),
    flags: r.flags as SearchDocument["flags"],
    publishedAt: r.publishedAt.toISOString(),
  }));
}

/** The reactions view's consensus and spread, kept in PostgreSQL beside the documents. */
export async function loadReactionSummaries(reactionIds: number[]): Promise<Map<number, Pick<ReactionHit, "consensus" | "spread">>> {
  if (!reactionIds.length) return new Map();
  const rows = await getDb()
    .select({
      reactionId: searchReactionSummaries.reactionId,
      consensus: searchReactionSummaries.consensus,
      spread: searchReactionSummaries.spread,
    })
    .from(searchReactionSummaries)
    .where(inArray(searchReactionSummaries.reactionId, reactionIds));
  return new Map(rows.map((r) => [r.reactionId, { consensus: (r.consensus as ReactionHit["consensus"]) ?? null, spread: r.spread }]));
}

/** Every species' names that has more than one, grouped (the synonyms a search service is given). */
export async function listSpeciesNameGroups(): Promise<string[][]> {
  const rows = await getDb().execute<{ names: string[] }>(
    sql`select array_agg(name order by name) as names from species_names group by species_id having count(*) > 1`,
  );
  return rows.map((r) => r.names);
}

/** How many search documents there are, and the version ids after `after`, in order, a page at a time. */
export async function countSearchDocuments(): Promise<number> {
  return getDb().$count(searchDocuments);
}

export async function listSearchDocumentIdsAfter({ after, limit }: { after: number; limit: number }): Promise<number[]> {
  const rows = await getDb()
    .select({ id: searchDocuments.versionId })
    .from(searchDocuments)
    .where(gt(searchDocuments.versionId, after))
    .orderBy(asc(searchDocuments.versionId))
    .limit(limit);
  return rows.map((r) => r.id);
}
