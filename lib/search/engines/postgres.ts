import "server-only";
import { sql, type SQL } from "drizzle-orm";
import { getDb } from "@/db/client";
import { AppError } from "@/lib/errors";
import {
  countFacets,
  datasetHitAt,
  filterWindows,
  memoryIndex,
  positionsBySets,
  positionsOfReactionKey,
  setsHoldingEvery,
  type MemoryIndex,
} from "./memory-index";
import { relevanceKeys, topByKey } from "./relevance";
import {
  SEARCH_FACETS,
  type EngineQuery,
  type FacetCount,
  type ReactionHit,
  type SearchEngine,
  type SearchFacet,
  type SearchResult,
} from "../types";

/**
 * The PostgreSQL engine, over search_documents (drizzle/0022) and the in-memory index of its
 * listed documents (./memory-index.ts). Every query lists only `latest` documents (the newest
 * public version of each dataset; retracted ones are listed and marked).
 *
 * - Text: websearch_to_tsquery('english') against the weighted tsvector, in PostgreSQL; when that
 *   matches nothing, a trigram word similarity of at least 0.7 with the names, formulas and
 *   equation (typos in names). The only part that reads the text indexes.
 * - Species: the reaction has one of the keys on either side; reaction patterns: each reactant
 *   term among the reactants, each product term among the products; a reaction key — in the index.
 * - Filters, in the index: values of one facet are or-ed, facets and-ed; temperature window
 *   overlap (or cover), pressure window overlap, source years.
 * - Sorts, each with version_id (reaction id) as the tiebreak, in the index: relevance (for text,
 *   see RANKED; newest otherwise), newest, widest range, most points; keyset pagination on (sort key,
 *   id). The page's rows are read from the index too (`datasetHitAt`).
 * - Facet counts, exact, in the index: each facet over the matches with every other facet's filter applied.
 */

/** The least word similarity of a name to what was typed for the fuzzy fallback to take it. */
const FUZZY_SIMILARITY = 0.7;

/** Text search query of the free text; the same expression in the filter and in ts_rank. */
// Slashes separate words, as in the documents (drizzle/0043): "RRKM/master" is two words.
const tsQuery = (text: string) => sql`websearch_to_tsquery('english', ${text.replace(/[/\\]/g, " ")})`;

/**
 * The text match (what was typed). Free text matches words (stemmed); `fuzzy` instead matches
 * names close to what was typed ("metane", "hydroxil"), the fallback when the words match
 * nothing: or-ing both in one query made the planner test the trigram similarity on every row.
 */
function textMatch(text: string, fuzzy: boolean): SQL {
  return fuzzy
    ? sql`(${text.toLowerCase()} <% d.names_text and word_similarity(${text.toLowerCase()}, d.names_text) >= ${sql.raw(String(FUZZY_SIMILARITY))})`
    : sql`d.document @@ ${tsQuery(text)}`;
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

/** The sort key of a cursor as a number (cursors of this engine carry the key as written by String(number)). */
function numericAfter(after: { key: string; id: number } | null): { key: number; id: number } | null {
  if (!after) return null;
  const key = Number(after.key);
  if (after.key === "" || !Number.isFinite(key)) {
    const message = "cursor is not one this search gave out";
    throw new AppError("bad_request", message, [{ pointer: "/cursor", parameter: "cursor", message }]);
  }
  return { key, id: after.id };
}

/**
 * The candidates of the typed text: positions in the index of the listed documents it matches,
 * with their cheap score (RANKED) when the sort is by relevance. Only this part reads search_documents'
 * text indexes; structured queries (species, reaction patterns, a reaction key, nothing typed)
 * are matched in the index itself.
 */
async function candidatesOf(
  index: MemoryIndex,
  query: EngineQuery,
  fuzzy: boolean,
): Promise<{ positions: Int32Array; rank: Float64Array | null }> {
  const parsed = query.parsed;
  if (parsed.kind === "text") {
    const ranked = query.sort === "relevance";
    // Through the text indexes only: for a common word the planner prefers reading the whole table,
    // which tests the match on every row's document, mostly compressed out of line ("combustion",
    // 33 084 of 104 937: 0.8–1.3 s); the index gives the matching rows without opening a document
    // (0.3–0.4 s, load average ~8).
    const rows = await getDb().transaction(async (tx) => {
      await tx.execute(sql`set local enable_seqscan = off`);
      // The trigram index tests `<%` at this threshold before any row is read: at its default (0.6)
      // it let ~32 000 rows through for a misspelt name, each then rechecked against 0.7 (1.4 s).
      if (fuzzy) await tx.execute(sql.raw(`set local pg_trgm.word_similarity_threshold = ${FUZZY_SIMILARITY}`));
      return tx.execute<{ version_id: number; rank: number | null }>(sql`
        select d.version_id, ${ranked ? sql`ts_rank(d.head, ${tsQuery(parsed.text)})::float8` : sql`null::float8`} as rank
        from search_documents d where d.latest and ${textMatch(parsed.text, fuzzy)}`);
    });
    const positions: number[] = [];
    const ranks: number[] = [];
    for (const r of rows) {
      const at = index.byVersion.get(Number(r.version_id));
      if (at === undefined) continue;
      positions.push(at);
      ranks.push(r.rank === null ? 0 : Number(r.rank));
    }
    return { positions: Int32Array.from(positions), rank: ranked ? Float64Array.from(ranks) : null };
  }
  switch (parsed.kind) {
    case "all": {
      const all = new Int32Array(index.size);
      for (let i = 0; i < index.size; i++) all[i] = i;
      return { positions: all, rank: null };
    }
    case "species": {
      // Decided once per distinct key set (documents of a reaction share theirs).
      const hit = setsHoldingEvery(index, [parsed.inchiKeys]);
      return { positions: positionsBySets(index, hit, hit, "either"), rank: null };
    }
    case "reaction": {
      const reactantsOk = setsHoldingEvery(index, parsed.reactants);
      const productsOk = setsHoldingEvery(index, parsed.products);
      return { positions: positionsBySets(index, reactantsOk, productsOk, "both"), rank: null };
    }
    case "reactionKey":
      return { positions: positionsOfReactionKey(index, parsed.key), rank: null };
  }
}

/** The datasets view's sort key of one document. */
function datasetKey(index: MemoryIndex, sort: EngineQuery["sort"], i: number, rank: number): number {
  switch (sort) {
    case "relevance":
      return rank;
    case "newest":
      return index.publishedMicros[i];
    case "widest":
      return index.tMax[i] - index.tMin[i];
    case "points":
      return index.pointCount[i];
  }
}

async function runSearch(index: MemoryIndex, query: EngineQuery, fuzzy: boolean): Promise<SearchResult> {
  const after = numericAfter(readAfter(query.after));
  const sort = query.sort === "relevance" && query.parsed.kind !== "text" ? "newest" : query.sort;
  const { positions, rank } = await candidatesOf(index, query, fuzzy);
  // Windows first (not facets: they narrow every count), keeping each candidate's rank beside it.
  const keep = rank ? new Uint8Array(positions.length) : undefined;
  const inWindow = filterWindows(index, positions, query.filters, keep);
  const rankOf = new Map<number, number>();
  if (rank && keep) for (let k = 0; k < positions.length; k++) if (keep[k]) rankOf.set(positions[k], rank[k]);
  const { matched, facets } = countFacets(index, inWindow, query.filters, SEARCH_FACETS);
  if (rank && query.parsed.kind === "text") {
    // RANKED (./relevance.ts): the best matches by the cheap score get ts_rank over the whole document.
    const text = query.parsed.text;
    const keys = await relevanceKeys(
      Array.from(matched, (i) => index.versionId[i]),
      Array.from(matched, (i) => rankOf.get(i) ?? 0),
      (ids) => wholeDocumentRanks(ids, text),
    );
    matched.forEach((i, k) => rankOf.set(i, keys[k]));
  }
  const facetCounts = facets as Record<SearchFacet, FacetCount[]>;
  if (query.view === "reactions") {
    // Each reaction's matching documents, summed up as the reactions view sorts them. A retracted
    // version is found and counted apart, never evidence: not in the count, the range, the points
    // or the widest order (-1 / 0 when every match is retracted).
    type Group = { count: number; retracted: number; tMin: number; tMax: number; newest: number; points: number; best: number };
    const groups = new Map<number, Group>();
    for (const i of matched) {
      const r = index.reaction[i];
      let g = groups.get(r);
      if (!g) {
        g = { count: 0, retracted: 0, tMin: Infinity, tMax: -Infinity, newest: -Infinity, points: 0, best: -Infinity };
        groups.set(r, g);
      }
      g.newest = Math.max(g.newest, index.publishedMicros[i]);
      g.best = Math.max(g.best, rankOf.get(i) ?? 0);
      if (index.retracted[i]) {
        g.retracted++;
        continue;
      }
      g.count++;
      g.tMin = Math.min(g.tMin, index.tMin[i]);
      g.tMax = Math.max(g.tMax, index.tMax[i]);
      g.points += index.pointCount[i];
    }
    const widest = (g: Group) => (g.count ? g.tMax - g.tMin : -1);
    const items = [...groups].map(([r, g]) => ({
      id: index.reactions[r].id,
      at: r,
      g,
      key: sort === "relevance" ? g.best : sort === "newest" ? g.newest : sort === "widest" ? widest(g) : g.points,
    }));
    const page = topByKey(
      items.length,
      (k) => items[k].key,
      (k) => items[k].id,
      after,
      query.limit,
    ).map((p) => items[p.k]);
    const shown = page.slice(0, query.limit);
    const summaries = await reactionSummaries(shown.map((p) => p.id));
    const hits: ReactionHit[] = shown.map((p) => ({
      reactionId: p.id,
      reactionKey: index.reactions[p.at].key,
      equation: index.reactions[p.at].equation,
      datasetCount: p.g.count,
      retractedCount: p.g.retracted,
      tMin: p.g.count ? p.g.tMin : null,
      tMax: p.g.count ? p.g.tMax : null,
      consensus: summaries.get(p.id)?.consensus ?? null,
      spread: summaries.get(p.id)?.spread ?? null,
    }));
    const last = shown[shown.length - 1];
    return {
      view: "reactions",
      total: groups.size,
      hits,
      facets: facetCounts,
      nextAfter: page.length > query.limit && last ? JSON.stringify([String(last.key), last.id]) : null,
    };
  }
  const page = topByKey(
    matched.length,
    (k) => datasetKey(index, sort, matched[k], rank ? (rankOf.get(matched[k]) ?? 0) : 0),
    (k) => index.versionId[matched[k]],
    after,
    query.limit,
  );
  const shown = page.slice(0, query.limit);
  const last = shown[shown.length - 1];
  return {
    view: "datasets",
    total: matched.length,
    hits: shown.map((p) => datasetHitAt(index, matched[p.k])),
    facets: facetCounts,
    nextAfter: page.length > query.limit && last ? JSON.stringify([String(last.key), last.id]) : null,
  };
}

/** ts_rank of the text over the whole document of these versions, read by primary key. */
async function wholeDocumentRanks(versionIds: number[], text: string): Promise<Map<number, number>> {
  const rows = await getDb().execute<{ version_id: number; rank: number }>(sql`
    select d.version_id, ts_rank(d.document, ${tsQuery(text)})::float8 as rank
    from search_documents d where d.version_id = any(${`{${versionIds.join(",")}}`}::int[])`);
  return new Map(rows.map((r) => [Number(r.version_id), Number(r.rank)]));
}

/** The reactions view's consensus and spread of these reactions. */
async function reactionSummaries(reactionIds: number[]) {
  if (!reactionIds.length) return new Map<number, { consensus: ReactionHit["consensus"]; spread: number | null }>();
  const rows = await getDb().execute<{ reaction_id: number; consensus: ReactionHit["consensus"]; spread: number | null }>(sql`
    select reaction_id, consensus, spread from search_reaction_summaries where reaction_id = any(${`{${reactionIds.join(",")}}`}::int[])`);
  return new Map(
    rows.map((r) => [Number(r.reaction_id), { consensus: r.consensus ?? null, spread: r.spread === null ? null : Number(r.spread) }]),
  );
}

/**
 * PostgreSQL's refusal of a text whose operators nest too deep for its query parser (websearch_to_tsquery:
 * "tsquery stack too small", e.g. a run of 33 hyphens, each a NOT) as the reader's error, naming q.
 */
function tooNestedText(err: unknown): AppError | null {
  if (!(err instanceof Error)) return null;
  const message = `${err.message} ${(err as { cause?: { message?: unknown } }).cause?.message ?? ""}`;
  if (!/tsquery stack too small/i.test(message)) return null;
  const text = "q nests too many search operators (a run of “-”, quotes or OR); write the words without them";
  return new AppError("bad_request", text, [{ pointer: "/q", parameter: "q", message: text }]);
}

export const postgresEngine: SearchEngine = {
  name: "postgres",
  async search(query: EngineQuery): Promise<SearchResult> {
    const index = await memoryIndex();
    try {
      const exact = await runSearch(index, query, false);
      // Words that match nothing may be a misspelt name: try the names by similarity. Only without
      // any match at all (facets included), so a page of a cursor walk never switches modes.
      if (query.parsed.kind !== "text" || exact.total > 0 || Object.values(exact.facets).some((f) => f.length)) return exact;
      return await runSearch(index, query, true);
    } catch (err) {
      throw tooNestedText(err) ?? err;
    }
  },
};
