/**
 * Element and charge balance of a reaction: products minus reactants, weighted by the
 * stoichiometric coefficients (conservation of atoms and of charge).
 */
import { ChemError } from "./chem-error";
import { sortHill } from "./hill-formula";

/** One species in a balance check: its composition, net charge and coefficient. */
export interface BalanceParticipant {
  /** Atom count per element symbol, hydrogens included (as in SpeciesIdentity.elements). */
  elements: Readonly<Record<string, number>>;
  /** Net charge, in elementary charges. */
  charge: number;
  /** Stoichiometric coefficient, > 0. */
  coefficient: number;
}

/** Result of {@link checkBalance}. */
export interface BalanceResult {
  balanced: boolean;
  /** Products minus reactants, atoms per element; only elements that differ are listed. */
  elementDifferences: Record<string, number>;
  /** Net charge of the products minus that of the reactants, in elementary charges. */
  chargeDifference: number;
  /** One plain sentence for the depositor, e.g. "Unbalanced: products have 2 more H than reactants". */
  message: string;
}

// Differences smaller than this come from fractional coefficients in floating point, not chemistry.
const TOLERANCE = 1e-9;
const tidy = (value: number) => (Math.abs(value) < TOLERANCE ? 0 : Number(value.toPrecision(12)));

function addSide(
  totals: { elements: Record<string, number>; charge: number },
  side: readonly BalanceParticipant[],
  sign: 1 | -1,
  field: "reactants" | "products",
) {
  side.forEach((species, index) => {
    if (!Number.isFinite(species.coefficient) || species.coefficient <= 0) {
      throw new ChemError("invalid_reaction", `Species ${index + 1} among the ${field} needs a positive coefficient.`, field);
    }
    for (const [symbol, count] of Object.entries(species.elements)) {
      if (!Number.isFinite(count) || count < 0) {
        throw new ChemError("invalid_reaction", `Species ${index + 1} among the ${field} has an invalid count of ${symbol}.`, field);
      }
      totals.elements[symbol] = (totals.elements[symbol] ?? 0) + sign * species.coefficient * count;
    }
    if (!Number.isFinite(species.charge))
      throw new ChemError("invalid_reaction", `Species ${index + 1} among the ${field} has an invalid charge.`, field);
    totals.charge += sign * species.coefficient * species.charge;
  });
}

const listPhrases = (phrases: string[]) =>
  phrases.length <= 1 ? phrases.join("") : `${phrases.slice(0, -1).join(", ")} and ${phrases[phrases.length - 1]}`;

/**
 * Checks that atoms of every element and the net charge are conserved.
 *
 * @example checkBalance({ reactants: [OH, CH4], products: [H2O, CH3] }).balanced // true
 */
export function checkBalance(reaction: {
  reactants: readonly BalanceParticipant[];
  products: readonly BalanceParticipant[];
}): BalanceResult {
  const totals = { elements: {} as Record<string, number>, charge: 0 };
  addSide(totals, reaction.products, 1, "products");
  addSide(totals, reaction.reactants, -1, "reactants");

  const elementDifferences: Record<string, number> = {};
  for (const symbol of sortHill(Object.keys(totals.elements))) {
    const difference = tidy(totals.elements[symbol]);
    if (difference !== 0) elementDifferences[symbol] = difference;
  }
  const chargeDifference = tidy(totals.charge);
  const balanced = Object.keys(elementDifferences).length === 0 && chargeDifference === 0;
  if (balanced) {
    return { balanced, elementDifferences, chargeDifference, message: "Balanced: every element and the net charge agree on both sides." };
  }

  const phrases = Object.entries(elementDifferences).map(
    ([symbol, difference]) => `${Math.abs(difference)} ${difference > 0 ? "more" : "fewer"} ${symbol}`,
  );
  if (chargeDifference !== 0) {
    phrases.push(`a net charge ${Math.abs(chargeDifference)} ${chargeDifference > 0 ? "higher" : "lower"}`);
  }
  return {
    balanced,
    elementDifferences,
    chargeDifference,
    message: `Unbalanced: products have ${listPhrases(phrases)} than reactants`,
  };
}
