import { describe, expect, it } from "vitest";
import { parse } from "yaml";
import { AppError } from "@/lib/errors";
import {
  buildCanteraYaml,
  buildMechanismTable,
  canteraEquation,
  convertMechanismFits,
  mechanismRateUnits,
  MECHANISM_ENERGY_UNITS,
  type MechanismSubject,
} from "@/lib/exports/mechanism";
import { mechanismUnitsOrThrow, parseQueryOrThrow, versionParametersQuerySchema } from "@/lib/exports/requests";
import { formulaName, mechanismSpeciesNames } from "@/lib/exports/species-names";
import type { ReactionOrder } from "@/lib/kinetics/types";
// Source: CODATA 2018 recommended values (N_A and R exact since the 2019 SI), and the thermochemical
// calorie 4.184 J (NIST SP 811, 2008, B.8): tests/fixtures/units-codata2018.json.
import codata from "@/tests/fixtures/units-codata2018.json";

const N_A = codata.constants_CODATA2018.N_A_per_mol;
const R = codata.constants_CODATA2018.R_J_per_mol_K;
const CAL = codata.constants_CODATA2018.cal_th_J;

/** An invented subject: a curved fit (preferred) and its straight companion, for one reaction order. */
function subject(order: ReactionOrder): MechanismSubject {
  const lnA = order === 1 ? Math.log(3.2e13) : order === 2 ? Math.log(2.45e-12) : Math.log(6.1e-33);
  return {
    kind: "version",
    title: "Invented test dataset",
    equation: "OH + methyl radical → methanol",
    // InChIKey-shaped keys invented for the test (the naming only compares them).
    participants: [
      {
        side: "reactant",
        name: "OH",
        coefficient: 1,
        inchiKey: "AAAAAAAAAAAAAA-UHFFFAOYSA-N",
        formula: "HO",
        charge: 0,
        depositedName: "hydroxyl",
      },
      {
        side: "reactant",
        name: "methyl radical",
        coefficient: 1,
        inchiKey: "BBBBBBBBBBBBBB-UHFFFAOYSA-N",
        formula: "CH3",
        charge: 0,
        depositedName: "methyl radical",
      },
      {
        side: "product",
        name: "methanol",
        coefficient: 1,
        inchiKey: "CCCCCCCCCCCCCC-UHFFFAOYSA-N",
        formula: "CH4O",
        charge: 0,
        depositedName: "methanol",
      },
    ],
    order,
    identifier: "10.5072/ARH-TEST-0000/1",
    sources: [],
    landingPage: "http://127.0.0.1/datasets/1/v1",
    citation: "Invented, A. (2026). Invented test dataset. Version 1.",
    range: { Tmin: 250, Tmax: 1200 },
    fits: [
      { model: "arrhenius", lnA: lnA + 0.3, n: 0, Ea: 14_000, T0: 300 },
      { model: "modified_arrhenius", lnA, n: 1.73, Ea: 12_345.678, T0: 300 },
    ],
    preferred: "modified_arrhenius",
    engineVersion: "test",
    retraction: null,
    caution: "Caution sentence.",
  };
}

/** k(T) of one of the subject's fits, in the canonical unit: A (T/T0)^n exp(−Ea/RT). */
const kOfFit = (f: MechanismSubject["fits"][number], T: number) => Math.exp(f.lnA) * (T / f.T0) ** f.n * Math.exp(-f.Ea / (R * T));

/** Cantera's units block → factor from its A′ unit to the canonical unit (cm³ molecule⁻¹ … s⁻¹), written out from the definitions. */
function toCanonical(units: { length: string; quantity: string }, order: ReactionOrder): number {
  const cm3 = { cm: 1, dm: 1e3, m: 1e6 }[units.length]!;
  // Per mole → per molecule divides by N_A for each concentration factor.
  const perQuantity = units.quantity === "mol" ? 1 / N_A : 1;
  return (cm3 * perQuantity) ** (order - 1);
}

/** Cantera's activation-energy unit → J mol⁻¹. */
const energyToJoules: Record<string, number> = { "J/mol": 1, "kJ/mol": 1000, "cal/mol": CAL, "kcal/mol": 1000 * CAL, K: R };

describe("Cantera YAML of a fit", () => {
  const temperatures = [250, 298.15, 500, 900, 1200, 2000];
  for (const order of [1, 2, 3] as const) {
    for (const kUnit of mechanismRateUnits(order)) {
      for (const energy of MECHANISM_ENERGY_UNITS) {
        it(`order ${order}, k in ${kUnit}, Ea in ${energy.id}: A·T^b·exp(−Ea/RT) read back reproduces k(T) to 1e-10`, () => {
          const s = subject(order);
          for (const fit of ["preferred", "arrhenius", "modified_arrhenius"] as const) {
            const text = buildCanteraYaml(s, { kUnit, energyUnit: energy.id }, fit);
            const doc = parse(text);
            expect(doc.units).toMatchObject({ time: "s", "activation-energy": energy.cantera });
            expect(doc.reactions).toHaveLength(1);
            const [reaction] = doc.reactions;
            expect(reaction.equation).toBe("OH + CH3 => CH4O");
            const { A, b, Ea } = reaction["rate-constant"];
            const model = fit === "preferred" ? "modified_arrhenius" : fit;
            const source = s.fits.find((f) => f.model === model)!;
            expect(b).toBe(source.n);
            const EaJ = Ea * energyToJoules[doc.units["activation-energy"]];
            for (const T of temperatures) {
              const fromYaml = A * toCanonical(doc.units, order) * T ** b * Math.exp(-EaJ / (R * T));
              expect(Math.abs(fromYaml / kOfFit(source, T) - 1)).toBeLessThan(1e-10);
            }
          }
        });
      }
    }
  }

  it("says what it is: identifier and caution in comments and the description", () => {
    const text = buildCanteraYaml(subject(2), { kUnit: "cm3 molecule-1 s-1", energyUnit: "kcal mol-1" });
    expect(text).toMatch(/^# .*Arrhenia mechanism parameters/m);
    expect(text).toContain("# doi:10.5072/ARH-TEST-0000/1");
    const doc = parse(text);
    expect(doc.description).toContain("caution: Caution sentence.");
    expect(doc.description).toContain("valid range: 250 K to 1200 K");
    expect(doc.units).toEqual({ length: "cm", quantity: "molec", time: "s", "activation-energy": "kcal/mol" });
  });

  it("reads the same under a YAML 1.1-style reading, whatever line separators the texts hold", () => {
    // YAML 1.1 (§5.4, as PyYAML reads it) breaks lines at U+0085, U+2028 and U+2029 too; YAML 1.2 does not.
    // Invented texts that would start keys of their own if a reader broke the line there.
    const odd: MechanismSubject = {
      ...subject(2),
      title: "Rates\u2028injected: 1\u2029other: 2\u0085third: 3",
      equation: "OH + CH4\u2028units: broken",
      participants: [
        { ...subject(2).participants[0], name: "OH\u2028x: 1", depositedName: "OH\u2028x: 1" },
        { ...subject(2).participants[2], side: "product", name: "water\u202E", depositedName: "water\u202E" },
      ],
      citation: "Invented\u2028, A.\u200B (2026).",
      caution: "Caution\u2028sentence: yes",
    };
    const text = buildCanteraYaml(odd, { kUnit: "cm3 molecule-1 s-1", energyUnit: "kcal mol-1" }, "preferred", "deposited");
    expect(text).not.toMatch(/[\u0085\u2028\u2029\u200B\u202A-\u202E\u2066-\u2069]/);
    const as12 = parse(text);
    const as11 = parse(text.replace(/[\u0085\u2028\u2029]/g, "\n"));
    expect(as11).toEqual(as12);
    expect(Object.keys(as12)).toEqual(["description", "units", "species-identities", "reactions"]);
    expect(as12.description).toContain("dataset: Rates injected: 1 other: 2 third: 3");
    expect(as12.reactions[0].equation).toBe("OH_x:_1 => water");
    // Three lines about the file, then (after a blank line) the names' explanation and heading, one line per species.
    expect(text.split("\n").filter((l) => l.startsWith("#"))).toHaveLength(3 + 2 + 2);
  });

  it("writes the equation with coefficients and the file's names", () => {
    const [oh, , methanol] = subject(2).participants;
    const participants = [
      { ...oh, coefficient: 2 },
      { ...methanol, name: "hydrogen  peroxide", depositedName: "hydrogen  peroxide" },
    ];
    expect(canteraEquation(participants, mechanismSpeciesNames(participants, "deposited"))).toBe("2 hydroxyl => hydrogen_peroxide");
    expect(canteraEquation(participants, mechanismSpeciesNames(participants))).toBe("2 OH => CH4O");
  });

  it("names species by formula by default, with the name ↔ InChIKey ↔ depositor's name map as comments; names=deposited keeps the words", () => {
    const text = buildCanteraYaml(subject(2), { kUnit: "cm3 molecule-1 s-1", energyUnit: "kJ mol-1" });
    expect(parse(text).reactions[0].equation).toBe("OH + CH3 => CH4O");
    const comments = text.split("\n").filter((l) => l.startsWith("#"));
    expect(comments.find((l) => l.includes("AAAAAAAAAAAAAA-UHFFFAOYSA-N"))).toMatch(/^# OH\s+AAAAAAAAAAAAAA-UHFFFAOYSA-N\s+hydroxyl$/);
    expect(comments.find((l) => l.includes("BBBBBBBBBBBBBB"))).toMatch(/^# CH3\s+BBBBBBBBBBBBBB-UHFFFAOYSA-N\s+methyl radical$/);
    // The same map as data, for scripts (a YAML reader drops comments).
    expect(parse(text)["species-identities"]).toContainEqual({
      name: "OH",
      InChIKey: "AAAAAAAAAAAAAA-UHFFFAOYSA-N",
      "deposited-name": "hydroxyl",
    });
    const words = buildCanteraYaml(subject(2), { kUnit: "cm3 molecule-1 s-1", energyUnit: "kJ mol-1" }, "preferred", "deposited");
    expect(parse(words).reactions[0].equation).toBe("hydroxyl + methyl_radical => methanol");
    expect(parse(words)["species-identities"].map((s: { name: string }) => s.name)).toEqual(["hydroxyl", "methyl_radical", "methanol"]);
  });
});

describe("species names in a mechanism file", () => {
  const sp = (inchiKey: string, formula: string, depositedName: string, charge = 0) => ({ inchiKey, formula, charge, depositedName });
  it("writes the usual formula where it differs from Hill order, and the charge after it (common practice)", () => {
    expect(formulaName("HO", 0)).toBe("OH");
    expect(formulaName("H3N", 0)).toBe("NH3");
    expect(formulaName("ClH", 0)).toBe("HCl");
    expect(formulaName("CH4", 0)).toBe("CH4");
    expect(formulaName("HO2", 0)).toBe("HO2");
    expect(formulaName("HO", -1)).toBe("OH-");
    expect(formulaName("O2", -2)).toBe("O22-");
    // A formula shared by isomers keeps its Hill form (HNO2: nitrous acid or nitryl hydride).
    expect(formulaName("HNO2", 0)).toBe("HNO2");
  });

  it("never merges two species: isomers sharing a formula get the shortest distinguishing part of their InChIKey", () => {
    // Invented InChIKey-shaped keys of two C3H7 isomers and of a third species.
    const nPropyl = sp("KDYFGRWQOYBRFD-UHFFFAOYSA-N", "C3H7", "n-propyl");
    const isoPropyl = sp("KDYFXXXXOYBRFD-UHFFFAOYSA-N", "C3H7", "isopropyl");
    const water = sp("XLYOFNOQVPJJNP-UHFFFAOYSA-N", "H2O", "water");
    const names = mechanismSpeciesNames([nPropyl, isoPropyl, water, nPropyl]);
    expect(names.get(nPropyl.inchiKey)).toBe("C3H7-KDYFG");
    expect(names.get(isoPropyl.inchiKey)).toBe("C3H7-KDYFX");
    expect(names.get(water.inchiKey)).toBe("H2O");
    expect(new Set(names.values()).size).toBe(3);
    // Two species a depositor gave one word are told apart the same way.
    const same = mechanismSpeciesNames(
      [sp("AAAAAAAAAAAAAA-B-N", "C2H4O", "oxide"), sp("CCCCCCCCCCCCCC-B-N", "C2H4O", "oxide")],
      "deposited",
    );
    expect([...same.values()]).toEqual(["oxide-AAAA", "oxide-CCCC"]);
    // A depositor's word that happens to be a suffixed name still cannot merge.
    const clash = mechanismSpeciesNames(
      [sp("AAAAAAAAAAAAAA-B-N", "X", "X"), sp("AAAAZZZZZZZZZZ-B-N", "X", "X"), sp("QQQQQQQQQQQQQQ-B-N", "Y", "X-AAAAA")],
      "deposited",
    );
    expect(new Set(clash.values()).size).toBe(3);
  });
});

describe("unit conversions of the parameters", () => {
  it("A per mole is A per molecule × N_A (CODATA 2018); m³ is 10⁶ cm³; Ea in kcal is J / 4184 (thermochemical calorie, NIST SP 811); K is Ea/R", () => {
    const s = subject(2);
    const base = convertMechanismFits(s, { kUnit: "cm3 molecule-1 s-1", energyUnit: "J mol-1" });
    const perMole = convertMechanismFits(s, { kUnit: "cm3 mol-1 s-1", energyUnit: "kcal mol-1" });
    const si = convertMechanismFits(s, { kUnit: "m3 mol-1 s-1", energyUnit: "K" });
    expect(base[0].model).toBe("modified_arrhenius");
    for (let i = 0; i < base.length; i++) {
      expect(perMole[i].A / (base[i].A * N_A) - 1).toBeCloseTo(0, 12);
      expect(si[i].A / ((base[i].A * N_A) / 1e6) - 1).toBeCloseTo(0, 12);
      expect(perMole[i].Ea / (base[i].Ea / (1000 * CAL)) - 1).toBeCloseTo(0, 12);
      expect(si[i].Ea / (base[i].Ea / R) - 1).toBeCloseTo(0, 12);
      expect(base[i].canteraA / (base[i].A / base[i].T0 ** base[i].n) - 1).toBeCloseTo(0, 12);
    }
  });
});

describe("the plain table", () => {
  it("names the reaction, identifier, T0, range and caution, and aligns its columns", () => {
    const text = buildMechanismTable(subject(2), { kUnit: "cm3 mol-1 s-1", energyUnit: "kcal mol-1" });
    expect(text).toContain("reaction: OH + methyl radical → methanol");
    expect(text).toContain("version identifier: doi:10.5072/ARH-TEST-0000/1");
    expect(text).toContain("T0 = 300 K");
    expect(text).toContain("caution: Caution sentence.");
    const lines = text.trimEnd().split("\n");
    const table = lines.slice(lines.findIndex((l) => l.startsWith("fit ")));
    expect(table).toHaveLength(3);
    expect(table[1]).toMatch(/^modified Arrhenius\s+yes\s/);
    // Every column starts where its heading starts, on every line.
    const heads = ["fit", "preferred", "A (", "n", "Ea (", "T0 (K)", "A/T0^n"];
    const at = heads.map((h) => table[0].indexOf(h));
    const cellsOf = (line: string) => at.map((start, i) => line.slice(start, at[i + 1]).trim());
    expect(cellsOf(table[0]).every((c, i) => c.startsWith(heads[i]))).toBe(true);
    const cells = cellsOf(table[1]);
    expect(cells.slice(0, 2)).toEqual(["modified Arrhenius", "yes"]);
    expect(cellsOf(table[2]).slice(0, 2)).toEqual(["Arrhenius", ""]);
    expect(cellsOf(table[2])[3]).toBe("0");
    expect(cells[5]).toBe("300");
    // A in cm³ mol⁻¹ s⁻¹ = A per molecule × N_A, Ea in kcal mol⁻¹ = J mol⁻¹ / 4184.
    expect(Number(cells[2]) / (2.45e-12 * N_A)).toBeCloseTo(1, 6);
    expect(Number(cells[4]) / (12_345.678 / 4184)).toBeCloseTo(1, 6);
  });
});

describe("the query", () => {
  const bad = (f: () => unknown) => {
    try {
      f();
    } catch (e) {
      return e as AppError;
    }
    throw new Error("no error");
  };
  it("a unit of another order, an unknown energy unit, an unknown format or parameter is a 400 naming it", () => {
    expect(bad(() => mechanismUnitsOrThrow(2, { k: "s-1" })).errors.map((e) => e.parameter)).toEqual(["k"]);
    expect(bad(() => mechanismUnitsOrThrow(2, { energy: "eV" })).errors.map((e) => e.parameter)).toEqual(["energy"]);
    expect(bad(() => mechanismUnitsOrThrow(2, { k: "furlongs", energy: "x" })).status).toBe(400);
    const q = (s: string) => bad(() => parseQueryOrThrow(versionParametersQuerySchema, new URLSearchParams(s)));
    expect(q("format=xml").errors[0]).toMatchObject({ parameter: "format", pointer: "/format" });
    expect(q("units=K").errors[0]).toMatchObject({ parameter: "units" });
    expect(q("k=s-1&k=s-1").errors[0]).toMatchObject({ parameter: "k" });
  });
  it("takes the units' other spellings and defaults to the canonical k unit and kJ mol⁻¹", () => {
    expect(mechanismUnitsOrThrow(2, {})).toEqual({ kUnit: "cm3 molecule-1 s-1", energyUnit: "kJ mol-1" });
    expect(mechanismUnitsOrThrow(2, { k: "cm3/mol/s", energy: "kcal/mol" })).toEqual({ kUnit: "cm3 mol-1 s-1", energyUnit: "kcal mol-1" });
  });
});
