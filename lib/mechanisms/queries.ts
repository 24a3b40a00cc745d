import "server-only";
import { and, desc, eq, inArray, or, sql } from "drizzle-orm";
import { getDb } from "@/db/client";
import { reactions, species, speciesNames } from "@/db/chemistry";
import { mechanismChecks, speciesMappingChoices } from "@/db/mechanisms";
import { speciesDisplayNames } from "@/db/search";
import type { CatalogueSpecies } from "./match";

/** Species whose names (any case) or formulas are among those given, indexed both ways for matchSpecies. */
export async function findSpeciesCatalogue({ names, formulas }: { names: string[]; formulas: string[] }) {
  const byName = new Map<string, CatalogueSpecies[]>();
  const byFormula = new Map<string, CatalogueSpecies[]>();
  const lower = [...new Set(names.map((n) => n.toLowerCase()))];
  if (!lower.length && !formulas.length) return { byName, byFormula };
  const rows = await getDb()
    .select({
      inchiKey: species.inchiKey,
      formula: species.formula,
      display: speciesDisplayNames.name,
      names: sql<
        string[]
      >`coalesce((select array_agg(n.name order by n.name) from species_names n where n.species_id = ${species.id}), '{}')`,
    })
    .from(species)
    .leftJoin(speciesDisplayNames, eq(speciesDisplayNames.speciesId, species.id))
    .where(
      or(
        lower.length
          ? sql`exists (select 1 from species_names n where n.species_id = ${species.id} and lower(n.name) in (${sql.join(
              lower.map((n) => sql`${n}`),
              sql`, `,
            )}))`
          : sql`false`,
        formulas.length ? inArray(species.formula, formulas) : sql`false`,
      ),
    );
  for (const row of rows) {
    const entry: CatalogueSpecies = {
      inchiKey: row.inchiKey,
      formula: row.formula,
      names: row.display ? [row.display, ...row.names.filter((n) => n !== row.display)] : row.names,
    };
    for (const n of new Set(entry.names.map((x) => x.toLowerCase()))) byName.set(n, [...(byName.get(n) ?? []), entry]);
    byFormula.set(entry.formula, [...(byFormula.get(entry.formula) ?? []), entry]);
  }
  return { byName, byFormula };
}

/** Stored reactions by key. */
export async function findReactionIdsByKeys({ keys }: { keys: string[] }): Promise<Map<string, number>> {
  const unique = [...new Set(keys)];
  const out = new Map<string, number>();
  for (let i = 0; i < unique.length; i += 5000) {
    const rows = await getDb()
      .select({ id: reactions.id, key: reactions.key })
      .from(reactions)
      .where(inArray(reactions.key, unique.slice(i, i + 5000)));
    for (const r of rows) out.set(r.key, r.id);
  }
  return out;
}

/** A person's remembered choices: mechanism name → InChIKey. */
export async function listSpeciesChoices({ userId }: { userId: number }): Promise<Map<string, string>> {
  const rows = await getDb()
    .select({ name: speciesMappingChoices.name, inchiKey: species.inchiKey })
    .from(speciesMappingChoices)
    .innerJoin(species, eq(species.id, speciesMappingChoices.speciesId))
    .where(eq(speciesMappingChoices.userId, userId));
  return new Map(rows.map((r) => [r.name, r.inchiKey]));
}

/** Remembers (or replaces) a person's choices; returns the InChIKeys that name no species. */
export async function saveSpeciesChoices({ userId, choices }: { userId: number; choices: { name: string; inchiKey: string }[] }) {
  if (!choices.length) return { unknown: [] as string[] };
  const found = await getDb()
    .select({ id: species.id, inchiKey: species.inchiKey })
    .from(species)
    .where(
      inArray(
        species.inchiKey,
        choices.map((c) => c.inchiKey),
      ),
    );
  const idOf = new Map(found.map((f) => [f.inchiKey, f.id]));
  const unknown = choices.filter((c) => !idOf.has(c.inchiKey)).map((c) => c.inchiKey);
  if (unknown.length) return { unknown };
  await getDb()
    .insert(speciesMappingChoices)
    .values(choices.map((c) => ({ userId, name: c.name, speciesId: idOf.get(c.inchiKey) as number })))
    .onConflictDoUpdate({
      target: [speciesMappingChoices.userId, speciesMappingChoices.name],
      set: { speciesId: sql`excluded.species_id`, updatedAt: sql`now()` },
    });
  return { unknown };
}

/** Species whose name, SMILES or InChI/InChIKey matches the text, for the mapping table's search (at most 20). */
export async function searchSpeciesForMapping({ text }: { text: string }) {
  const t = text.trim();
  if (!t) return [];
  return getDb()
    .selectDistinct({
      inchiKey: species.inchiKey,
      formula: species.formula,
      smiles: species.canonicalSmiles,
      name: speciesDisplayNames.name,
    })
    .from(species)
    .leftJoin(speciesDisplayNames, eq(speciesDisplayNames.speciesId, species.id))
    .leftJoin(speciesNames, eq(speciesNames.speciesId, species.id))
    .where(
      or(
        sql`lower(${speciesNames.name}) = lower(${t})`,
        eq(species.canonicalSmiles, t),
        eq(species.inchi, t),
        eq(species.inchiKey, t.toUpperCase()),
        eq(species.formula, t),
      ),
    )
    .limit(20);
}

export async function createMechanismCheck(values: {
  ownerId: number;
  name: string;
  source: string;
  window: { Tmin: number; Tmax: number };
  total: number;
}): Promise<number> {
  const [row] = await getDb()
    .insert(mechanismChecks)
    .values({
      ownerId: values.ownerId,
      name: values.name,
      source: values.source,
      windowTmin: values.window.Tmin,
      windowTmax: values.window.Tmax,
      total: values.total,
      state: "running",
      attempts: 1,
      heartbeatAt: sql`now()`,
    })
    .returning({ id: mechanismChecks.id });
  return row.id;
}

export async function finishMechanismCheck({ id, report }: { id: number; report: Record<string, unknown> }) {
  await getDb()
    .update(mechanismChecks)
    .set({ state: "done", report, progress: mechanismChecks.total, finishedAt: sql`now()`, heartbeatAt: null })
    .where(eq(mechanismChecks.id, id));
}

export async function failMechanismCheck({ id, error }: { id: number; error: string }) {
  await getDb()
    .update(mechanismChecks)
    .set({ state: "failed", error, finishedAt: sql`now()`, heartbeatAt: null })
    .where(eq(mechanismChecks.id, id));
}

/** One check as its reader sees it (never the source text). */
export async function getMechanismCheck({ id }: { id: number }) {
  const [row] = await getDb()
    .select({
      id: mechanismChecks.id,
      ownerId: mechanismChecks.ownerId,
      state: mechanismChecks.state,
      name: mechanismChecks.name,
      windowTmin: mechanismChecks.windowTmin,
      windowTmax: mechanismChecks.windowTmax,
      progress: mechanismChecks.progress,
      total: mechanismChecks.total,
      shareToken: mechanismChecks.shareToken,
      report: mechanismChecks.report,
      error: mechanismChecks.error,
      createdAt: mechanismChecks.createdAt,
      finishedAt: mechanismChecks.finishedAt,
    })
    .from(mechanismChecks)
    .where(eq(mechanismChecks.id, id));
  return row ?? null;
}

/** The owner's checks, newest first (no report bodies). */
export async function listMechanismChecks({ ownerId }: { ownerId: number }) {
  return getDb()
    .select({
      id: mechanismChecks.id,
      name: mechanismChecks.name,
      state: mechanismChecks.state,
      createdAt: mechanismChecks.createdAt,
      summary: sql<Record<string, number> | null>`${mechanismChecks.report} -> 'summary'`,
    })
    .from(mechanismChecks)
    .where(eq(mechanismChecks.ownerId, ownerId))
    .orderBy(desc(mechanismChecks.createdAt))
    .limit(100);
}

/** Sets (a new random token) or clears the share token; only the owner's row changes. */
export async function setMechanismCheckShare({ id, ownerId, token }: { id: number; ownerId: number; token: string | null }) {
  const rows = await getDb()
    .update(mechanismChecks)
    .set({ shareToken: token })
    .where(and(eq(mechanismChecks.id, id), eq(mechanismChecks.ownerId, ownerId)))
    .returning({ id: mechanismChecks.id });
  return rows.length > 0;
}
