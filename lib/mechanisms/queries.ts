import "server-only";
import { and, desc, eq, inArray, or, sql } from "drizzle-orm";
import { getDb, type Transaction } from "@/db/client";
import { reactions, species } from "@/db/chemistry";
import { mechanismChecks, speciesMappingChoices } from "@/db/mechanisms";
import { searchReactionSummaries, speciesDisplayNames } from "@/db/search";
import { ENGINE_VERSION } from "@/lib/datasets/prepare";
import type { ComparisonBasis } from "./judge";
import { readStoredBasis } from "./stored-basis";
import type PgBoss from "pg-boss";
import { AppError } from "@/lib/errors";
import { getSender, jobsInTransaction, queueOptions } from "@/lib/jobs/boss";
import type { CatalogueSpecies } from "./match";
import { HEARTBEAT_STALE_SECONDS, MAX_CHECK_RUNS, STOPPED_TOO_OFTEN, type CheckProgress } from "./progress";

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

/** A species' first name in alphabetical order, for one without a display name (no public version names it). */
const firstName = sql`(select min(n.name) from species_names n where n.species_id = ${species.id})`;

/**
 * The kept comparison bases of these reactions (lib/mechanisms/stored-basis.ts), by reaction id; a
 * reaction without a usable one is not in the map.
 */
export async function listComparisonBases({ reactionIds }: { reactionIds: number[] }): Promise<Map<number, ComparisonBasis>> {
  const found = new Map<number, ComparisonBasis>();
  if (!reactionIds.length) return found;
  const rows = await getDb()
    .select({ reactionId: searchReactionSummaries.reactionId, comparison: searchReactionSummaries.comparison })
    .from(searchReactionSummaries)
    .where(inArray(searchReactionSummaries.reactionId, reactionIds));
  for (const row of rows) {
    const basis = readStoredBasis(row.comparison, ENGINE_VERSION);
    if (basis) found.set(row.reactionId, basis);
  }
  return found;
}

/** A person's remembered choices: mechanism name → the species chosen (its InChIKey, formula and display name). */
export async function listSpeciesChoices({ userId }: { userId: number }) {
  const rows = await getDb()
    .select({
      name: speciesMappingChoices.name,
      inchiKey: species.inchiKey,
      formula: species.formula,
      display: sql<string>`coalesce(${speciesDisplayNames.name}, ${firstName}, ${species.formula})`,
    })
    .from(speciesMappingChoices)
    .innerJoin(species, eq(species.id, speciesMappingChoices.speciesId))
    .leftJoin(speciesDisplayNames, eq(speciesDisplayNames.speciesId, species.id))
    .where(eq(speciesMappingChoices.userId, userId));
  return new Map(rows.map((r) => [r.name, { inchiKey: r.inchiKey, formula: r.formula, name: r.display }]));
}

/** Remembers (or replaces) a person's choices; returns the InChIKeys that name no species. */
/** Forgets one of a person's remembered choices; false when there was none under that name. */
export async function forgetSpeciesChoice({ userId, name }: { userId: number; name: string }): Promise<boolean> {
  const gone = await getDb()
    .delete(speciesMappingChoices)
    .where(and(eq(speciesMappingChoices.userId, userId), eq(speciesMappingChoices.name, name)))
    .returning({ name: speciesMappingChoices.name });
  return gone.length > 0;
}

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

/**
 * Species for the mapping table's search (at most 20): a name containing the text (any case), the formula, the
 * canonical SMILES, InChI or InChIKey as given, or one of `inchiKeys` (a structure the caller read from the text).
 */
export async function searchSpeciesForMapping({ text, inchiKeys = [] }: { text: string; inchiKeys?: string[] }) {
  const t = text.trim();
  if (!t) return [];
  const like = `%${t.toLowerCase().replace(/[\\%_]/g, (c) => `\\${c}`)}%`;
  return getDb()
    .select({
      inchiKey: species.inchiKey,
      formula: species.formula,
      smiles: species.canonicalSmiles,
      name: sql<string>`coalesce(${speciesDisplayNames.name}, ${firstName}, ${species.formula})`,
      names: sql<
        string[]
      >`coalesce((select array_agg(n.name order by n.name) from species_names n where n.species_id = ${species.id}), '{}')`,
    })
    .from(species)
    .leftJoin(speciesDisplayNames, eq(speciesDisplayNames.speciesId, species.id))
    .where(
      or(
        sql`exists (select 1 from species_names n where n.species_id = ${species.id} and lower(n.name) like ${like})`,
        eq(species.canonicalSmiles, t),
        eq(species.inchi, t),
        eq(species.formula, t),
        inArray(species.inchiKey, [t.toUpperCase(), ...inchiKeys]),
      ),
    )
    .orderBy(
      sql`${species.formula} = ${t} or ${species.inchiKey} in (${sql.join(
        [t.toUpperCase(), ...inchiKeys].map((k) => sql`${k}`),
        sql`, `,
      )}) desc`,
      species.formula,
    )
    .limit(20);
}

/** The job a check's run is (lib/mechanisms/check-job.ts), queued through the transaction that stores or resets the check. */
export const MECHANISM_CHECK_QUEUE = "mechanism-check";
export type MechanismCheckJob = { checkId: number };

async function sendCheckJob(tx: Transaction, checkId: number) {
  const boss = await getSender();
  await boss.send(MECHANISM_CHECK_QUEUE, { checkId } satisfies MechanismCheckJob, {
    ...(queueOptions[MECHANISM_CHECK_QUEUE] as PgBoss.SendOptions),
    db: jobsInTransaction(tx),
  });
}

/** Stores a check as queued and queues its run, both or neither. */
export async function createQueuedMechanismCheck(values: {
  ownerId: number;
  name: string;
  source: string;
  format: string;
  window: { Tmin: number; Tmax: number };
  total: number;
}): Promise<number> {
  return getDb().transaction(async (tx) => {
    const [row] = await tx
      .insert(mechanismChecks)
      .values({
        ownerId: values.ownerId,
        name: values.name,
        source: values.source,
        format: values.format,
        windowTmin: values.window.Tmin,
        windowTmax: values.window.Tmax,
        total: values.total,
        state: "queued",
      })
      .returning({ id: mechanismChecks.id });
    await sendCheckJob(tx, row.id);
    return row.id;
  });
}

/**
 * Queues a finished or failed check of its owner again (the person's choices may have changed); its report is
 * kept until the new run replaces it. False when the check is not the owner's; a conflict while it is queued or running.
 */
export async function requeueMechanismCheck({ id, ownerId }: { id: number; ownerId: number }): Promise<boolean> {
  return getDb().transaction(async (tx) => {
    const [row] = await tx
      .select({ state: mechanismChecks.state })
      .from(mechanismChecks)
      .where(and(eq(mechanismChecks.id, id), eq(mechanismChecks.ownerId, ownerId)))
      .for("update");
    if (!row) return false;
    if (row.state === "queued" || row.state === "running") throw new AppError("conflict", `The check is already ${row.state}.`);
    await tx
      .update(mechanismChecks)
      .set({ state: "queued", attempts: 0, stage: null, progress: 0, error: null, heartbeatAt: null, finishedAt: null })
      .where(eq(mechanismChecks.id, id));
    await sendCheckJob(tx, id);
    return true;
  });
}

/**
 * Takes a queued check for one run: running, one more attempt, a fresh heartbeat. Null when it is not queued (another
 * run has it, or it is settled), so a job handed out twice runs it once.
 */
export async function claimMechanismCheck({ id }: { id: number }) {
  const [row] = await getDb()
    .update(mechanismChecks)
    .set({ state: "running", attempts: sql`${mechanismChecks.attempts} + 1`, heartbeatAt: sql`now()`, stage: null, progress: 0 })
    .where(and(eq(mechanismChecks.id, id), eq(mechanismChecks.state, "queued")))
    .returning({
      ownerId: mechanismChecks.ownerId,
      source: mechanismChecks.source,
      format: mechanismChecks.format,
      windowTmin: mechanismChecks.windowTmin,
      windowTmax: mechanismChecks.windowTmax,
      attempts: mechanismChecks.attempts,
    });
  return row ?? null;
}

/** A running check's heartbeat, with its progress when given. */
export async function beatMechanismCheck({ id, progress }: { id: number; progress?: CheckProgress }) {
  await getDb()
    .update(mechanismChecks)
    .set({ heartbeatAt: sql`now()`, ...(progress ? { stage: progress.stage, progress: progress.done, total: progress.total } : {}) })
    .where(and(eq(mechanismChecks.id, id), eq(mechanismChecks.state, "running")));
}

/**
 * Running checks whose heartbeat is older than HEARTBEAT_STALE_SECONDS (their server stopped): queued again with a new
 * job, or failed with a worded message after MAX_CHECK_RUNS runs. Queued checks whose job is gone (failed for good
 * while the database was out of reach) get a new one. Returns the ids queued and failed.
 */
export async function sweepStalledMechanismChecks({ staleSeconds = HEARTBEAT_STALE_SECONDS } = {}) {
  return getDb().transaction(async (tx) => {
    const stale = and(
      eq(mechanismChecks.state, "running"),
      sql`${mechanismChecks.heartbeatAt} < now() - make_interval(secs => ${staleSeconds})`,
    );
    const failed = await tx
      .update(mechanismChecks)
      .set({ state: "failed", error: STOPPED_TOO_OFTEN, finishedAt: sql`now()`, heartbeatAt: null })
      .where(and(stale, sql`${mechanismChecks.attempts} >= ${MAX_CHECK_RUNS}`))
      .returning({ id: mechanismChecks.id });
    const requeued = await tx
      .update(mechanismChecks)
      .set({ state: "queued", heartbeatAt: null, stage: null, progress: 0 })
      .where(and(stale, sql`${mechanismChecks.attempts} < ${MAX_CHECK_RUNS}`))
      .returning({ id: mechanismChecks.id });
    const orphans = await tx.execute<{ id: number }>(sql`
      select c.id from mechanism_checks c where c.state = 'queued' and c.created_at < now() - interval '1 minute'
      and not exists (select 1 from pgboss.job j where j.name = ${MECHANISM_CHECK_QUEUE} and j.state in ('created', 'retry', 'active')
        and (j.data ->> 'checkId')::int = c.id)`);
    const queued = [...requeued.map((r) => r.id), ...[...orphans].map((r) => Number(r.id))];
    for (const id of new Set(queued)) await sendCheckJob(tx, id);
    return { queued: [...new Set(queued)], failed: failed.map((r) => r.id) };
  });
}

export async function finishMechanismCheck({ id, report }: { id: number; report: Record<string, unknown> }) {
  await getDb()
    .update(mechanismChecks)
    .set({ state: "done", report, stage: null, progress: mechanismChecks.total, finishedAt: sql`now()`, heartbeatAt: null })
    .where(and(eq(mechanismChecks.id, id), eq(mechanismChecks.state, "running")));
}

export async function failMechanismCheck({ id, error }: { id: number; error: string }) {
  await getDb()
    .update(mechanismChecks)
    .set({ state: "failed", error, stage: null, finishedAt: sql`now()`, heartbeatAt: null })
    .where(and(eq(mechanismChecks.id, id), eq(mechanismChecks.state, "running")));
}

/** One check as its reader sees it (never the source text). */
export async function getMechanismCheck({ id }: { id: number }) {
  const [row] = await getDb()
    .select({
      id: mechanismChecks.id,
      ownerId: mechanismChecks.ownerId,
      state: mechanismChecks.state,
      name: mechanismChecks.name,
      stage: mechanismChecks.stage,
      attempts: mechanismChecks.attempts,
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
