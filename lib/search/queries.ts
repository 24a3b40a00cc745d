import "server-only";
import { AsyncLocalStorage } from "node:async_hooks";
import { and, asc, eq, gt, inArray, sql, type SQL } from "drizzle-orm";
import { getDb } from "@/db/client";
import { readPerTurn } from "@/db/read-per-turn";
import { reactions, species, speciesNames } from "@/db/chemistry";
import { searchDocuments, searchReactionSummaries } from "@/db/search";
import { reactionDisplayEquation, speciesDisplayName } from "@/lib/reactions/display-names";
import type { ParsedQuery, ReactionHit, SearchDocument } from "@/lib/search/types";

/**
 * The search's reads: the species lexicon (every name, and the formula and display name of each
 * public species, which lib/search/lexicon.ts keeps per generation), the listed documents of the
 * in-memory index and their generation mark, the header box's suggestions, and the stored documents and reaction summaries the Meilisearch
 * engine, its outbox and its reindex send on. Species and names are shared by every version, so only species of a
 * reaction with a public version are offered (a draft's new species is never suggested).
 */

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

/**
 * The equation of each of these reactions in display names (search rows show these, not a
 * depositor's words); of every reaction with a search document (public data) when `reactionKeys` is "public".
 */
export async function listDisplayEquations({ reactionKeys }: { reactionKeys: string[] | "public" }): Promise<Map<string, string>> {
  if (!reactionKeys.length) return new Map();
  const query = getDb()
    .select({ key: reactions.key, equation: sql<string>`${reactionDisplayEquation(sql`${reactions.id}`)}` })
    .from(reactions);
  const rows = await (reactionKeys === "public"
    ? query.where(sql`exists (select 1 from search_documents d where d.reaction_id = ${reactions.id})`)
    : query.where(inArray(reactions.key, reactionKeys)));
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

/** The mark one search has already read, for the reads it makes after (see withSearchGeneration). */
const readMark = new AsyncLocalStorage<string>();

/**
 * Runs `work` with `generation`, a mark read after the request arrived, as what getSearchGeneration
 * answers inside it: one search asks for the mark in several places (its kept answer, the species
 * lexicon, the in-memory index, the display names), and one read serves them all. Each loader still
 * takes a snapshot never older than that mark.
 */
export function withSearchGeneration<T>(generation: string, work: () => Promise<T>): Promise<T> {
  return readMark.run(generation, work);
}

/**
 * The mark of the search documents' state (drizzle/0025 sets it in every transaction that changes
 * them); "none" before any. Requests that ask in the same turn of the event loop share one read
 * (db/read-per-turn.ts), which still starts after each of them arrived.
 */
export function getSearchGeneration(): Promise<string> {
  const known = readMark.getStore();
  if (known !== undefined) return Promise.resolve(known);
  return readPerTurn("search generation", async (db) => {
    const [row] = await db.execute<{ g: string | null }>(sql`select (select generation::text from search_generation) as g`);
    return row?.g ?? "none";
  });
}

/** A listed (`latest`) search document as the in-memory index reads it (arrays in their text form). */
export type ListedDocumentRow = {
  version_id: number;
  reaction_id: number;
  reaction_key: string;
  equation: string;
  reactant_keys: string;
  product_keys: string;
  reaction_class: string;
  phase: string;
  method_category: string;
  licence: string;
  source_year: number | null;
  bath_gases: string[];
  flags: string[];
  creators: string[];
  t_min: number;
  t_max: number;
  p_min: number | null;
  p_max: number | null;
  point_count: number;
  retracted: boolean;
  published_us: string;
  dataset_id: number;
  version_number: number;
  version_identifier: string | null;
  title: string;
  ea: number | null;
  a: number | null;
  a_unit: string | null;
};

/**
 * Every listed document, in one snapshot with its generation mark (the index is never newer or
 * older than its mark): `start` is told the mark and the number of documents, then given the rows
 * `slice` at a time by version id, so that few rows are held at once.
 */
export async function readListedDocuments<T>({
  slice,
  start,
}: {
  slice: number;
  start: (generation: string, count: number) => { add(row: ListedDocumentRow): void; done(): T };
}): Promise<T> {
  return getDb().transaction(
    async (tx) => {
      const [g] = await tx.execute<{ g: string | null }>(sql`select (select generation::text from search_generation) as g`);
      const [count] = await tx.execute<{ n: number }>(sql`select count(*)::int as n from search_documents where latest`);
      const sink = start(g?.g ?? "none", Number(count?.n ?? 0));
      for (let after = 0; ;) {
        const rows = (await tx.execute<ListedDocumentRow>(sql`
          select version_id, reaction_id, reaction_key, equation, reactant_keys::text as reactant_keys, product_keys::text as product_keys,
            reaction_class, phase, method_category, licence, source_year, bath_gases, flags, creators, t_min, t_max, p_min, p_max,
            point_count, retracted, (extract(epoch from published_at) * 1000000)::bigint::text as published_us,
            dataset_id, version_number, version_identifier, title, ea, a, a_unit
          from search_documents where latest and version_id > ${after} order by version_id limit ${slice}`)) as unknown as ListedDocumentRow[];
        for (const r of rows) sink.add(r);
        if (rows.length < slice) break;
        after = Number(rows[rows.length - 1].version_id);
      }
      return sink.done();
    },
    { isolationLevel: "repeatable read", accessMode: "read only" },
  );
}

/** What resolving search text needs of every species, read at once (lib/search/lexicon.ts keeps it per generation). */
export interface SpeciesLexiconRows {
  /** Every species name, lower-cased, with its species' InChIKey (names join at publication, so all are public). */
  names: { name: string; inchiKey: string }[];
  /** Species of public data (in a search document): InChIKey, formula and display name. */
  publicSpecies: { inchiKey: string; formula: string; name: string }[];
}

/** The rows of the species lexicon, in one snapshot (its generation mark with it). */
export async function readSpeciesLexicon(): Promise<SpeciesLexiconRows & { generation: string }> {
  return getDb().transaction(
    async (tx) => {
      const [g] = await tx.execute<{ g: string | null }>(sql`select (select generation::text from search_generation) as g`);
      const names = await tx
        .selectDistinct({ name: sql<string>`lower(${speciesNames.name})`, inchiKey: species.inchiKey })
        .from(speciesNames)
        .innerJoin(species, eq(species.id, speciesNames.speciesId));
      const publicSpecies = (await tx.execute<{ inchi_key: string; formula: string; name: string }>(sql`
        with keys as (select distinct k from search_documents d, unnest(d.reactant_keys || d.product_keys) k)
        select s.inchi_key, s.formula, ${speciesDisplayName(sql`s.id`, sql`s.formula`)} as name
        from species s join keys on keys.k = s.inchi_key`)) as unknown as { inchi_key: string; formula: string; name: string }[];
      return {
        generation: g?.g ?? "none",
        names,
        publicSpecies: publicSpecies.map((r) => ({ inchiKey: r.inchi_key, formula: r.formula, name: r.name })),
      };
    },
    { isolationLevel: "repeatable read", accessMode: "read only" },
  );
}
