/**
 * What can be read from a standard InChI string without a structure toolkit: the element counts
 * of the main layer, adjusted for the charge (/q) and proton (/p) layers.
 *
 * Source: InChI Technical Manual (IUPAC/InChI Trust), layer definitions for software 1.07.
 */
import { STANDARD_ATOMIC_WEIGHTS } from "./atomic-weights";
import { ChemError } from "./chem-error";
import { orderHill } from "./hill-formula";
import { quoteInput } from "./load-rdkit";

/** Prefix of every standard InChI (version 1, standard flag "S"). */
export const STANDARD_INCHI_PREFIX = "InChI=1S/";

/** Longest InChI accepted, in characters. */
export const MAX_INCHI_LENGTH = 4000;

/** Element counts (H included, after /p) and net charge read from an InChI. */
export interface InchiComposition {
  elements: Record<string, number>;
  charge: number;
  /** True when the InChI has an isotopic layer (/i), whose masses this reader does not work out. */
  isotopic: boolean;
}

// Layers a standard InChI may carry after the formula: connections, hydrogens, charge, protons,
// double-bond and tetrahedral stereo, stereo inversion and type, isotopes.
const STANDARD_LAYERS = new Set(["c", "h", "q", "p", "b", "t", "m", "s", "i"]);

function invalid(inchi: string, reason: string): ChemError {
  return new ChemError("invalid_inchi", `Could not read the InChI ${quoteInput(inchi)} (${reason})`, "inchi");
}

/**
 * Reads the composition of a single-component standard InChI, or throws a {@link ChemError}.
 *
 * @example readInchiComposition("InChI=1S/H2O/h1H2/p-1") // { elements: { H: 1, O: 1 }, charge: -1, isotopic: false }
 */
export function readInchiComposition(inchi: string): InchiComposition {
  if (inchi.length > MAX_INCHI_LENGTH) throw invalid(inchi, `longer than ${MAX_INCHI_LENGTH} characters`);
  if (/\s/.test(inchi)) throw invalid(inchi, "contains a space or line break");
  if (!inchi.startsWith("InChI=")) throw invalid(inchi, 'an InChI starts with "InChI=1S/"');
  if (!inchi.startsWith(STANDARD_INCHI_PREFIX)) {
    throw invalid(inchi, 'only standard InChI, starting "InChI=1S/", is accepted');
  }
  const [formula = "", ...layers] = inchi.slice(STANDARD_INCHI_PREFIX.length).split("/");
  if (!formula) throw invalid(inchi, "no formula layer");
  if (formula.includes(".") || /^\d/.test(formula)) {
    throw new ChemError(
      "unsupported_species",
      `The InChI ${quoteInput(inchi)} describes more than one molecule or ion; enter each species on its own.`,
      "inchi",
    );
  }

  const elements: Record<string, number> = {};
  const token = /([A-Z][a-z]?)(\d*)/y;
  let at = 0;
  while (at < formula.length) {
    token.lastIndex = at;
    const match = token.exec(formula);
    if (!match) throw invalid(inchi, `unexpected "${formula[at]}" in the formula layer`);
    const [whole, symbol, digits] = match;
    if (!(symbol in STANDARD_ATOMIC_WEIGHTS)) throw invalid(inchi, `unknown element "${symbol}"`);
    if (symbol in elements) throw invalid(inchi, `element ${symbol} appears twice in the formula layer`);
    const count = digits ? Number(digits) : 1;
    if (count < 1) throw invalid(inchi, `zero count for ${symbol}`);
    elements[symbol] = count;
    at += whole.length;
  }

  let charge = 0;
  let protons = 0;
  let isotopic = false;
  for (const layer of layers) {
    const kind = layer.charAt(0);
    if (!STANDARD_LAYERS.has(kind)) throw invalid(inchi, `unexpected layer "/${layer.slice(0, 12)}"`);
    if (kind === "q" || kind === "p") {
      const value = /^[+-]\d+$/.test(layer.slice(1)) ? Number(layer.slice(1)) : Number.NaN;
      if (!Number.isInteger(value)) throw invalid(inchi, `cannot read the /${kind} layer "${layer}"`);
      if (kind === "q") charge += value;
      else protons += value;
    }
    if (kind === "i") isotopic = true;
  }
  // The /p layer records protons added to (or removed from) the neutral parent in the formula.
  const hydrogens = (elements.H ?? 0) + protons;
  if (hydrogens < 0) throw invalid(inchi, "the /p layer removes more hydrogens than the formula has");
  if (hydrogens === 0) delete elements.H;
  else elements.H = hydrogens;
  if (Object.keys(elements).length === 0) throw invalid(inchi, "no atoms");
  return { elements: orderHill(elements), charge: charge + protons, isotopic };
}
