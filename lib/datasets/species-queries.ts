import "server-only";
import { eq } from "drizzle-orm";
import { reactionParticipants, reactions, species, speciesNames } from "@/db/chemistry";
import type { Transaction } from "@/db/client";
import type { SpeciesIdentity } from "@/lib/chem";

export interface ResolvedParticipant {
  identity: SpeciesIdentity;
  name?: string;
  coefficient: number;
  side: "reactant" | "product";
}

/** The names a version's document gives its species; kept on the version (participant_names). */
export type ParticipantNames = { speciesId: number; name: string }[];

/**
 * Stores the reaction's species (one row per InChIKey) and the reaction (one row per key), inside
 * the caller's transaction. Returns the reaction id and the names the document gives each species;
 * those become the species' names only when the version is published (addPublishedSpeciesNames).
 */
export async function upsertReaction(
  tx: Transaction,
  { key, equation, participants }: { key: string; equation: string; participants: ResolvedParticipant[] },
): Promise<{ reactionId: number; participantNames: ParticipantNames }> {
  const ids = new Map<string, number>();
  for (const p of participants) {
    const s = p.identity;
    // A known species is never rewritten: published versions show the row as it was stored.
    const [inserted] = await tx
      .insert(species)
      .values({
        inchiKey: s.inchiKey,
        inchi: s.inchi,
        canonicalSmiles: s.canonicalSmiles ?? "",
        formula: s.formula,
        charge: s.charge,
        molarMass: s.molarMass,
        radicalElectrons: s.radicalElectrons ?? 0,
      })
      .onConflictDoNothing({ target: species.inchiKey })
      .returning({ id: species.id });
    const row = inserted ?? (await tx.select({ id: species.id }).from(species).where(eq(species.inchiKey, s.inchiKey)))[0];
    ids.set(s.inchiKey, row.id);
  }
  const [existing] = await tx.insert(reactions).values({ key, equation }).onConflictDoNothing().returning({ id: reactions.id });
  if (existing) {
    const merged = new Map<string, { speciesId: number; side: "reactant" | "product"; coefficient: number }>();
    for (const p of participants) {
      const speciesId = ids.get(p.identity.inchiKey)!;
      const k = `${p.side}:${speciesId}`;
      const prev = merged.get(k);
      merged.set(k, { speciesId, side: p.side, coefficient: (prev?.coefficient ?? 0) + p.coefficient });
    }
    await tx
      .insert(reactionParticipants)
      .values([...merged.values()].map((m) => ({ reactionId: existing.id, ...m, coefficient: m.coefficient })));
    return { reactionId: existing.id, participantNames: namesOf(participants, ids) };
  }
  const [found] = await tx.select({ id: reactions.id }).from(reactions).where(eq(reactions.key, key));
  return { reactionId: found.id, participantNames: namesOf(participants, ids) };
}

function namesOf(participants: ResolvedParticipant[], ids: Map<string, number>): ParticipantNames {
  return participants.filter((p) => p.name).map((p) => ({ speciesId: ids.get(p.identity.inchiKey)!, name: p.name! }));
}

/** At publication: the names the version gives its species join the species' names (aliases). */
export async function addPublishedSpeciesNames(tx: Transaction, names: ParticipantNames): Promise<void> {
  if (names.length) await tx.insert(speciesNames).values(names).onConflictDoNothing();
}
