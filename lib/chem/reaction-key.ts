/**
 * A deterministic text key for a reaction, so the same reaction deposited by different people
 * (species listed in any order) lands on the same reaction page.
 */
import { ChemError } from "./chem-error";

/** One species on one side of a reaction, by InChIKey, with its stoichiometric coefficient. */
export interface KeyedParticipant {
  inchiKey: string;
  /** Stoichiometric coefficient, > 0 (may be fractional, e.g. 0.5 for ½ O2). */
  coefficient: number;
}

/** Reactants and products of a reaction, by InChIKey. */
export interface KeyedReaction {
  reactants: readonly KeyedParticipant[];
  products: readonly KeyedParticipant[];
}

const INCHI_KEY = /^[A-Z]{14}-[A-Z]{10}-[A-Z]$/;

// Twelve significant figures absorb dust from summing fractional coefficients (0.1 + 0.2).
const tidy = (value: number) => Number(value.toPrecision(12));

function formatSide(side: readonly KeyedParticipant[], field: "reactants" | "products"): string {
  if (side.length === 0) throw new ChemError("invalid_reaction", `A reaction needs at least one species among its ${field}.`, field);
  const totals = new Map<string, number>();
  for (const { inchiKey, coefficient } of side) {
    const key = inchiKey.trim().toUpperCase();
    if (!INCHI_KEY.test(key)) throw new ChemError("invalid_reaction", `"${inchiKey}" among the ${field} is not an InChIKey.`, field);
    if (!Number.isFinite(coefficient) || coefficient <= 0) {
      throw new ChemError(
        "invalid_reaction",
        `The coefficient of ${key} among the ${field} must be a positive number, not ${coefficient}.`,
        field,
      );
    }
    // The same species listed twice on one side is the same as one entry with the summed coefficient.
    totals.set(key, (totals.get(key) ?? 0) + coefficient);
  }
  // Code-point order, not localeCompare, so the key never depends on the server's locale.
  return [...totals.keys()]
    .sort((a, b) => (a < b ? -1 : a > b ? 1 : 0))
    .map((key) => {
      const coefficient = tidy(totals.get(key) as number);
      return coefficient === 1 ? key : `${coefficient}*${key}`;
    })
    .join("+");
}

/**
 * Deterministic key of a reaction: each side's InChIKeys sorted, coefficients other than 1
 * written as "2*", sides joined by ">>" — e.g. "2*AAAA…+BBBB…>>CCCC…".
 *
 * Direction matters: A + B → C and C → A + B get different keys, because a rate constant
 * belongs to one direction (the reverse one follows only through the equilibrium constant).
 * Species on both sides (third bodies, catalysts) are kept as written, not cancelled.
 *
 * With `productsUnknown`, an empty product side is allowed and written "*".
 *
 * @example reactionKey({ reactants: [{ inchiKey: OH, coefficient: 1 }, { inchiKey: CH4, coefficient: 1 }], products: [...] })
 */
export function reactionKey(reaction: KeyedReaction, options: { productsUnknown?: boolean } = {}): string {
  // An overall removal rate (products not determined) has no product side: "*" stands for it, so
  // every removal-rate deposit of the same reactants lands on one reaction, apart from the
  // reactions whose products are known.
  const products = options.productsUnknown && reaction.products.length === 0 ? "*" : formatSide(reaction.products, "products");
  return `${formatSide(reaction.reactants, "reactants")}>>${products}`;
}
