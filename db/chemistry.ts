import { index, integer, pgEnum, pgTable, primaryKey, real, text, timestamp, uniqueIndex } from "drizzle-orm/pg-core";
import { sql } from "drizzle-orm";

/** One chemical species, identified by its standard InChIKey. */
export const species = pgTable(
  "species",
  {
    id: integer().primaryKey().generatedAlwaysAsIdentity(),
    inchiKey: text().notNull(),
    inchi: text().notNull(),
    canonicalSmiles: text().notNull(),
    formula: text().notNull(),
    charge: integer().notNull().default(0),
    molarMass: real().notNull(),
    radicalElectrons: integer().notNull().default(0),
    createdAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [uniqueIndex("species_inchi_key_key").on(t.inchiKey)],
);

/** Names people use for a species ("hydroxyl", "OH"); any number per species. */
export const speciesNames = pgTable(
  "species_names",
  {
    speciesId: integer()
      .notNull()
      .references(() => species.id, { onDelete: "cascade" }),
    name: text().notNull(),
  },
  (t) => [
    uniqueIndex("species_names_key").on(t.speciesId, sql`lower(${t.name})`),
    index("species_names_name_idx").on(sql`lower(${t.name})`),
  ],
);

export const reactionSideEnum = pgEnum("reaction_side", ["reactant", "product"]);

/** A reaction, keyed by the sorted InChIKeys and coefficients of both sides (direction matters). */
export const reactions = pgTable(
  "reactions",
  {
    id: integer().primaryKey().generatedAlwaysAsIdentity(),
    key: text().notNull(),
    equation: text().notNull(),
    createdAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [uniqueIndex("reactions_key_key").on(t.key)],
);

export const reactionParticipants = pgTable(
  "reaction_participants",
  {
    reactionId: integer()
      .notNull()
      .references(() => reactions.id, { onDelete: "cascade" }),
    speciesId: integer()
      .notNull()
      .references(() => species.id),
    side: reactionSideEnum().notNull(),
    /** Stoichiometric coefficient; fractional values (½ O2) are allowed. */
    coefficient: real().notNull(),
  },
  (t) => [primaryKey({ columns: [t.reactionId, t.speciesId, t.side] })],
);

/**
 * Depictions of species as RDKit draws them (lib/species/drawings.ts): a drawing depends only on
 * the SMILES, the size and the drawing toolkit's version, so one made is kept for every later page
 * (drawing takes RDKit 2–5 ms; reading it back, a fraction of one). Filled when first needed and,
 * for every species at the sizes the public pages use, by `npm run db:migrate`.
 */
export const speciesDrawings = pgTable(
  "species_drawings",
  {
    smiles: text().notNull(),
    width: integer().notNull(),
    height: integer().notNull(),
    /** The RDKit version that drew it: another version draws anew. */
    drawer: text().notNull(),
    svg: text().notNull(),
    createdAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [primaryKey({ columns: [t.smiles, t.width, t.height, t.drawer] })],
);
