import { describe, expect, it } from "vitest";
import { consensus } from "@/lib/kinetics/consensus";
import { GAS_CONSTANT } from "@/lib/kinetics/constants";
import { seededRandom } from "@/lib/seeded-random";
import {
  compositionFromName,
  hillFormulaOf,
  matchReaction,
  marksExcitedState,
  matchSpecies,
  mechanismReactionKeys,
  mechanismSpeciesNames,
  type CatalogueSpecies,
} from "@/lib/mechanisms/match";
import { readCanteraYamlMechanism } from "@/lib/mechanisms/read-cantera-yaml";
import { consensusFactor, judgeMechanismRate, uncovered } from "@/lib/mechanisms/verdicts";

// InChIKey-shaped keys invented for the tests (matching only compares them).
const KEY = (c: string) => `${c.repeat(14)}-UHFFFAOYSA-N`;
const OH: CatalogueSpecies = { inchiKey: KEY("A"), formula: "HO", names: ["hydroxyl", "OH"] };
const CH4: CatalogueSpecies = { inchiKey: KEY("B"), formula: "CH4", names: ["methane"] };
const CH3: CatalogueSpecies = { inchiKey: KEY("C"), formula: "CH3", names: ["methyl"] };
const H2O: CatalogueSpecies = { inchiKey: KEY("D"), formula: "H2O", names: ["water", "H2O"] };
const ETHANOL: CatalogueSpecies = { inchiKey: KEY("E"), formula: "C2H6O", names: ["ethanol"] };
const DME: CatalogueSpecies = { inchiKey: KEY("F"), formula: "C2H6O", names: ["dimethyl ether"] };

function index(list: CatalogueSpecies[]) {
  const byName = new Map<string, CatalogueSpecies[]>();
  const byFormula = new Map<string, CatalogueSpecies[]>();
  for (const s of list) {
    for (const n of s.names) byName.set(n.toLowerCase(), [...(byName.get(n.toLowerCase()) ?? []), s]);
    byFormula.set(s.formula, [...(byFormula.get(s.formula) ?? []), s]);
  }
  return { byName, byFormula };
}

describe("species matching", () => {
  const catalogue = index([OH, CH4, CH3, H2O, ETHANOL, DME]);

  it("matches by name (any case), then composition, leaves isomers and unknowns to the person", () => {
    const m = readCanteraYamlMechanism(
      "species:\n- name: oh\n- name: C2H5OH\n  composition: {C: 2, H: 6, O: 1}\n- name: XYZ\nreactions:\n- equation: oh + CH4 => CH3 + H2O\n  rate-constant: {A: 1, b: 0, Ea: 0}\n- equation: C2H5OH + XYZ => XYZ + C2H5OH\n  rate-constant: {A: 1, b: 0, Ea: 0}\n",
    );
    const matches = matchSpecies({ names: mechanismSpeciesNames(m), choices: new Map(), ...catalogue });
    const by = Object.fromEntries(matches.map((x) => [x.name, [x.by, x.inchiKey]]));
    expect(by).toEqual({
      oh: ["name", OH.inchiKey],
      C2H5OH: ["ambiguous", null],
      XYZ: ["none", null],
      CH4: ["composition", CH4.inchiKey],
      CH3: ["composition", CH3.inchiKey],
      H2O: ["name", H2O.inchiKey],
    });
    expect(matches.find((x) => x.name === "C2H5OH")!.candidates.map((c) => c.name)).toEqual(["ethanol", "dimethyl ether"]);
  });

  it("never takes an excited-state species by composition alone: a ground-state one of the composition, else the person chooses", () => {
    const excited: CatalogueSpecies = { inchiKey: KEY("G"), formula: "O", names: ["oxygen atom (excited)", "O(1D)"] };
    const ground: CatalogueSpecies = { inchiKey: KEY("H"), formula: "O", names: ["atomic oxygen"] };
    const O = { name: "O", formula: "O" };
    const [onlyExcited] = matchSpecies({ names: [O], choices: new Map(), ...index([excited]) });
    expect(onlyExcited).toMatchObject({ by: "ambiguous", inchiKey: null });
    expect(onlyExcited.candidates.map((c) => c.name)).toEqual(["oxygen atom (excited)"]);
    const [both] = matchSpecies({ names: [O], choices: new Map(), ...index([excited, ground]) });
    expect(both).toMatchObject({ by: "composition", inchiKey: ground.inchiKey });
    // A name is still a name: "O(1D)" is one of the excited species' names.
    const [byName] = matchSpecies({ names: [{ name: "O(1D)", formula: null }], choices: new Map(), ...index([excited, ground]) });
    expect(byName).toMatchObject({ by: "name", inchiKey: excited.inchiKey });
    // Two ground-state species of one composition: the person chooses.
    const other: CatalogueSpecies = { inchiKey: KEY("I"), formula: "O", names: ["oxygen (other)"] };
    expect(matchSpecies({ names: [O], choices: new Map(), ...index([ground, other, excited]) })[0].by).toBe("ambiguous");
    // Marks of the usual excited states (common practice in mechanism naming); a ground-state term symbol is none.
    for (const n of ["O(1D)", "N(2D)", "O2(a1Δg)", "CH2*", "singlet methylene", "oxygen atom (excited)"])
      expect(marksExcitedState(n)).toBe(true);
    for (const n of ["O", "O(3P)", "oxygen atom", "CH2"]) expect(marksExcitedState(n)).toBe(false);
  });

  it("takes the person's choice first", () => {
    const [m] = matchSpecies({
      names: [{ name: "C2H5OH", formula: "C2H6O" }],
      choices: new Map([["C2H5OH", ETHANOL.inchiKey]]),
      ...catalogue,
    });
    expect(m).toMatchObject({ by: "choice", inchiKey: ETHANOL.inchiKey });
  });

  it("reads formulas from names and writes them in Hill order", () => {
    expect(compositionFromName("H2O2")).toEqual({ H: 2, O: 2 });
    expect(compositionFromName("CH2(S)")).toBeNull();
    expect(hillFormulaOf({ O: 1, H: 1 })).toBe("HO");
    expect(hillFormulaOf({ AR: 1 })).toBe("Ar");
    expect(hillFormulaOf({ H: 4, C: 1 })).toBe("CH4");
  });

  it("keys reactions in both directions and finds the stored one", () => {
    const m = readCanteraYamlMechanism("reactions:\n- equation: OH + CH4 <=> CH3 + H2O\n  rate-constant: {A: 1, b: 0, Ea: 0}\n");
    const ids = new Map([
      ["OH", OH.inchiKey],
      ["CH4", CH4.inchiKey],
      ["CH3", CH3.inchiKey],
      ["H2O", H2O.inchiKey],
    ]);
    const keyed = mechanismReactionKeys(m.reactions[0], ids);
    if (!("keys" in keyed)) throw new Error("not keyed");
    expect(keyed.keys.forward).toBe(
      `${OH.inchiKey}+${CH4.inchiKey}`.split("+").sort().join("+") + ">>" + [CH3.inchiKey, H2O.inchiKey].sort().join("+"),
    );
    expect(matchReaction(keyed.keys, new Map([[keyed.keys.reverse, 7]]))).toEqual({
      forward: null,
      reverse: { reactionId: 7, key: keyed.keys.reverse },
    });
    expect(matchReaction(keyed.keys, new Map([[keyed.keys.forward, 3]])).forward).toEqual({ reactionId: 3, key: keyed.keys.forward });
    expect(mechanismReactionKeys(m.reactions[0], new Map([["OH", OH.inchiKey]]))).toEqual({ unmatched: ["CH4", "CH3", "H2O"] });
  });
});

/** Invented data: k = 2e-12 exp(−1000 K / T) cm³ molecule⁻¹ s⁻¹ with 10 % scatter, two datasets. */
function invented(Tlo: number, Thi: number, seed: number) {
  const random = seededRandom(seed);
  return Array.from({ length: 8 }, (_, i) => {
    const T = Tlo + ((Thi - Tlo) * i) / 7;
    return { T, k: 2e-12 * Math.exp(-1000 / T) * Math.exp(0.1 * (random() - 0.5)), sigmaLnK: 0.1 };
  });
}

describe("verdicts", () => {
  const result = consensus([
    { id: "1", order: 2, points: invented(300, 1000, 1) },
    { id: "2", order: 2, points: invented(350, 900, 2) },
  ]);
  const truth = { A: 2e-12, b: 0, Ea: 1000 * GAS_CONSTANT };
  const ranges = [
    { Tmin: 300, Tmax: 1000 },
    { Tmin: 350, Tmax: 900 },
  ];

  it("agrees with the expression the data came from, and names the extrapolated part of the window", () => {
    const v = judgeMechanismRate({ rate: truth, window: { Tmin: 300, Tmax: 2500 }, result, basis: "consensus", ranges });
    expect(v.verdict).toBe("agrees");
    expect(v.extrapolated).toEqual([{ Tmin: 1000, Tmax: 2500 }]);
    expect(v.comparison!.overlap).toEqual({ Tmin: 300, Tmax: 1000 });
    expect(v.comparison!.low.T).toBe(300);
    expect(v.comparison!.high.T).toBe(1000);
    expect(Math.abs(Math.log(v.comparison!.worst.ratio))).toBeLessThan(0.1);
    expect(v.note).toMatch(/Used without measurements at 1000–2500 K/);
  });

  it("disagrees with three times the rate, at the worst point", () => {
    const v = judgeMechanismRate({
      rate: { ...truth, A: 3 * truth.A },
      window: { Tmin: 300, Tmax: 1000 },
      result,
      basis: "consensus",
      ranges,
    });
    expect(v.verdict).toBe("disagrees");
    expect(v.extrapolated).toEqual([]);
    expect(v.comparison!.worst.ratio).toBeCloseTo(3, 1);
    expect(v.comparison!.worst.inside).toBe(false);
    expect(consensusFactor(result, v.comparison!.worst.T)).toBe(v.comparison!.worst.f);
  });

  it("says extrapolated when the window misses every measurement, and no data without a consensus", () => {
    expect(judgeMechanismRate({ rate: truth, window: { Tmin: 1500, Tmax: 2500 }, result, basis: "consensus", ranges }).verdict).toBe(
      "extrapolated",
    );
    expect(
      judgeMechanismRate({ rate: truth, window: { Tmin: 300, Tmax: 2500 }, result: null, basis: "consensus", ranges: [] }).verdict,
    ).toBe("no_data");
  });

  it("judges DUPLICATE entries as the sum of their terms, and a sum that is no positive rate as no rate", () => {
    // Two halves of the truth, and 1.5 × minus 0.5 × the truth: each pair sums to the expression the data came from.
    const half = { ...truth, A: truth.A / 2 };
    const window = { Tmin: 300, Tmax: 1000 };
    expect(judgeMechanismRate({ rate: half, alsoRates: [half], window, result, basis: "consensus", ranges }).verdict).toBe("agrees");
    expect(
      judgeMechanismRate({
        rate: { ...truth, A: 1.5 * truth.A },
        alsoRates: [{ ...truth, A: -0.5 * truth.A }],
        window,
        result,
        basis: "consensus",
        ranges,
      }).verdict,
    ).toBe("agrees");
    // Alone, one half is a factor 2 below.
    expect(judgeMechanismRate({ rate: half, window, result, basis: "consensus", ranges }).verdict).toBe("disagrees");
    const negative = judgeMechanismRate({ rate: half, alsoRates: [{ ...truth, A: -truth.A }], window, result, basis: "consensus", ranges });
    expect(negative.verdict).toBe("disagrees");
    expect(negative.note).toMatch(/not a positive number at \d+ K/);
  });

  it("finds the gaps of a window", () => {
    expect(
      uncovered({ Tmin: 300, Tmax: 2500 }, [
        { Tmin: 500, Tmax: 800 },
        { Tmin: 700, Tmax: 1200 },
        { Tmin: 2000, Tmax: 3000 },
      ]),
    ).toEqual([
      { Tmin: 300, Tmax: 500 },
      { Tmin: 1200, Tmax: 2000 },
    ]);
  });
});
