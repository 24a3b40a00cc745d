import { describe, expect, it } from "vitest";
import { evaluateRateExpression } from "@/lib/kinetics/evaluate-expression";
import { readCanteraYamlMechanism, rateUnitFactor } from "@/lib/mechanisms/read-cantera-yaml";
import { readMechanism, detectMechanismFormat } from "@/lib/mechanisms/read-mechanism";
import { readPlainTextMechanism, readMechanismNumber } from "@/lib/mechanisms/read-plain-text";
import { readEquation } from "@/lib/mechanisms/equation";
import type { MechanismReaction } from "@/lib/mechanisms/types";
// Source: CODATA 2018 recommended values and the thermochemical calorie (NIST SP 811): tests/fixtures/units-codata2018.json.
import codata from "@/tests/fixtures/units-codata2018.json";

const N_A = codata.constants_CODATA2018.N_A_per_mol;
const R = codata.constants_CODATA2018.R_J_per_mol_K;
const CAL = codata.constants_CODATA2018.cal_th_J;

/** k(T) of a read reaction, T0 = 1 K as both formats write it. */
const k = (r: MechanismReaction, T: number) => evaluateRateExpression({ A: r.rate!.A, n: r.rate!.b, Ea: r.rate!.Ea, T0: 1 }, T);

// Every rate type and auxiliary keyword of the plain-text layout, comments and a continuation line.
const PLAIN = `! invented test mechanism
ELEMENTS H O C N AR END
SPECIES
H O OH H2 O2 HO2 H2O H2O2 CH4 CH3 N2 AR ! comment after names
END
THERMO ALL
   300.000  1000.000  5000.000
H                 L 7/88H   1               G   200.000  3500.000  1000.000    1
END
REACTIONS
H+O2<=>O+OH                 3.547E+15  -0.406  1.6599E+04
OH+CH4<=>CH3+H2O            1.000E+08   1.600  3120.00  ! a comment
H2+O=H+OH                   5.0D+04     2.67   6290.
2OH(+M)<=>H2O2(+M)          7.400E+13  -0.370     0.00
     LOW  /  2.300E+18    -0.900  -1700.00/
     TROE/   0.7346   94.00  1756.00  5182.00 /
     H2/2.00/ H2O/6.00/ AR/0.70/
H+O2(+M)=HO2(+M)            4.65E12  0.44  0.0
     LOW/ 6.37E20 -1.72 524.8 /
     SRI/ 0.5 200 10 /
O+H+M<=>OH+M                5.000E+17  -1.000      .00
H2/2.00/ H2O/6.00/
CH3+O2=>CH4+O               1.0E10 0.0 0.0
     HIGH/ 1.0E12 0.0 0.0 /
H+O2=>OH+O                  1.0E10 0.0 0.0
     PLOG/ 0.1 1.0E10 0.0 0.0 /
     PLOG/ 1.0 2.0E10 0.0 0.0 /
H2O2+H=>HO2+H2              1.0E10 0.0 0.0
     CHEB/ 2 2 1.0 0.1 0.1 0.1 /
H+HO2<=>O2+H2               2.750E+06   2.090  -1451.00
     DUPLICATE
H+HO2<=>O2+H2               1.0E+06   2.0  0.0
     DUP
     REV/ 1.0E6 2.0 5000.0 /
H2O2+OH<=>HO2+H2O  &
                            2.000E+12    .000    427.00
H2O+O=>2OH                  1.0E10 1.0 100.0
     FORD/ H2O 1.0 /
END
`;

describe("plain-text reader", () => {
  const m = readPlainTextMechanism(PLAIN);
  const byLine = (line: number) => m.reactions.find((r) => r.line === line)!;

  it("reads the species block, skips THERMO, and finds no problem in a clean file", () => {
    expect(m.problems).toEqual([]);
    expect(m.species.map((s) => s.name)).toContain("AR");
    expect(m.species).toHaveLength(12);
    expect(m.reactions).toHaveLength(13);
  });

  it("classifies every rate type and keyword; only elementary reactions carry a rate", () => {
    const rateTypes = m.reactions.map((r) => r.rateType);
    expect(rateTypes).toEqual([
      "elementary",
      "elementary",
      "elementary",
      "falloff",
      "falloff",
      "three-body",
      "falloff", // HIGH without (+M): a pressure-dependent keyword, never checked as elementary
      "pressure-table",
      "chebyshev",
      "elementary",
      "elementary",
      "elementary",
      "elementary",
    ]);
    for (const r of m.reactions) expect(r.rate === null).toBe(r.notChecked !== null);
    expect(m.reactions[12].notChecked).toMatch(/FORD/);
    expect(m.reactions[6].notChecked).toMatch(/not checked yet/);
  });

  it("marks DUPLICATE and DUP, keeps REV as the forward rate, joins a continuation line", () => {
    expect(m.reactions.filter((r) => r.duplicate)).toHaveLength(2);
    const continued = m.reactions[11];
    expect(continued.equation).toBe("H2O2+OH<=>HO2+H2O");
    expect(continued.rate!.A / (2e12 / N_A)).toBeCloseTo(1, 12);
    expect(continued.rate!.Ea).toBeCloseTo(427 * CAL, 9);
    expect(m.reactions[10].rate!.A / (1e6 / N_A)).toBeCloseTo(1, 12);
  });

  it("reads coefficients written against the name, the Fortran D exponent and reversibility", () => {
    const twoOH = m.reactions[3];
    expect(twoOH.reactants).toEqual([{ name: "OH", coefficient: 2 }]);
    expect(m.reactions[2].rate!.A / (5e4 / N_A)).toBeCloseTo(1, 12);
    expect(m.reactions[7].reversible).toBe(false);
    expect(byLine(11).reversible).toBe(true);
    expect(readMechanismNumber("1.0d-3")).toBe(1e-3);
    expect(readMechanismNumber("1.0e")).toBeNull();
  });

  it("converts each energy and quantity keyword of the REACTIONS line", () => {
    const cases: [string, number, number][] = [
      // keyword, Ea as written, expected J/mol
      ["CAL/MOLE", 1000, 1000 * CAL],
      ["KCAL/MOLE", 1, 1000 * CAL],
      ["JOULES/MOLE", 1000, 1000],
      ["KJOULES/MOLE", 1, 1000],
      ["KELVINS", 1000, 1000 * R],
    ];
    for (const [keyword, Ea, expected] of cases) {
      const r = readPlainTextMechanism(`SPECIES A B C END\nREACTIONS ${keyword}\nA+B=>C 1.0 0 ${Ea}\nEND\n`).reactions[0];
      expect(r.rate!.Ea, keyword).toBeCloseTo(expected, 6);
    }
    const molecules = readPlainTextMechanism("SPECIES A B C END\nREACTIONS MOLECULES\nA+B=>C 2.5E-11 0 0\nEND\n").reactions[0];
    expect(molecules.rate!.A).toBe(2.5e-11);
    const moles = readPlainTextMechanism("SPECIES A B C END\nREACTIONS MOLES\nA+B+C=>C+C 1.0E16 0 0\nEND\n").reactions[0];
    // Third order: cm⁶ mol⁻² s⁻¹ → cm⁶ molecule⁻² s⁻¹ divides by N_A².
    expect(moles.order).toBe(3);
    expect(moles.rate!.A / (1e16 / N_A ** 2)).toBeCloseTo(1, 12);
  });

  it("names the line and column of malformed lines and still reads the rest", () => {
    const text = "SPECIES A B C END\nREACTIONS\nA+B=>C 1.0 zero 0\nA+B C 1 0 0\nA=>B 1.0 0 0\n  XYZ/1.0/\n  BOGUS\nB=>C 2.0 0 0\nEND\n";
    const parsed = readPlainTextMechanism(text);
    expect(parsed.problems.map((p) => [p.line, p.column])).toEqual([
      [3, 12],
      [4, 1],
      [6, 3],
      [7, 3],
    ]);
    expect(parsed.problems[0].message).toMatch(/"zero" is not a number \(b\)/);
    expect(parsed.problems[1].message).toMatch(/neither a reaction \(no "="\) nor an auxiliary line/);
    expect(parsed.problems[2].message).toMatch(/an efficiency for XYZ, but the reaction on line 5 has no third body/);
    expect(parsed.reactions.map((r) => [r.equation, r.notChecked === null])).toEqual([
      ["A+B=>C", false],
      ["A=>B", true],
      ["B=>C", true],
    ]);
  });

  it("says which unit keywords are allowed and checks nothing in units it does not know", () => {
    const parsed = readPlainTextMechanism("SPECIES A B END\nREACTIONS KCAL/MOL\nA=>B 1 0 0\nEND\n");
    expect(parsed.problems[0]).toMatchObject({ line: 2, column: 11 });
    expect(parsed.problems[0].message).toMatch(
      /unknown unit keyword "KCAL\/MOL"; allowed: CAL\/MOLE, KCAL\/MOLE, JOULES\/MOLE, KJOULES\/MOLE, KJ\/MOLE, KELVINS, EVOLTS, MOLES, MOLECULES/,
    );
    expect(parsed.reactions[0].notChecked).toMatch(/unit keyword/);
  });
});

const YAML_TEXT = `# invented test mechanism
description: test
units: {length: cm, quantity: mol, activation-energy: cal/mol}
phases:
- name: gas
  species: [H, O, OH, H2, O2, HO2, CH4, CH3, H2O, H2O2, AR]
species:
- name: OH
  composition: {O: 1, H: 1}
- name: CH4
  composition: {C: 1, H: 4}
reactions:
- equation: H + O2 <=> O + OH
  rate-constant: {A: 3.547e+15, b: -0.406, Ea: 1.6599e+04}
- equation: OH + CH4 <=> CH3 + H2O
  rate-constant: {A: 1.0e8, b: 1.6, Ea: 3120.0}
  duplicate: true
- equation: 2 O + M <=> O2 + M
  type: three-body
  rate-constant: {A: 1.2e+17, b: -1.0, Ea: 0.0}
  efficiencies: {AR: 0.83, H2: 2.4}
- equation: H + O2 (+M) <=> HO2 (+M)
  type: falloff
  low-P-rate-constant: {A: 6.366e+20, b: -1.72, Ea: 524.8}
  high-P-rate-constant: {A: 4.65e+12, b: 0.44, Ea: 0.0}
  Troe: {A: 0.5, T3: 1.0e-30, T1: 1.0e+30}
- equation: CH3 + O2 (+M) <=> CH4 + O (+M)
  type: chemically-activated
  low-P-rate-constant: {A: 1e10, b: 0, Ea: 0}
  high-P-rate-constant: {A: 1e12, b: 0, Ea: 0}
- equation: H + O2 => O + OH
  type: pressure-dependent-Arrhenius
  rate-constants:
  - {P: 0.1 atm, A: 1e10, b: 0, Ea: 0}
- equation: H2O2 + H => HO2 + H2
  type: Chebyshev
  temperature-range: [300, 2000]
  pressure-range: [0.01 atm, 100 atm]
  data: [[1.0, 0.1], [0.1, 0.1]]
- equation: H2 + O => H + OH
  rate-constant: {A: 50.0 m^3/kmol/s, b: 2.67, Ea: 26.3 kJ/mol}
- equation: H2O + O => 2 OH
  rate-constant: {A: 1e10, b: 1, Ea: 100}
  orders: {H2O: 1.0}
- equation: O + OH + H => H2O + O
  rate-constant: {A: 1e15, b: 0, Ea: 0}
- equation: 2 OH (+M) <=> H2O2 (+M)
  low-P-rate-constant: {A: 2.3e18, b: -0.9, Ea: -1700}
  high-P-rate-constant: {A: 7.4e13, b: -0.37, Ea: 0}
- equation: H + OH + M <=> H2O + M
  rate-constant: {A: 2.2e22, b: -2, Ea: 0}
- equation: H + H + AR <=> H2 + AR
  rate-constant: {A: 1e18, b: -1, Ea: 0}
- equation: H + HO2 <=> O + H2O
  type: Blowers-Masel
  rate-constant: {A: 1e13, b: 0, Ea0: 1000, w: 1e9}
`;

describe("Cantera YAML reader", () => {
  const m = readCanteraYamlMechanism(YAML_TEXT);

  it("reads species with composition and every reaction, checked or not", () => {
    expect(m.problems).toEqual([]);
    expect(m.species).toEqual([
      { name: "OH", composition: { O: 1, H: 1 }, line: 8 },
      { name: "CH4", composition: { C: 1, H: 4 }, line: 10 },
    ]);
    expect(m.reactions.map((r) => [r.rateType, r.notChecked === null])).toEqual([
      ["elementary", true],
      ["elementary", true],
      ["three-body", false],
      ["falloff", false],
      ["chemically-activated", false],
      ["pressure-table", false],
      ["chebyshev", false],
      ["elementary", true],
      ["elementary", false], // orders
      ["elementary", true], // third order, no third body
      ["falloff", false], // inferred from (+M)
      ["three-body", false], // inferred from + M
      ["elementary", true], // AR as a named species is an ordinary reactant
      ["other", false],
    ]);
    expect(m.reactions[1].duplicate).toBe(true);
    expect(m.reactions[13].notChecked).toBe('type "Blowers-Masel": not checked yet');
    expect(m.reactions[2].line).toBe(18);
    expect(m.reactions[9].order).toBe(3);
  });

  it("converts values that carry their own units", () => {
    const r = m.reactions[7];
    // 50 m³ kmol⁻¹ s⁻¹ = 50 × 10⁶ cm³ / (1000 N_A molecules) per s.
    expect(r.rate!.A / ((50 * 1e6) / (1000 * N_A))).toBeCloseTo(1, 12);
    expect(r.rate!.Ea).toBeCloseTo(26300, 6);
    expect(rateUnitFactor("cm^3/mol/s", 2)).toBeCloseTo(1 / N_A, 35);
    expect(rateUnitFactor("cm^3/mol/s", 3)).toBeNull();
    expect(rateUnitFactor("1/s", 1)).toBe(1);
  });

  it("uses Cantera's defaults (m, kmol, J/kmol) when no units are given", () => {
    const r = readCanteraYamlMechanism("reactions:\n- equation: A + B => C\n  rate-constant: {A: 1.0, b: 0, Ea: 1.0e6}\n").reactions[0];
    expect(r.rate!.A / (1e6 / (1000 * N_A))).toBeCloseTo(1, 12);
    expect(r.rate!.Ea).toBeCloseTo(1000, 9); // 10⁶ J/kmol = 1000 J/mol
  });

  it("names line and column of YAML errors and of unknown units, with the allowed ones", () => {
    const bad = readCanteraYamlMechanism(
      "units: {length: furlong, activation-energy: kcal/mole}\nreactions:\n- equation: A => B\n  rate-constant: {A: x, b: 0, Ea: 0}\n- equation: A B\n  rate-constant: {A: 1, b: 0, Ea: 0}\n- equation: B => A\n  rate-constant: {A: 1, b: 0, Ea: 0}\n",
    );
    expect(bad.problems.map((p) => [p.line, p.column])).toEqual([
      [1, 17],
      [1, 45],
      [4, 22],
      [5, 13],
    ]);
    expect(bad.problems[0].message).toMatch(/unknown length unit "furlong"; allowed: m, cm, mm, dm, km/);
    expect(bad.problems[1].message).toMatch(/allowed: K, eV, or an energy/);
    expect(bad.reactions.map((r) => r.notChecked === null)).toEqual([false, true]);
    const broken = readCanteraYamlMechanism("reactions:\n- equation: A => B\n  rate-constant: {A: 1, b: 0, Ea: 0\n");
    expect(broken.problems[0].line).toBeGreaterThanOrEqual(3);
  });
});

describe("a handbook check across both formats and unit systems", () => {
  // OH + CH4 → CH3 + H2O. The expression k = 1.0e8 T^1.6 exp(−3120 cal mol⁻¹ / RT) cm³ mol⁻¹ s⁻¹ is the one of a
  // widely used natural-gas mechanism, and k(298 K) ≈ 6.4e-15 cm³ molecule⁻¹ s⁻¹ the evaluated value for
  // atmospheric chemistry (1.85e-12 exp(−1690/T)); both from memory, hence the loose factor 1.3 below.
  const plain = readPlainTextMechanism("SPECIES OH CH4 CH3 H2O END\nREACTIONS\nOH+CH4<=>CH3+H2O 1.000E+08 1.600 3120.00\nEND\n")
    .reactions[0];
  const yamlKjM3 = readCanteraYamlMechanism(
    `units: {length: m, quantity: kmol, activation-energy: kJ/mol}\nreactions:\n- equation: OH + CH4 <=> CH3 + H2O\n  rate-constant: {A: 1.0e5, b: 1.6, Ea: ${(3120 * CAL) / 1000}}\n`,
  ).reactions[0];
  const yamlMoleculesK = readCanteraYamlMechanism(
    `units: {length: cm, quantity: molec, activation-energy: K}\nreactions:\n- equation: OH + CH4 <=> CH3 + H2O\n  rate-constant: {A: ${1e8 / N_A}, b: 1.6, Ea: ${(3120 * CAL) / R}}\n`,
  ).reactions[0];
  const plainKj = readPlainTextMechanism(
    `SPECIES OH CH4 CH3 H2O END\nREACTIONS KJOULES/MOLE MOLECULES\nOH+CH4<=>CH3+H2O ${1e8 / N_A} 1.6 ${(3120 * CAL) / 1000}\nEND\n`,
  ).reactions[0];

  it("gives one k(T) whatever the format and units (to 1e-12)", () => {
    for (const T of [300, 1000, 2500]) {
      const ref = k(plain, T);
      for (const other of [yamlKjM3, yamlMoleculesK, plainKj]) expect(k(other, T) / ref).toBeCloseTo(1, 12);
    }
  });

  it("reproduces the handbook value at 298 K within a factor 1.3 (values from memory)", () => {
    const k298 = k(plain, 298);
    expect(k298).toBeGreaterThan(6.4e-15 / 1.3);
    expect(k298).toBeLessThan(6.4e-15 * 1.3);
  });
});

describe("equations", () => {
  it("reads ions, named colliders and coefficients", () => {
    const ion = readEquation("H3O+ + E => H2O + H");
    expect(ion.ok && ion.value.reactants.map((p) => p.name)).toEqual(["H3O+", "E"]);
    const collider = readEquation("CH3 + CH3 (+ AR) <=> C2H6 (+ AR)");
    expect(collider.ok && collider.value.falloffCollider).toBe("AR");
    expect(collider.ok && collider.value.reactants).toEqual([{ name: "CH3", coefficient: 2 }]);
    expect(readEquation("A + => B")).toMatchObject({ ok: false });
    expect(readEquation("A => B => C")).toMatchObject({ ok: false });
    expect(readEquation("A + M => B")).toMatchObject({ ok: false });
  });
});

describe("Cantera YAML: a reaction's own units block inherits the file's (Cantera's UnitSystem rule, from its documentation of nested units)", () => {
  // Thermochemical calorie 4.184 J (NIST SP 811); per mol of reaction.
  const ea = (units: string, reactionUnits: string) =>
    readCanteraYamlMechanism(
      `units: ${units}\nreactions:\n- equation: A + B => C\n  units: ${reactionUnits}\n  rate-constant: {A: 1.0, b: 0, Ea: 2.5}\n`,
    ).reactions[0].rate!.Ea;
  it("keeps an explicit activation-energy unit when the reaction changes only the quantity", () => {
    expect(ea("{length: cm, quantity: mol, activation-energy: kcal/mol}", "{quantity: molec}")).toBeCloseTo(2.5 * 4184, 6);
  });
  it("derives Ea's unit from the energy in force and the reaction's quantity when none was explicit", () => {
    // 2.5 kcal per molecule = 2.5 × 4184 J × N_A per mol (CODATA 2018: N_A = 6.02214076e23 /mol, exact).
    expect(ea("{length: cm, quantity: mol, energy: kcal}", "{quantity: molec}") / (2.5 * 4184 * 6.02214076e23)).toBeCloseTo(1, 10);
  });
});

describe("readMechanism", () => {
  it("detects the format", () => {
    expect(detectMechanismFormat(YAML_TEXT)).toBe("cantera-yaml");
    expect(detectMechanismFormat(PLAIN)).toBe("plain-text");
    expect(readMechanism("hello world")).toMatchObject({ ok: false, failure: { code: "not_a_mechanism" } });
  });

  it("refuses more than 50 000 reactions, naming the first one over", () => {
    const lines = Array.from({ length: 50_001 }, () => "A=>B 1 0 0").join("\n");
    const r = readMechanism(`SPECIES A B END\nREACTIONS\n${lines}\nEND\n`);
    expect(r).toMatchObject({ ok: false, failure: { code: "too_many_reactions", line: 50_003 } });
  });
});

describe("names in capitals and undeclared duplicates", () => {
  it("reads HCL, CL and C2H5CL with the declared elements (chlorine, not carbon and an unknown L)", async () => {
    const { compositionFromName, mechanismSpeciesNames } = await import("@/lib/mechanisms/match");
    expect(compositionFromName("HCL", ["C", "H", "Cl"])).toEqual({ H: 1, Cl: 1 });
    expect(compositionFromName("C2H5CL", ["C", "H", "Cl"])).toEqual({ C: 2, H: 5, Cl: 1 });
    expect(compositionFromName("CL")).toEqual({ Cl: 1 });
    // CO is carbon monoxide unless cobalt is declared; OH, CH2O and HO2 as before.
    expect(compositionFromName("CO", ["C", "O", "H"])).toEqual({ C: 1, O: 1 });
    expect(compositionFromName("CO", ["Co"])).toEqual({ Co: 1 });
    expect(compositionFromName("OH")).toEqual({ O: 1, H: 1 });
    expect(compositionFromName("CH2O")).toEqual({ C: 1, H: 2, O: 1 });
    expect(compositionFromName("C2H5Cl")).toEqual({ C: 2, H: 5, Cl: 1 });
    expect(compositionFromName("XQ")).toBeNull();
    const read = readPlainTextMechanism(
      "ELEMENTS C H CL END\nSPECIES CL CH4 HCL CH3 END\nREACTIONS MOLECULES KELVINS\nCL+CH4=>HCL+CH3  7.1E-12 0.0 1270.0\nEND\n",
    );
    expect(read.elements).toEqual(["C", "H", "Cl"]);
    expect(mechanismSpeciesNames(read).find((n) => n.name === "HCL")?.formula).toBe("ClH");
  });

  it("lists a reaction written twice without DUPLICATE, naming the earlier line, and still reads both", async () => {
    const { readMechanism } = await import("@/lib/mechanisms/read-mechanism");
    const text =
      "ELEMENTS C H O END\nSPECIES OH CH4 H2O CH3 END\nREACTIONS\nOH+CH4=>H2O+CH3  1.0E13 0.0 3000.0\nCH4+OH=>CH3+H2O  2.0E13 0.0 3000.0\nEND\n";
    const read = readMechanism(text);
    expect(read.ok).toBe(true);
    if (!read.ok) return;
    expect(read.mechanism.reactions).toHaveLength(2);
    expect(read.mechanism.problems.map((p) => p.message)).toEqual([
      expect.stringMatching(/^Line 5: the same reaction as line 4, and neither is marked as a duplicate/),
    ]);
    const marked = readMechanism(text.replace("3000.0\nCH4", "3000.0\nDUPLICATE\nCH4").replace("3000.0\nEND", "3000.0\nDUPLICATE\nEND"));
    expect(marked.ok && marked.mechanism.problems).toEqual([]);
  });
});
