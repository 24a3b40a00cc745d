import { beforeAll, describe, expect, it } from "vitest";
import { NUCLIDE_MASSES, STANDARD_ATOMIC_WEIGHTS, formatHillFormula, getRdkit, type Rdkit } from "@/lib/chem";

let rdkit: Rdkit;
beforeAll(async () => {
  rdkit = await getRdkit();
});

/** Atomic number and RDKit's average mass of a single-atom SMILES such as "[Fe]" or "[13C]". */
function readAtom(smiles: string): { z: number; amw: number } {
  const mol = rdkit.get_mol(smiles);
  if (!mol) throw new Error(`RDKit could not read ${smiles}`);
  try {
    const json = JSON.parse(mol.get_json());
    return { z: json.molecules[0].atoms[0].z ?? json.defaults.atom.z, amw: JSON.parse(mol.get_descriptors()).amw };
  } finally {
    mol.delete();
  }
}

// Our table is IUPAC/CIAAW standard atomic weights typed from memory; RDKit carries an
// independent (partly older) table. Agreement within 0.025 g/mol catches a slipped digit.
// Elements without a stable isotope carry a mass number, on which the tables may differ by one.
const MASS_NUMBER_ONLY = new Set(["Tc", "Pm", "Po", "At", "Rn", "Fr", "Ra", "Ac"]);

describe("standard atomic weights (IUPAC/CIAAW, abridged, from memory) against RDKit's periodic table", () => {
  const symbols = Object.keys(STANDARD_ATOMIC_WEIGHTS);

  it("covers H to U in order of atomic number", () => {
    expect(symbols).toHaveLength(92);
    symbols.forEach((symbol, index) => expect(readAtom(`[${symbol}]`).z, symbol).toBe(index + 1));
  });

  it("agrees with RDKit for every element", () => {
    for (const symbol of symbols) {
      const tolerance = MASS_NUMBER_ONLY.has(symbol) ? 1.01 : 0.025;
      expect(Math.abs(readAtom(`[${symbol}]`).amw - STANDARD_ATOMIC_WEIGHTS[symbol]), symbol).toBeLessThanOrEqual(tolerance);
    }
  });

  it("uses the conventional values the unit tests rely on", () => {
    expect(STANDARD_ATOMIC_WEIGHTS.H).toBe(1.008);
    expect(STANDARD_ATOMIC_WEIGHTS.C).toBe(12.011);
    expect(STANDARD_ATOMIC_WEIGHTS.N).toBe(14.007);
    expect(STANDARD_ATOMIC_WEIGHTS.O).toBe(15.999);
  });
});

describe("nuclide masses (AME2020, from memory) against RDKit's isotope masses", () => {
  it.each(Object.entries(NUCLIDE_MASSES))("%s = %f", (nuclide, mass) => {
    const [, massNumber, symbol] = /^(\d+)([A-Z][a-z]?)$/.exec(nuclide) ?? [];
    expect(Math.abs(readAtom(`[${massNumber}${symbol}]`).amw - mass)).toBeLessThan(1e-5);
    expect(Math.round(mass)).toBe(Number(massNumber)); // a mass always rounds to its mass number
  });
});

describe("formatHillFormula (Hill system, J. Am. Chem. Soc. 1900)", () => {
  it.each([
    [{ H: 4, C: 1 }, 0, "CH4"],
    [{ O: 1, H: 1 }, 0, "HO"],
    [{ O: 1, H: 1 }, -1, "HO-"],
    [{ N: 1, H: 4 }, 1, "H4N+"],
    [{ S: 1, O: 4 }, -2, "O4S-2"],
    [{ Br: 1, C: 1, F: 3 }, 0, "CBrF3"],
    [{ Cl: 1, Na: 1 }, 0, "ClNa"],
    [{ H: 1 }, 0, "H"],
    [{ C: 2, H: 0, O: 1 }, 0, "C2O"],
  ])("%j charge %i → %s", (elements, charge, expected) => {
    expect(formatHillFormula(elements, charge)).toBe(expected);
  });
});
