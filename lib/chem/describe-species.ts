/**
 * Species identity: canonical SMILES, standard InChI and InChIKey, formula, charge, molar mass
 * and unpaired electrons, from a SMILES, an InChI, or both (which must then agree).
 */
import type { Mol } from "@rdkit/rdkit";
import { NUCLIDE_MASSES, STANDARD_ATOMIC_WEIGHTS, getElementSymbol } from "./atomic-weights";
import { ChemError } from "./chem-error";
import { formatHillFormula, orderHill } from "./hill-formula";
import { computeInchiKey, discardToolkitAfterTrap, parseSmilesOrThrow, quoteInput } from "./load-rdkit";
import { readInchiComposition, STANDARD_INCHI_PREFIX } from "./read-inchi";

/** What the repository stores about one species. */
export interface SpeciesIdentity {
  /**
   * RDKit canonical isomeric SMILES; null when only an InChI was given (MinimalLib cannot build
   * a structure from an InChI).
   */
  canonicalSmiles: string | null;
  /** Standard InChI ("InChI=1S/…"). */
  inchi: string;
  /** Standard InChIKey, 27 characters. */
  inchiKey: string;
  /**
   * Hill-order formula of the species as written, charge appended: "CH4", "HO" (hydroxyl),
   * "HO-" (hydroxide), "H4N+". Isotope labels count as their element (CD4 → "CH4").
   */
  formula: string;
  /** Net formal charge, in elementary charges. */
  charge: number;
  /** Molar mass, g mol⁻¹: standard atomic weights, nuclide masses for labelled atoms. */
  molarMass: number;
  /**
   * Unpaired electrons as RDKit perceives them (OH 1, O atom 2, CH2 2); null when only an
   * InChI was given, since a standard InChI does not record them.
   */
  radicalElectrons: number | null;
  /** Atom count per element symbol, hydrogens (implicit and explicit) included. */
  elements: Record<string, number>;
}

/** Input of {@link describeSpecies}: at least one of the two. */
export interface SpeciesInput {
  smiles?: string | null;
  inchi?: string | null;
}

interface JsonAtom {
  z?: number;
  impHs?: number;
  chg?: number;
  nRad?: number;
  isotope?: number;
}

interface MolJson {
  defaults?: { atom?: JsonAtom };
  molecules?: { atoms?: JsonAtom[] }[];
}

// Rounds away floating-point dust from summing masses, far below any atomic-weight uncertainty.
const roundMass = (mass: number) => Math.round(mass * 1e6) / 1e6;

function sumMass(elements: Readonly<Record<string, number>>): number {
  let mass = 0;
  for (const [symbol, count] of Object.entries(elements)) mass += count * STANDARD_ATOMIC_WEIGHTS[symbol];
  return mass;
}

/** Reads composition, charge, radicals and mass from RDKit's JSON of the molecule. */
function readAtoms(mol: Mol, smiles: string) {
  const json = JSON.parse(mol.get_json()) as MolJson;
  const defaults = json.defaults?.atom ?? {};
  const atoms = json.molecules?.[0]?.atoms ?? [];
  const elements: Record<string, number> = {};
  let charge = 0;
  let radicalElectrons = 0;
  let mass = 0;
  const add = (symbol: string, count: number) => {
    elements[symbol] = (elements[symbol] ?? 0) + count;
  };
  for (const atom of atoms) {
    const z = atom.z ?? defaults.z ?? 6;
    const symbol = getElementSymbol(z);
    if (!symbol) {
      const what = z === 0 ? "a wildcard atom (*)" : `element number ${z}, which has no atomic weight on file`;
      throw new ChemError("unsupported_species", `The SMILES ${quoteInput(smiles)} contains ${what}.`, "smiles");
    }
    const isotope = atom.isotope ?? defaults.isotope ?? 0;
    const hydrogens = atom.impHs ?? defaults.impHs ?? 0;
    add(symbol, 1);
    if (hydrogens > 0) add("H", hydrogens);
    charge += atom.chg ?? defaults.chg ?? 0;
    radicalElectrons += atom.nRad ?? defaults.nRad ?? 0;
    if (isotope > 0) {
      const nuclide = `${isotope}${symbol}`;
      const nuclideMass = NUCLIDE_MASSES[nuclide];
      if (nuclideMass === undefined) {
        throw new ChemError(
          "unsupported_species",
          `The SMILES ${quoteInput(smiles)} has the isotope label ${nuclide}, whose mass is not on file.`,
          "smiles",
        );
      }
      mass += nuclideMass;
    } else {
      mass += STANDARD_ATOMIC_WEIGHTS[symbol];
    }
    // Hydrogens attached to an atom (not written as atoms of their own) are never labelled.
    mass += hydrogens * STANDARD_ATOMIC_WEIGHTS.H;
  }
  return { elements: orderHill(elements), charge, radicalElectrons, molarMass: roundMass(mass) };
}

async function describeSmiles(smiles: string): Promise<SpeciesIdentity> {
  const mol = await parseSmilesOrThrow(smiles);
  try {
    const canonicalSmiles = mol.get_smiles();
    // RDKit writes separate molecules or ions with "." in canonical SMILES.
    if (canonicalSmiles.includes(".")) {
      throw new ChemError(
        "unsupported_species",
        `The SMILES ${quoteInput(smiles)} describes more than one molecule or ion; enter each species on its own.`,
        "smiles",
      );
    }
    const atoms = readAtoms(mol, smiles);
    const inchi = mol.get_inchi();
    if (!inchi.startsWith(STANDARD_INCHI_PREFIX)) {
      throw new ChemError("unsupported_species", `No standard InChI can be made for the SMILES ${quoteInput(smiles)}.`, "smiles");
    }
    const inchiKey = await computeInchiKey(inchi);
    return {
      canonicalSmiles,
      inchi,
      inchiKey,
      formula: formatHillFormula(atoms.elements, atoms.charge),
      charge: atoms.charge,
      molarMass: atoms.molarMass,
      radicalElectrons: atoms.radicalElectrons,
      elements: atoms.elements,
    };
  } finally {
    mol.delete();
  }
}

async function describeInchi(inchi: string): Promise<SpeciesIdentity> {
  const { elements, charge, isotopic } = readInchiComposition(inchi);
  if (isotopic) {
    throw new ChemError(
      "unsupported_species",
      `The InChI ${quoteInput(inchi)} is isotope-labelled; give its SMILES as well so the molar mass uses the right nuclide masses.`,
      "inchi",
    );
  }
  const inchiKey = await inchiKeyOrThrow(inchi);
  return {
    canonicalSmiles: null,
    inchi,
    inchiKey,
    formula: formatHillFormula(elements, charge),
    charge,
    molarMass: roundMass(sumMass(elements)),
    radicalElectrons: null,
    elements,
  };
}

async function inchiKeyOrThrow(inchi: string): Promise<string> {
  const key = await computeInchiKey(inchi);
  if (!/^[A-Z]{14}-[A-Z]{10}-[A-Z]$/.test(key)) {
    throw new ChemError("invalid_inchi", `Could not read the InChI ${quoteInput(inchi)} (no InChIKey can be computed from it)`, "inchi");
  }
  return key;
}

/**
 * Identity of one species from its SMILES, its standard InChI, or both. With both, they must
 * name the same species (same InChIKey). Throws a {@link ChemError} naming the field at fault.
 *
 * @example await describeSpecies({ smiles: "[OH]" }) // formula "HO", molarMass 17.007, radicalElectrons 1
 */
export async function describeSpecies(input: SpeciesInput): Promise<SpeciesIdentity> {
  try {
    return await describeSpeciesOnce(input);
  } catch (err) {
    const smiles = input.smiles?.trim();
    throw discardToolkitAfterTrap(
      err,
      smiles ? `the SMILES ${quoteInput(smiles)}` : `the InChI ${quoteInput(input.inchi?.trim() ?? "")}`,
      smiles ? "smiles" : "inchi",
    );
  }
}

async function describeSpeciesOnce(input: SpeciesInput): Promise<SpeciesIdentity> {
  const smiles = input.smiles?.trim() || undefined;
  const inchi = input.inchi?.trim() || undefined;
  if (!smiles && !inchi) {
    throw new ChemError("missing_structure", "Give a SMILES or a standard InChI for the species.", "smiles");
  }
  if (!smiles) return describeInchi(inchi as string);

  const identity = await describeSmiles(smiles);
  if (inchi) {
    readInchiComposition(inchi); // rejects malformed text before it is compared
    const givenKey = await inchiKeyOrThrow(inchi);
    if (givenKey !== identity.inchiKey) {
      throw new ChemError(
        "identity_mismatch",
        `The SMILES ${quoteInput(smiles)} and the InChI ${quoteInput(inchi)} describe different species ` +
          `(InChIKeys ${identity.inchiKey} and ${givenKey}).`,
        "inchi",
      );
    }
  }
  return identity;
}
