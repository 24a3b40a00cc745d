import "server-only";
import { sql, type SQL } from "drizzle-orm";

/**
 * One name per species wherever the public sees it (species, reaction and class pages, search rows,
 * suggestions, what a search was understood as): the name kept in species_display_names (the one
 * its public versions use most, lib/search/documents.ts writeSpeciesDisplayNames), else its formula.
 * A reaction's equation is written from those names, never from the words of its first deposit.
 */

/** The display name of the species `speciesId`, or `formula` when no public version names it. */
export const speciesDisplayName = (speciesId: SQL, formula: SQL): SQL =>
  sql`coalesce((select dn.name from species_display_names dn where dn.species_id = ${speciesId}), ${formula})`;

/** "2 OH → H2O2": a participant as the equation writes it (coefficient 1 left out). */
const participantLabel = sql`(case when rp.coefficient <> 1 then rp.coefficient::text || ' ' else '' end || coalesce(dn.name, s.formula))`;

/**
 * The equation of the reaction `reactionId` in display names, reactants then products in the order
 * they were recorded; "products" when they are not identified (as a deposit's equation says it).
 */
export const reactionDisplayEquation = (reactionId: SQL): SQL => sql`(
  select coalesce(string_agg(${participantLabel}, ' + ' order by rp.ctid) filter (where rp.side = 'reactant'), '')
    || ' → ' || coalesce(string_agg(${participantLabel}, ' + ' order by rp.ctid) filter (where rp.side = 'product'), 'products')
  from reaction_participants rp join species s on s.id = rp.species_id
  left join species_display_names dn on dn.species_id = rp.species_id
  where rp.reaction_id = ${reactionId})`;
