import "server-only";
import { sql, type SQL } from "drizzle-orm";
import { getDb } from "@/db/client";
import { AppError } from "@/lib/errors";
import {
  SEARCH_FACETS,
  type DatasetHit,
  type EngineQuery,
  type FacetCount,
  type ParsedQuery,
  type ReactionHit,
  type SearchEngine,
  type SearchFacet,
  type SearchFilters,
  type SearchResult,
} from "../types";

/**
 * The PostgreSQL engine, over search_documents (drizzle/0022). Every query lists only `latest`
 * documents (the newest public version of each dataset; retracted ones are listed and marked).
 *
 * - Text: websearch_to_tsquery('english') against the weighted tsvector; when that matches nothing,
 *   a trigram word similarity of at least 0.7 with the names, formulas and equation (typos in names).
 * - Species: the reaction has one of the keys on either side (GIN on the key arrays).
 * - Reaction patterns: each reactant term among the reactants, each product term among the products.
 * - Filters: values of one facet are or-ed, facets and-ed; temperature window overlap (or cover),
 *   pressure window overlap, source years.
 * - Sorts, each with version_id as the tiebreak: relevance (ts_rank for text, newest otherwise),
 *   newest, widest range, most points; keyset pagination on (sort key, id). "desc nulls last" as
 *   the partial indexes are written (drizzle/0022): with plain "desc" (nulls first) the planner
 *   cannot walk them and sorts every match instead.
 * - Facet counts: each facet counted over the matches with every other facet's filter applied.
 */

const FACET_COLUMNS: Record<SearchFacet, { column: SQL; array: boolean }> = {
  reactionClass: { column: sql`d.reaction_class`, array: false },
  phase: { column: sql`d.phase`, array: false },
  methodCategory: { column: sql`d.method_category`, array: false },
  bathGas: { column: sql`d.bath_gases`, array: true },
  licence: { column: sql`d.licence`, array: false },
  sourceYear: { column: sql`d.source_year::text`, array: false },
  flags: { column: sql`d.flags`, array: true },
  creator: { column: sql`d.creators`, array: true },
};

/** Most values listed per facet (bath gases and creators can be many). */
const FACET_VALUES = 50;

const textArray = (values: readonly string[]) => sql`${`{${values.map((v) => `"${v.replace(/(["\\])/g, "\\$1")}"`).join(",")}}`}::text[]`;

/** Text search query of the free text; the same expression in the filter and in ts_rank. */
const tsQuery = (text: string) => sql`websearch_to_tsquery('english', ${text})`;

/**
 * The text part of the match (what was typed), without filters. Free text matches words (stemmed);
 * `fuzzy` instead matches names close to what was typed ("metane", "hydroxil"), the fallback when
 * the words match nothing: or-ing both in one query made the planner test the trigram similarity
 * on every row (a sequential scan, 300 ms at 6 000 documents on a loaded machine).
 */
function matchOf(parsed: ParsedQuery, fuzzy = false): SQL {
  switch (parsed.kind) {
    case "all":
      return sql`true`;
    case "text":
      return fuzzy
        ? sql`(${parsed.text.toLowerCase()} <% d.names_text and word_similarity(${parsed.text.toLowerCase()}, d.names_text) >= 0.7)`
        : sql`d.document @@ ${tsQuery(parsed.text)}`;
    case "species":
      return sql`(d.reactant_keys && ${textArray(parsed.inchiKeys)} or d.product_keys && ${textArray(parsed.inchiKeys)})`;
    case "reaction": {
      const terms = [
        ...parsed.reactants.map((keys) => sql`d.reactant_keys && ${textArray(keys)}`),
        ...parsed.products.map((keys) => sql`d.product_keys && ${textArray(keys)}`),
      ];
      return terms.length ? sql`(${sql.join(terms, sql` and `)})` : sql`true`;
    }
    case "reactionKey":
      return sql`d.reaction_key = ${parsed.key}`;
  }
}

/** Filters that are not facets: temperature and pressure windows. */
function windowsOf(f: SearchFilters): SQL {
  const parts: SQL[] = [];
  if (f.tCovers && f.tMin !== null && f.tMax !== null) parts.push(sql`d.t_min <= ${f.tMin} and d.t_max >= ${f.tMax}`);
  else {
    if (f.tMin !== null) parts.push(sql`d.t_max >= ${f.tMin}`);
    if (f.tMax !== null) parts.push(sql`d.t_min <= ${f.tMax}`);
  }
  // A pressure window keeps datasets with a stated pressure range overlapping it.
  if (f.pMin !== null) parts.push(sql`d.p_max >= ${f.pMin}`);
  if (f.pMax !== null) parts.push(sql`d.p_min <= ${f.pMax}`);
  return parts.length ? sql.join(parts, sql` and `) : sql`true`;
}

/** One facet's filter ("any of" its values), or true when the reader chose none. */
function facetFilter(facet: SearchFacet, f: SearchFilters): SQL {
  if (facet === "sourceYear") {
    const parts: SQL[] = [];
    if (f.yearMin !== null) parts.push(sql`d.source_year >= ${f.yearMin}`);
    if (f.yearMax !== null) parts.push(sql`d.source_year <= ${f.yearMax}`);
    return parts.length ? sql`(${sql.join(parts, sql` and `)})` : sql`true`;
  }
  const values = {
    reactionClass: f.reactionClass,
    phase: f.phase,
    methodCategory: f.methodCategory,
    bathGas: f.bathGas,
    licence: f.licence,
    flags: f.flags,
    creator: f.creator,
  }[facet];
  if (!values.length) return sql`true`;
  const { column, array } = FACET_COLUMNS[facet];
  return array ? sql`${column} && ${textArray(values)}` : sql`${column} = any(${textArray(values)})`;
}

interface SortSpec {
  /** The sort key of one document (datasets view). */
  key: SQL;
  /** Its type, to read a cursor's key back. */
  type: SQL;
}

function sortOf(query: EngineQuery): SortSpec {
  const sort = query.sort === "relevance" && query.parsed.kind !== "text" ? "newest" : query.sort;
  switch (sort) {
    case "relevance":
      return { key: sql`ts_rank(d.document, ${tsQuery((query.parsed as { text: string }).text)})`, type: sql`real` };
    case "newest":
      return { key: sql`d.published_at`, type: sql`timestamptz` };
    case "widest":
      return { key: sql`d.t_span`, type: sql`double precision` };
    case "points":
      return { key: sql`d.point_count`, type: sql`integer` };
  }
}

/** The reactions view's sort key over a reaction's matching documents. */
function groupSortOf(query: EngineQuery): SortSpec {
  const sort = query.sort === "relevance" && query.parsed.kind !== "text" ? "newest" : query.sort;
  switch (sort) {
    case "relevance":
      return { key: sql`max(ts_rank(d.document, ${tsQuery((query.parsed as { text: string }).text)}))`, type: sql`real` };
    case "newest":
      return { key: sql`max(d.published_at)`, type: sql`timestamptz` };
    // Over the datasets that count (retracted ones are listed, not evidence); -1 / 0 when all are retracted.
    case "widest":
      return {
        key: sql`coalesce(max(d.t_max) filter (where not d.retracted) - min(d.t_min) filter (where not d.retracted), -1)`,
        type: sql`double precision`,
      };
    case "points":
      return { key: sql`coalesce(sum(d.point_count) filter (where not d.retracted), 0)::bigint`, type: sql`bigint` };
  }
}

/** An engine position: the last hit's sort key (as text, exact) and id. */
function readAfter(after: string | null): { key: string; id: number } | null {
  if (after === null) return null;
  try {
    const [key, id] = JSON.parse(after) as [unknown, unknown];
    if (typeof key === "string" && typeof id === "number" && Number.isInteger(id)) return { key, id };
  } catch {
    // fall through
  }
  const message = "cursor is not one this search gave out";
  throw new AppError("bad_request", message, [{ pointer: "/cursor", parameter: "cursor", message }]);
}

async function facetCounts(base: SQL, filters: SearchFilters, view: EngineQuery["view"]) {
  const flagsOf = SEARCH_FACETS.map((facet) => sql`${facetFilter(facet, filters)} as ${sql.identifier(`f_${facet}`)}`);
  const counts = SEARCH_FACETS.map((facet) => {
    const others = SEARCH_FACETS.filter((o) => o !== facet).map((o) => sql.identifier(`f_${o}`));
    const { array } = FACET_COLUMNS[facet];
    const value = array ? sql`unnest(m.${sql.identifier(`v_${facet}`)})` : sql`m.${sql.identifier(`v_${facet}`)}`;
    return sql`(select ${facet}::text as facet, value, count(*)::int as n from (select ${value} as value from m where ${sql.join(others, sql` and `)}) x
      where value is not null group by value order by count(*) desc, value limit ${FACET_VALUES})`;
  });
  const all = SEARCH_FACETS.map((o) => sql.identifier(`f_${o}`));
  const values = SEARCH_FACETS.map((facet) => sql`${FACET_COLUMNS[facet].column} as ${sql.identifier(`v_${facet}`)}`);
  const total = view === "reactions" ? sql`count(distinct m.reaction_id)` : sql`count(*)`;
  const rows = await getDb().execute<{ facet: string; value: string; n: number }>(sql`
    with m as materialized (
      select d.reaction_id, ${sql.join(values, sql`, `)}, ${sql.join(flagsOf, sql`, `)}
      from search_documents d where ${base}
    )
    select '' as facet, '' as value, (select ${total}::int from m where ${sql.join(all, sql` and `)}) as n
    union all ${sql.join(counts, sql` union all `)}`);
  const facets = Object.fromEntries(SEARCH_FACETS.map((f) => [f, [] as FacetCount[]])) as Record<SearchFacet, FacetCount[]>;
  let totalCount = 0;
  for (const r of rows) {
    if (r.facet === "") totalCount = Number(r.n);
    else facets[r.facet as SearchFacet].push({ value: r.value, count: Number(r.n) });
  }
  return { total: totalCount, facets };
}

type DatasetRow = {
  version_id: number;
  dataset_id: number;
  version_number: number;
  version_identifier: string | null;
  retracted: boolean;
  title: string;
  equation: string;
  reaction_key: string;
  reaction_class: string;
  method_category: string;
  t_min: number;
  t_max: number;
  point_count: number;
  ea: number | null;
  a: number | null;
  a_unit: string | null;
  flags: string[];
  creators: string[];
  published_at: string;
  sort_key: string;
};

async function datasetHits(base: SQL, query: EngineQuery, after: { key: string; id: number } | null) {
  const { key, type } = sortOf(query);
  const keyset = after ? sql`and (${key}, d.version_id) < (${after.key}::${type}, ${after.id})` : sql``;
  const rows = await getDb().execute<DatasetRow>(sql`
    select d.version_id, d.dataset_id, d.version_number, d.version_identifier, d.retracted, d.title, d.equation, d.reaction_key,
      d.reaction_class, d.method_category, d.t_min, d.t_max, d.point_count, d.ea, d.a, d.a_unit, d.flags, d.creators,
      to_json(d.published_at)#>>'{}' as published_at, (${key})::text as sort_key
    from search_documents d
    where ${base} and ${sql.join(
      SEARCH_FACETS.map((f) => facetFilter(f, query.filters)),
      sql` and `,
    )} ${keyset}
    order by ${key} desc nulls last, d.version_id desc nulls last
    limit ${query.limit + 1}`);
  const page = rows.slice(0, query.limit);
  const hits: DatasetHit[] = page.map((r) => ({
    versionId: Number(r.version_id),
    datasetId: Number(r.dataset_id),
    versionNumber: Number(r.version_number),
    versionIdentifier: r.version_identifier,
    retracted: r.retracted,
    title: r.title,
    equation: r.equation,
    reactionKey: r.reaction_key,
    reactionClass: r.reaction_class,
    methodCategory: r.method_category,
    tMin: Number(r.t_min),
    tMax: Number(r.t_max),
    pointCount: Number(r.point_count),
    ea: r.ea === null ? null : Number(r.ea),
    a: r.a === null ? null : Number(r.a),
    aUnit: r.a_unit,
    flags: r.flags as DatasetHit["flags"],
    creators: r.creators,
    publishedAt: new Date(r.published_at).toISOString(),
  }));
  const last = page[page.length - 1];
  return { hits, nextAfter: rows.length > query.limit && last ? JSON.stringify([last.sort_key ?? "", Number(last.version_id)]) : null };
}

type ReactionRow = {
  reaction_id: number;
  reaction_key: string;
  equation: string;
  datasets: number;
  retracted: number;
  t_min: number | null;
  t_max: number | null;
  consensus: ReactionHit["consensus"];
  spread: number | null;
  sort_key: string;
};

async function reactionHits(base: SQL, query: EngineQuery, after: { key: string; id: number } | null) {
  const { key, type } = groupSortOf(query);
  const keyset = after ? sql`where (g.sort_value, g.reaction_id) < (${after.key}::${type}, ${after.id})` : sql``;
  const rows = await getDb().execute<ReactionRow>(sql`
    select g.reaction_id, g.reaction_key, g.equation, g.datasets, g.retracted, g.t_min, g.t_max, s.consensus, s.spread,
      g.sort_value::text as sort_key
    from (
      select d.reaction_id, min(d.reaction_key) as reaction_key, min(d.equation) as equation,
        count(*) filter (where not d.retracted)::int as datasets, count(*) filter (where d.retracted)::int as retracted,
        min(d.t_min) filter (where not d.retracted) as t_min, max(d.t_max) filter (where not d.retracted) as t_max, ${key} as sort_value
      from search_documents d
      where ${base} and ${sql.join(
        SEARCH_FACETS.map((f) => facetFilter(f, query.filters)),
        sql` and `,
      )}
      group by d.reaction_id
    ) g
    left join search_reaction_summaries s on s.reaction_id = g.reaction_id
    ${keyset}
    order by g.sort_value desc, g.reaction_id desc
    limit ${query.limit + 1}`);
  const page = rows.slice(0, query.limit);
  const hits: ReactionHit[] = page.map((r) => ({
    reactionId: Number(r.reaction_id),
    reactionKey: r.reaction_key,
    equation: r.equation,
    datasetCount: Number(r.datasets),
    retractedCount: Number(r.retracted),
    tMin: r.t_min === null ? null : Number(r.t_min),
    tMax: r.t_max === null ? null : Number(r.t_max),
    consensus: r.consensus ?? null,
    spread: r.spread === null ? null : Number(r.spread),
  }));
  const last = page[page.length - 1];
  return { hits, nextAfter: rows.length > query.limit && last ? JSON.stringify([last.sort_key ?? "", Number(last.reaction_id)]) : null };
}

export const postgresEngine: SearchEngine = {
  name: "postgres",
  async search(query: EngineQuery): Promise<SearchResult> {
    const after = readAfter(query.after);
    const run = async (fuzzy: boolean) => {
      const base = sql`d.latest and ${matchOf(query.parsed, fuzzy)} and ${windowsOf(query.filters)}`;
      const [counted, page] = await Promise.all([
        facetCounts(base, query.filters, query.view),
        query.view === "reactions" ? reactionHits(base, query, after) : datasetHits(base, query, after),
      ]);
      return { view: query.view, total: counted.total, hits: page.hits, facets: counted.facets, nextAfter: page.nextAfter };
    };
    const exact = await run(false);
    // Words that match nothing may be a misspelt name: try the names by similarity. Only without
    // any match at all (facets included), so a page of a cursor walk never switches modes.
    if (query.parsed.kind !== "text" || exact.total > 0 || Object.values(exact.facets).some((f) => f.length)) return exact;
    return run(true);
  },
};
