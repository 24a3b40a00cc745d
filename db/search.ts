import { sql } from "drizzle-orm";
import { boolean, customType, doublePrecision, index, integer, jsonb, pgTable, text, timestamp } from "drizzle-orm/pg-core";
import { reactions, species } from "./chemistry";
import { datasetVersions } from "./datasets";

const tsvector = customType<{ data: string }>({ dataType: () => "tsvector" });

/**
 * The PostgreSQL search engine's documents (lib/search/types.ts SearchDocument): one row per
 * published or retracted version, written in the transaction that publishes, retracts or re-fits
 * it (lib/search/documents.ts). A trigger (drizzle/0022) refuses a row for any other version, so
 * a draft, a submission or a declined dataset can never be found.
 */
export const searchDocuments = pgTable(
  "search_documents",
  {
    versionId: integer()
      .primaryKey()
      .references(() => datasetVersions.id, { onDelete: "cascade" }),
    datasetId: integer().notNull(),
    versionNumber: integer().notNull(),
    /** The newest public version of its dataset: only these are listed. */
    latest: boolean().notNull(),
    retracted: boolean().notNull(),
    versionIdentifier: text(),
    title: text().notNull(),
    description: text().notNull(),
    keywords: text().array().notNull(),
    creators: text().array().notNull(),
    technique: text().notNull(),
    source: text().notNull(),
    sourceYear: integer(),
    reactionId: integer()
      .notNull()
      .references(() => reactions.id),
    reactionKey: text().notNull(),
    equation: text().notNull(),
    reactantKeys: text().array().notNull(),
    productKeys: text().array().notNull(),
    speciesNames: text().array().notNull(),
    formulas: text().array().notNull(),
    reactionClass: text().notNull(),
    phase: text().notNull(),
    methodCategory: text().notNull(),
    bathGases: text().array().notNull(),
    licence: text().notNull(),
    tMin: doublePrecision().notNull(),
    tMax: doublePrecision().notNull(),
    pMin: doublePrecision(),
    pMax: doublePrecision(),
    pointCount: integer().notNull(),
    flags: text().array().notNull(),
    ea: doublePrecision(),
    a: doublePrecision(),
    aUnit: text(),
    publishedAt: timestamp({ withTimezone: true }).notNull(),
    /** Width of the measured range (K), for the "widest range" sort. */
    tSpan: doublePrecision().generatedAlwaysAs(sql`t_max - t_min`),
    /** Weighted text: title, equation, species names and formulas (A); keywords, creators, technique (B); description, source (C). */
    document: tsvector()
      .notNull()
      .generatedAlwaysAs(
        sql`arrhenia_search_vector(title, equation, species_names, formulas, keywords, creators, technique, description, source)`,
      ),
    /**
     * The short part of `document` (weights A and B: title to technique, no description or source), kept
     * in the row (storage main, drizzle/0029): its ts_rank is the cheap score that picks which matches
     * of a text search are ranked on the whole document (lib/search/engines/postgres.ts).
     */
    head: tsvector()
      .notNull()
      .generatedAlwaysAs(sql`arrhenia_search_head(title, equation, species_names, formulas, keywords, creators, technique)`),
    /** Names, formulas and the equation in lower case, for typo-tolerant matching (pg_trgm). */
    namesText: text()
      .notNull()
      .generatedAlwaysAs(sql`arrhenia_search_names(species_names, formulas, equation)`),
  },
  (t) => [
    index("search_documents_dataset_idx").on(t.datasetId),
    index("search_documents_reaction_idx").on(t.reactionId),
    index("search_documents_document_idx").using("gin", t.document),
    index("search_documents_names_trgm_idx").using("gin", sql`${t.namesText} gin_trgm_ops`),
    index("search_documents_reactant_keys_idx").using("gin", t.reactantKeys),
    index("search_documents_product_keys_idx").using("gin", t.productKeys),
    index("search_documents_creators_idx").using("gin", t.creators),
    index("search_documents_t_min_idx").on(t.tMin),
    index("search_documents_t_max_idx").on(t.tMax),
    index("search_documents_p_min_idx").on(t.pMin),
    index("search_documents_p_max_idx").on(t.pMax),
    index("search_documents_newest_idx")
      .on(t.publishedAt.desc(), t.versionId.desc())
      .where(sql`latest`),
    index("search_documents_points_idx")
      .on(t.pointCount.desc(), t.versionId.desc())
      .where(sql`latest`),
    index("search_documents_span_idx")
      .on(t.tSpan.desc(), t.versionId.desc())
      .where(sql`latest`),
  ],
);

/**
 * Per reaction with public data: the consensus over the reader's default selection and the spread
 * of its datasets, for the reactions view of search. Rewritten with the search documents.
 */
export const searchReactionSummaries = pgTable("search_reaction_summaries", {
  reactionId: integer()
    .primaryKey()
    .references(() => reactions.id, { onDelete: "cascade" }),
  /** The consensus expression as lib/search/types.ts ReactionHit["consensus"] states it (db/ imports no domain types). */
  consensus: jsonb().$type<Record<string, unknown> | null>(),
  /**
   * What a mechanism check's verdicts need of the reaction's data (lib/mechanisms/stored-basis.ts): null in rows written
   * before it was kept (drizzle/0036; `npm run db:migrate` fills them in).
   */
  comparison: jsonb().$type<Record<string, unknown> | null>(),
  /**
   * The engine's answer for the default choice of data, with the engine version and a fingerprint of its input
   * (lib/reactions/stored-consensus.ts): the reaction page reads it instead of running the engine when its own input
   * is the same. Null in rows written before it was kept (drizzle/0037; `npm run db:migrate` fills them in).
   */
  consensusResult: jsonb().$type<Record<string, unknown> | null>(),
  spread: doublePrecision(),
  updatedAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
});

/**
 * The one name each species is shown by on public pages, in search and in suggestions: the name
 * its public versions (published or retracted) give it most often, ties broken by the name's
 * lower-case then exact spelling; a species no public version names has no row (its formula is
 * shown). Rewritten in the publishing transaction with the search documents (lib/search/documents.ts).
 */
export const speciesDisplayNames = pgTable("species_display_names", {
  speciesId: integer()
    .primaryKey()
    .references(() => species.id, { onDelete: "cascade" }),
  name: text().notNull(),
});
