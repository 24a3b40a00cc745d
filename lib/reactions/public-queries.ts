import "server-only";
import { sql, type SQL } from "drizzle-orm";
import { getDb, type Database, type Transaction } from "@/db/client";
import { isNewestPublic } from "@/db/public-versions";
import { REACTION_CLASSES, RETIRED_REACTION_CLASS_IDS, type ReactionClassId } from "@/lib/deposits/vocabulary";
import { reactionDisplayEquation, speciesDisplayName } from "./display-names";
import { classTag, datasetTag, PUBLIC_TAG, reactionTag, SEARCH_TAG, speciesTag } from "@/lib/public-cache";

/**
 * What the public reaction, species and class pages and the sitemap read. Only published and
 * retracted versions count, and each dataset only through its newest public version (as the
 * reaction page lists it): a draft, a submission or a declined dataset never shows here, not even
 * in a count. Results are plain JSON (no Date objects) so the pages can cache them.
 */

/** The reaction class a stored document names, with retired ids read as their current ones. */
export const classOf = (payload: SQL) => {
  const raw = sql`(${payload} -> 'reaction' ->> 'class')`;
  const retired = Object.entries(RETIRED_REACTION_CLASS_IDS).map(([old, current]) => sql`when ${old} then ${current}`);
  return sql`(case ${raw} ${sql.join(retired, sql` `)} else ${raw} end)`;
};

/** Each dataset's newest public version: id, dataset, reaction, state, class. */
const newestPublic = sql`(
  select v.id, v.dataset_id, v.reaction_id, v.state::text as state, ${classOf(sql`v.payload`)} as class
  from dataset_versions v
  where v.reaction_id is not null and ${isNewestPublic(sql`v`)})`;

/** A reaction with its dataset counts (published; retracted shown apart). */
export interface ReactionCount {
  id: number;
  key: string;
  equation: string;
  datasets: number;
  retracted: number;
}

const toCount = (r: Record<string, unknown>): ReactionCount => ({
  id: Number(r.id),
  key: String(r.key),
  equation: String(r.equation),
  datasets: Number(r.datasets),
  retracted: Number(r.retracted),
});

/** The public reaction with this id or key, or null (unknown, or only drafts describe it). */
export async function findPublicReaction(where: { id: number } | { key: string }) {
  const match = "id" in where ? sql`r.id = ${where.id}` : sql`r.key = ${where.key}`;
  const [row] = await getDb().execute<{ id: number; key: string; equation: string; classes: string[] | null }>(sql`
    select r.id, r.key, ${reactionDisplayEquation(sql`r.id`)} as equation, array_agg(distinct n.class) filter (where n.class is not null) as classes
    from reactions r join ${newestPublic} n on n.reaction_id = r.id
    where ${match} group by r.id`);
  if (!row) return null;
  return { id: Number(row.id), key: row.key, equation: row.equation, classes: knownClasses(row.classes ?? []) };
}

/** Class ids in the order of the vocabulary, unknown ones dropped. */
function knownClasses(ids: string[]): ReactionClassId[] {
  return REACTION_CLASSES.map((c) => c.id).filter((id) => ids.includes(id));
}

/** A species that takes part in a public reaction, with its names, or null. */
export async function findPublicSpecies({ inchiKey }: { inchiKey: string }) {
  const [row] = await getDb().execute<{
    id: number;
    inchi_key: string;
    inchi: string;
    smiles: string;
    formula: string;
    charge: number;
    molar_mass: number;
    name: string;
    names: string[] | null;
  }>(sql`
    select s.id, s.inchi_key, s.inchi, s.canonical_smiles as smiles, s.formula, s.charge, s.molar_mass,
      ${speciesDisplayName(sql`s.id`, sql`s.formula`)} as name,
      -- The display name first, then the other names (synonyms), the most used first.
      (select array_agg(name order by (lower(name) = lower(${speciesDisplayName(sql`s.id`, sql`s.formula`)})) desc, uses desc, lower(name)) from (
        select min(name) as name, count(*) as uses from (
          select e->>'name' as name from dataset_versions v, jsonb_array_elements(v.participant_names) e
          where v.state in ('published', 'retracted') and (e->>'speciesId')::int = s.id
            -- Only versions of reactions the species takes part in can name it (by the reaction index, not every version).
            and v.reaction_id in (select rp.reaction_id from reaction_participants rp where rp.species_id = s.id)
          union all select sn.name from species_names sn where sn.species_id = s.id) all_names
        group by lower(name)) named) as names
    from species s
    where s.inchi_key = ${inchiKey}
      and exists (select 1 from reaction_participants rp join ${newestPublic} n on n.reaction_id = rp.reaction_id where rp.species_id = s.id)`);
  if (!row) return null;
  return {
    id: Number(row.id),
    inchiKey: row.inchi_key,
    inchi: row.inchi,
    smiles: row.smiles,
    formula: row.formula,
    charge: Number(row.charge),
    molarMass: Number(row.molar_mass),
    /** The one name it is shown by (its formula when no public version names it). */
    name: row.name,
    names: row.names ?? [],
  };
}

/** Every public reaction a species takes part in, on which side, with dataset counts. */
export async function listReactionsOfSpecies({ inchiKey }: { inchiKey: string }) {
  const rows = await getDb().execute(sql`
    select r.id, r.key, ${reactionDisplayEquation(sql`r.id`)} as equation,
      bool_or(rp.side = 'reactant') as as_reactant, bool_or(rp.side = 'product') as as_product,
      count(distinct n.dataset_id) filter (where n.state = 'published')::int as datasets,
      count(distinct n.dataset_id) filter (where n.state = 'retracted')::int as retracted
    from species s
    join reaction_participants rp on rp.species_id = s.id
    join reactions r on r.id = rp.reaction_id
    join ${newestPublic} n on n.reaction_id = r.id
    where s.inchi_key = ${inchiKey}
    group by r.id order by 3`);
  return rows.map((r) => ({ ...toCount(r), asReactant: r.as_reactant === true, asProduct: r.as_product === true }));
}

/** Every reaction class with its public reactions and datasets (zero for a class nobody used yet). */
export async function listClassCounts() {
  const rows = await getDb().execute<{ class: string; reactions: number; datasets: number }>(sql`
    select n.class, count(distinct n.reaction_id)::int as reactions, count(distinct n.dataset_id)::int as datasets
    from ${newestPublic} n where n.state = 'published' group by n.class`);
  return REACTION_CLASSES.map((c) => {
    const row = rows.find((r) => r.class === c.id);
    return { id: c.id, reactions: Number(row?.reactions ?? 0), datasets: Number(row?.datasets ?? 0) };
  });
}

/** The public reactions with at least one dataset of this class, with the datasets of the class. */
export async function listReactionsOfClass({ classId }: { classId: ReactionClassId }) {
  const rows = await getDb().execute(sql`
    select r.id, r.key, ${reactionDisplayEquation(sql`r.id`)} as equation,
      count(distinct n.dataset_id) filter (where n.state = 'published')::int as datasets,
      count(distinct n.dataset_id) filter (where n.state = 'retracted')::int as retracted
    from ${newestPublic} n join reactions r on r.id = n.reaction_id
    where n.class = ${classId}
    group by r.id order by 3`);
  return rows.map(toCount);
}

/** The key of every public reaction. */
export async function listPublicReactionKeys() {
  const rows = await getDb().execute<{ key: string }>(sql`
    select distinct r.key from reactions r join ${newestPublic} n on n.reaction_id = r.id order by r.key`);
  return rows.map((r) => r.key);
}

/** The InChIKeys of every species that takes part in a public reaction. */
export async function listPublicSpeciesKeys() {
  const rows = await getDb().execute<{ inchi_key: string }>(sql`
    select distinct s.inchi_key from species s join reaction_participants rp on rp.species_id = s.id
    join ${newestPublic} n on n.reaction_id = rp.reaction_id order by s.inchi_key`);
  return rows.map((r) => r.inchi_key);
}

/** Every public version (published or retracted, old ones too), for the sitemap. */
export async function listPublicVersionPages() {
  const rows = await getDb().execute<{ dataset_id: number; number: number; changed: string | null }>(sql`
    select v.dataset_id, v.number, to_char(coalesce(v.retracted_at, v.published_at) at time zone 'UTC', 'YYYY-MM-DD"T"HH24:MI:SS"Z"') as changed
    from dataset_versions v where v.state in ('published', 'retracted') order by v.dataset_id, v.number`);
  return rows.map((r) => ({ datasetId: Number(r.dataset_id), number: Number(r.number), changed: r.changed }));
}

/**
 * The cache tags of everything a version shows on: its dataset, the reactions of the dataset's
 * public versions and this one (a new version may move the dataset to another reaction), their
 * species and classes, every listing and search. Read after the change committed.
 */
export async function listVersionCacheTags({
  versionId,
  db = getDb(),
}: {
  versionId: number;
  db?: Database | Transaction;
}): Promise<string[]> {
  const rows = await db.execute<{ dataset_id: number; reaction_id: number | null; class: string | null; keys: string[] | null }>(sql`
    select w.dataset_id, w.reaction_id, ${classOf(sql`w.payload`)} as class,
      (select array_agg(s.inchi_key) from reaction_participants rp join species s on s.id = rp.species_id
        where rp.reaction_id = w.reaction_id) as keys
    from dataset_versions v join dataset_versions w on w.dataset_id = v.dataset_id
    where v.id = ${versionId} and (w.id = v.id or w.state in ('published', 'retracted'))`);
  const tags = [PUBLIC_TAG, SEARCH_TAG];
  for (const row of rows) {
    tags.push(datasetTag(Number(row.dataset_id)));
    if (row.reaction_id !== null) tags.push(reactionTag(Number(row.reaction_id)));
    if (row.class) tags.push(classTag(row.class));
    for (const key of row.keys ?? []) tags.push(speciesTag(key));
  }
  return [...new Set(tags)];
}
