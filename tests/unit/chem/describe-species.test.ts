import { beforeAll, describe, expect, it } from "vitest";
import { ChemError, describeSpecies, getRdkit, type Rdkit, type SpeciesIdentity } from "@/lib/chem";

let rdkit: Rdkit;
beforeAll(async () => {
  rdkit = await getRdkit(); // the one RDKit load of this file
});

/** Expects `run` to reject with a ChemError of the given code, field and message. */
async function expectChemError(run: () => Promise<unknown>, code: string, field: string, message: RegExp) {
  const error = await run().then(
    () => undefined,
    (caught: unknown) => caught,
  );
  expect(error).toBeInstanceOf(ChemError);
  expect((error as ChemError).code).toBe(code);
  expect((error as ChemError).field).toBe(field);
  expect((error as ChemError).message).toMatch(message);
}

describe("getRdkit", () => {
  it("loads the installed MinimalLib once and returns the same module afterwards", async () => {
    expect(rdkit.version()).toMatch(/^2026\.09\./);
    expect(await getRdkit()).toBe(rdkit);
  });
});

// Reference standard InChIs and InChIKeys typed from memory (they match the public records
// of these compounds); every value is also checked against RDKit's own output below, so a
// wrong memory fails loudly rather than passing silently.
const REFERENCE = [
  { name: "methane", smiles: "C", inchi: "InChI=1S/CH4/h1H4", inchiKey: "VNWKTOKETHGBQD-UHFFFAOYSA-N" },
  { name: "water", smiles: "O", inchi: "InChI=1S/H2O/h1H2", inchiKey: "XLYOFNOQVPJJNP-UHFFFAOYSA-N" },
  { name: "carbon dioxide", smiles: "O=C=O", inchi: "InChI=1S/CO2/c2-1-3", inchiKey: "CURLTUGMZLYLDI-UHFFFAOYSA-N" },
  { name: "ammonia", smiles: "N", inchi: "InChI=1S/H3N/h1H3", inchiKey: "QGZKDVFQNNGYKY-UHFFFAOYSA-N" },
  { name: "ethanol", smiles: "OCC", inchi: "InChI=1S/C2H6O/c1-2-3/h3H,2H2,1H3", inchiKey: "LFQSCWFLJHTTHZ-UHFFFAOYSA-N" },
  { name: "benzene", smiles: "c1ccccc1", inchi: "InChI=1S/C6H6/c1-2-4-6-5-3-1/h1-6H", inchiKey: "UHOVQNZJYSORNB-UHFFFAOYSA-N" },
  { name: "hydrogen peroxide", smiles: "OO", inchi: "InChI=1S/H2O2/c1-2/h1-2H", inchiKey: "MHAJPDPJQMAIIY-UHFFFAOYSA-N" },
  { name: "hydroxyl radical", smiles: "[OH]", inchi: "InChI=1S/HO/h1H", inchiKey: "TUJKJAMUKRIRHC-UHFFFAOYSA-N" },
] as const;

describe("describeSpecies: identity of common molecules (InChI/InChIKey reference values from memory)", () => {
  it.each(REFERENCE)("$name: standard InChI and InChIKey", async ({ smiles, inchi, inchiKey }) => {
    const species = await describeSpecies({ smiles });
    expect(species.inchi).toBe(inchi);
    expect(species.inchiKey).toBe(inchiKey);
    // The key is also what RDKit's bundled InChI library computes from the InChI itself.
    expect(rdkit.get_inchikey_for_inchi(inchi)).toBe(inchiKey);
  });

  it("gives one canonical SMILES for different spellings of one molecule", async () => {
    const spellings = ["OCC", "CCO", "C(O)C", "[CH3][CH2][OH]"];
    const canonical = new Set<string | null>();
    for (const smiles of spellings) canonical.add((await describeSpecies({ smiles })).canonicalSmiles);
    expect([...canonical]).toEqual(["CCO"]);
  });
});

// Molar masses from IUPAC/CIAAW standard atomic weights (conventional values C 12.011,
// H 1.008, O 15.999, N 14.007), worked by hand: CH4 = 12.011 + 4 × 1.008, and so on.
describe("describeSpecies: molar mass against standard atomic weights", () => {
  it.each([
    ["C", 16.043],
    ["O", 18.015],
    ["O=C=O", 44.009],
    ["N", 17.031],
    ["CCO", 46.069],
    ["c1ccccc1", 78.114],
    ["[OH]", 17.007],
  ])("%s → %f g/mol", async (smiles, expected) => {
    const species = await describeSpecies({ smiles });
    expect(species.molarMass).toBeCloseTo(expected, 2);
    // RDKit's own average molecular weight (an older periodic table) agrees to 0.01 g/mol.
    const mol = rdkit.get_mol(smiles);
    try {
      expect(Math.abs(species.molarMass - JSON.parse(mol!.get_descriptors()).amw)).toBeLessThan(0.01);
    } finally {
      mol?.delete();
    }
  });
});

describe("describeSpecies: hydrogen counting and formula", () => {
  it.each([
    ["C([H])([H])([H])[H]", "CH4", { C: 1, H: 4 }],
    ["[H][H]", "H2", { H: 2 }],
    ["[HH]", "H2", { H: 2 }],
    ["C[C@H](O)[2H]", "C2H6O", { C: 2, H: 6, O: 1 }],
    ["CC(=O)O", "C2H4O2", { C: 2, H: 4, O: 2 }],
    ["ClCl", "Cl2", { Cl: 2 }],
    ["Cl", "ClH", { Cl: 1, H: 1 }],
  ])("%s → %s", async (smiles, formula, elements) => {
    const species = await describeSpecies({ smiles });
    expect(species.formula).toBe(formula);
    expect(species.elements).toEqual(elements);
  });

  it("matches the formula in the InChI main layer for neutral species (Hill order both ways)", async () => {
    for (const smiles of ["C", "O", "N", "CCO", "c1ccccc1", "ClCl", "C[CH2]", "[O]N=O", "C([H])([H])([H])[H]", "FC(F)(F)Br"]) {
      const species = await describeSpecies({ smiles });
      expect(species.formula, smiles).toBe(species.inchi.split("/")[1]);
    }
  });
});

describe("describeSpecies: radicals keep their unpaired electrons", () => {
  it.each([
    ["[OH]", "HO", 1],
    ["[CH3]", "CH3", 1],
    ["[H]", "H", 1],
    ["C[CH2]", "C2H5", 1],
    ["[O]N=O", "NO2", 1],
    ["[N]=O", "NO", 1],
    ["[O]", "O", 2],
    ["C", "CH4", 0],
  ])("%s → %s with %i unpaired electron(s)", async (smiles, formula, radicalElectrons) => {
    const species = await describeSpecies({ smiles });
    expect(species.formula).toBe(formula);
    expect(species.radicalElectrons).toBe(radicalElectrons);
    expect(species.charge).toBe(0);
  });

  it("reads NO2 written either way as one species", async () => {
    const a = await describeSpecies({ smiles: "[O][N]=O" });
    const b = await describeSpecies({ smiles: "N(=O)[O]" });
    expect(a.inchiKey).toBe(b.inchiKey);
    expect(a.canonicalSmiles).toBe(b.canonicalSmiles);
    expect(a.molarMass).toBeCloseTo(46.005, 2); // 14.007 + 2 × 15.999
  });

  it("keeps the H atom apart from H2 (a radical, not a molecule)", async () => {
    const atom = await describeSpecies({ smiles: "[H]" });
    const molecule = await describeSpecies({ smiles: "[H][H]" });
    expect(atom.inchiKey).not.toBe(molecule.inchiKey);
    expect(atom.molarMass).toBeCloseTo(1.008, 3);
  });
});

describe("describeSpecies: ions", () => {
  it.each([
    ["[OH-]", "HO-", -1, { H: 1, O: 1 }],
    ["[Na+]", "Na+", 1, { Na: 1 }],
    ["[NH4+]", "H4N+", 1, { H: 4, N: 1 }],
    ["[O-2]", "O-2", -2, { O: 1 }],
    ["[Fe+3]", "Fe+3", 3, { Fe: 1 }],
    ["C[N+](=O)[O-]", "CH3NO2", 0, { C: 1, H: 3, N: 1, O: 2 }],
  ])("%s → %s, charge %i", async (smiles, formula, charge, elements) => {
    const species = await describeSpecies({ smiles });
    expect(species.formula).toBe(formula);
    expect(species.charge).toBe(charge);
    expect(species.elements).toEqual(elements);
  });

  it("tells hydroxide from hydroxyl and from water", async () => {
    const keys = await Promise.all(["[OH-]", "[OH]", "O"].map(async (smiles) => (await describeSpecies({ smiles })).inchiKey));
    expect(new Set(keys).size).toBe(3);
    expect(keys[0]).toBe("XLYOFNOQVPJJNP-UHFFFAOYSA-M"); // water's skeleton, one proton removed
  });
});

// Nuclide masses 2H 2.014102 and 13C 13.003355 (AME2020, from memory; cross-checked against
// RDKit in atomic-weights.test.ts).
describe("describeSpecies: isotope labels", () => {
  it("weighs labelled atoms with their nuclide mass and counts them as their element", async () => {
    const d2o = await describeSpecies({ smiles: "[2H]O[2H]" });
    expect(d2o.formula).toBe("H2O");
    expect(d2o.molarMass).toBeCloseTo(2 * 2.014102 + 15.999, 4);
    expect(d2o.inchiKey.slice(0, 14)).toBe("XLYOFNOQVPJJNP"); // same skeleton as water…
    expect(d2o.inchiKey).not.toBe("XLYOFNOQVPJJNP-UHFFFAOYSA-N"); // …but a different species
    const c13 = await describeSpecies({ smiles: "[13CH4]" });
    expect(c13.molarMass).toBeCloseTo(13.003355 + 4 * 1.008, 4);
    const deuterium = await describeSpecies({ smiles: "[2H]" });
    expect(deuterium.radicalElectrons).toBe(1);
  });
});

describe("describeSpecies: from an InChI", () => {
  it.each(["C", "O", "[OH]", "[OH-]", "[NH4+]", "[Na+]", "CC(=O)O", "[O]N=O"])(
    "the InChI of %s gives the same composition, charge, mass and key as its SMILES",
    async (smiles) => {
      const fromSmiles = await describeSpecies({ smiles });
      const fromInchi = await describeSpecies({ inchi: fromSmiles.inchi });
      const pick = ({ inchi, inchiKey, formula, charge, molarMass, elements }: SpeciesIdentity) => ({
        inchi,
        inchiKey,
        formula,
        charge,
        molarMass,
        elements,
      });
      expect(pick(fromInchi)).toEqual(pick(fromSmiles));
      // MinimalLib cannot build a structure from an InChI, so these stay unknown.
      expect(fromInchi.canonicalSmiles).toBeNull();
      expect(fromInchi.radicalElectrons).toBeNull();
    },
  );

  it("accepts a SMILES and an InChI that agree", async () => {
    const species = await describeSpecies({ smiles: "[OH-]", inchi: " InChI=1S/H2O/h1H2/p-1 " });
    expect(species.canonicalSmiles).toBe("[OH-]");
    expect(species.charge).toBe(-1);
  });

  it("rejects a SMILES and an InChI that name different species, quoting both keys", async () => {
    await expectChemError(
      () => describeSpecies({ smiles: "C", inchi: "InChI=1S/H2O/h1H2" }),
      "identity_mismatch",
      "inchi",
      /SMILES "C" and the InChI "InChI=1S\/H2O\/h1H2" describe different species.*VNWKTOKETHGBQD-UHFFFAOYSA-N.*XLYOFNOQVPJJNP-UHFFFAOYSA-N/,
    );
    // Hydroxyl and hydroxide differ only by charge; that is still a different species.
    await expectChemError(
      () => describeSpecies({ smiles: "[OH]", inchi: "InChI=1S/H2O/h1H2/p-1" }),
      "identity_mismatch",
      "inchi",
      /different species/,
    );
  });
});

describe("describeSpecies: messages for what cannot be read", () => {
  it.each([
    ["C1CC", /^Could not read the SMILES "C1CC" \(unclosed ring\?\)$/],
    ["C(C", /^Could not read the SMILES "C\(C" \(unclosed parenthesis\?\)$/],
    ["CC)", /closing parenthesis without an opening one/],
    ["foo", /^Could not read the SMILES "foo" \(syntax error near character 1\)$/],
    ["c1cccc1", /aromatic ring/],
    ["C[N](C)(C)(C)C", /atom 2 \(N\) has valence 5/],
    ["CCO ethanol", /contains a space/],
    ["InChI=1S/CH4/h1H4", /this is an InChI; enter it in the InChI field/],
    ["C".repeat(1001), /longer than 1000 characters/],
  ])("SMILES %s", async (smiles, message) => {
    await expectChemError(() => describeSpecies({ smiles }), "invalid_smiles", "smiles", message);
  });

  it.each([
    ["garbage", /^Could not read the InChI "garbage" \(an InChI starts with "InChI=1S\/"\)$/],
    ["InChI=1/CH4/h1H4", /only standard InChI/],
    ["InChI=1S/Xy4", /unknown element "Xy"/],
    ["InChI=1S/ch4", /unexpected "c" in the formula layer/],
    ["InChI=1S/CH4/z1", /unexpected layer "\/z1"/],
    ["InChI=1S/CH4/q+x", /cannot read the \/q layer/],
    ["InChI=1S/O/p-1", /removes more hydrogens/],
  ])("InChI %s", async (inchi, message) => {
    await expectChemError(() => describeSpecies({ inchi }), "invalid_inchi", "inchi", message);
  });

  it("rejects a malformed InChI even when a SMILES is given too", async () => {
    await expectChemError(
      () => describeSpecies({ smiles: "C", inchi: "InChI=1S/CH4/h1H4/zz" }),
      "invalid_inchi",
      "inchi",
      /unexpected layer/,
    );
  });

  it("asks for a structure when neither field is filled", async () => {
    await expectChemError(
      () => describeSpecies({ smiles: "  ", inchi: "" }),
      "missing_structure",
      "smiles",
      /Give a SMILES or a standard InChI/,
    );
  });

  it.each([
    [{ smiles: "C.O" }, "smiles", /more than one molecule or ion/],
    [{ smiles: "[Na+].[Cl-]" }, "smiles", /more than one molecule or ion/],
    [{ smiles: "*C" }, "smiles", /wildcard atom/],
    [{ smiles: "[Np]" }, "smiles", /element number 93/],
    [{ smiles: "[99Tc]" }, "smiles", /isotope label 99Tc/],
    [{ inchi: "InChI=1S/CH4.H2O/h1H4;1H2" }, "inchi", /more than one molecule or ion/],
    [{ inchi: "InChI=1S/H2O/h1H2/i/hD2" }, "inchi", /isotope-labelled; give its SMILES/],
  ])("declines %j", async (input, field, message) => {
    await expectChemError(() => describeSpecies(input), "unsupported_species", field, message);
  });
});

describe("a structure that traps the toolkit", () => {
  // 1000 wildcard atoms overran RDKit's WebAssembly memory; every later reading then failed until a restart.
  it("is refused with a ChemError naming the SMILES, and the next structure is read by a fresh instance", async () => {
    await expect(describeSpecies({ smiles: "*".repeat(1000) })).rejects.toBeInstanceOf(ChemError);
    const ethanol = await describeSpecies({ smiles: "CCO" });
    expect(ethanol.inchiKey).toBe("LFQSCWFLJHTTHZ-UHFFFAOYSA-N");
    expect((await describeSpecies({ smiles: "O=O" })).formula).toBe("O2");
  }, 60_000);
});
