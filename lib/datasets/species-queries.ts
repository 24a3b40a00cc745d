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

/**
 * Stores the reaction's species (one row per InChIKey; names kept as aliases) and the reaction
 * (one row per key), inside the caller's transaction. Returns the reaction id.
 */
export async function upsertReaction(
  tx: Transaction,
  { key, equation, participants }: { key: string; equation: string; participants: ResolvedParticipant[] },
): Promise<number> {
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
    if (p.name) await tx.insert(speciesNames).values({ speciesId: row.id, name: p.name }).onConflictDoNothing();
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
    return existing.id;
  }
  const [found] = await tx.select({ id: reactions.id }).from(reactions).where(eq(reactions.key, key));
  return found.id;
}
