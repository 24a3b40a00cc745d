import { applyTransition } from "@/lib/curation/transitions";
import { depositNewDataset } from "@/lib/datasets/deposits";
import { EXAMPLE_DEPOSIT } from "@/lib/deposits";
import type { DepositDocument } from "@/lib/deposits/types";
import type { UserDto } from "@/lib/users/queries";
import { sql } from "./helpers";

/**
 * Deposits for consensus tests, on a reaction no other test or the demo uses (Br + an n-alkane →
 * HBr + its primary radical, the chain length chosen per test file). Numbers are invented:
 * k = 2.2e-12 exp(−1750 K/T) cm³ molecule⁻¹ s⁻¹ times `factor`.
 */
export function consensusDocument({
  carbons,
  title,
  category,
  Ts = [250, 280, 310, 340, 370, 400],
  factor = 1,
}: {
  carbons: number;
  title: string;
  category: "experiment" | "theory" | "evaluation";
  Ts?: number[];
  factor?: number;
}): DepositDocument {
  // The demo's own example, minus its reported expression (it describes other numbers).
  const { reportedFit: _unused, ...base } = EXAMPLE_DEPOSIT;
  void _unused;
  const alkane = "C".repeat(carbons);
  return {
    ...base,
    title,
    reaction: {
      ...EXAMPLE_DEPOSIT.reaction,
      reactants: [
        { name: "bromine atom", smiles: "[Br]", coefficient: 1 },
        { name: `C${carbons} alkane`, smiles: alkane, coefficient: 1 },
      ],
      products: [
        { name: "hydrogen bromide", smiles: "Br", coefficient: 1 },
        { name: `C${carbons} alkyl`, smiles: `[CH2]${"C".repeat(carbons - 1)}`, coefficient: 1 },
      ],
    },
    method:
      category === "experiment"
        ? { category, technique: "flash photolysis", detection: "resonance fluorescence of Br" }
        : { category, technique: category === "theory" ? "transition-state theory" : "evaluation of published data" },
    points: Ts.map((T, i) => ({
      T,
      k: Number((factor * 2.2e-12 * Math.exp(-1750 / T) * (1 + 0.02 * Math.sin(i + carbons))).toPrecision(4)),
      uncertainty: { kind: "relative" as const, value: 10, confidence: "2sigma" as const },
    })),
  };
}

/** Deposits, submits and publishes a document; `retract` retracts it afterwards. */
export async function publish(
  doc: DepositDocument,
  { owner, curator, retract = false }: { owner: UserDto; curator: UserDto; retract?: boolean },
): Promise<{ versionId: number; datasetId: number; reactionId: number }> {
  const v = await depositNewDataset({ actor: owner, document: doc });
  await applyTransition({ versionId: v.id, actorId: owner.id, transition: "submit" });
  await applyTransition({ versionId: v.id, actorId: curator.id, transition: "accept", reason: "Consistent with its source." });
  if (retract) await applyTransition({ versionId: v.id, actorId: curator.id, transition: "retract", reason: "Withdrawn by its authors." });
  const [row] = await sql<
    { dataset_id: number; reaction_id: number }[]
  >`select dataset_id, reaction_id from dataset_versions where id = ${v.id}`;
  return { versionId: v.id, datasetId: row.dataset_id, reactionId: row.reaction_id };
}
