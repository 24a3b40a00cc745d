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
