import { describe, expect, it } from "vitest";
import {
  AVOGADRO,
  BOLTZMANN,
  CALORIE,
  ELEMENTARY_CHARGE,
  GAS_CONSTANT,
  LN_BOLTZMANN_OVER_PLANCK,
  PLANCK,
  SUPPORTED_UNITS,
  UnitError,
  convertEnergy,
  convertPressure,
  convertRateConstant,
  convertTemperature,
  fromCanonicalRateConstant,
  parseEnergyUnit,
  parseRateConstantUnit,
  parseTemperatureUnit,
  sigmaLnKFromAbsolute,
  sigmaLnKFromFactor,
  sigmaLnKFromRelative,
  toCanonicalRateConstant,
  toJoulesPerMole,
  toKelvin,
  toPascal,
} from "@/lib/kinetics";
// Source: CODATA 2018 recommended values and derived factors, tests/fixtures/units-codata2018.json.
import codata from "@/tests/fixtures/units-codata2018.json";

const relClose = (a: number, b: number, rel = 1e-14) => expect(Math.abs(a - b)).toBeLessThanOrEqual(rel * Math.abs(b));

describe("CODATA 2018 constants (fixture units-codata2018.json)", () => {
  const c = codata.constants_CODATA2018;
  it("are the exact defined values", () => {
    expect(PLANCK).toBe(c.h_J_s);
    expect(BOLTZMANN).toBe(c.k_B_J_per_K);
    expect(AVOGADRO).toBe(c.N_A_per_mol);
    expect(ELEMENTARY_CHARGE).toBe(c.e_C);
    expect(GAS_CONSTANT).toBe(c.R_J_per_mol_K);
    expect(CALORIE).toBe(c.cal_th_J);
  });
  it("R = N_A·k_B and ln(k_B/h) match the fixture", () => {
    relClose(AVOGADRO * BOLTZMANN, GAS_CONSTANT, 1e-15);
    relClose(BOLTZMANN / PLANCK, c.k_B_over_h_per_s_K, 1e-15);
    relClose(LN_BOLTZMANN_OVER_PLANCK, c.ln_k_B_over_h, 1e-15);
  });
});

describe("rate-constant conversions (fixture factors and worked examples)", () => {
  it.each(Object.entries(codata.rate_constant_factors))("factor %s = %d", (pair, factor) => {
    const [from, to] = pair.split(" -> ");
    relClose(convertRateConstant(1, from, to), factor);
  });
  it.each(codata.rate_constant_examples)("example k = $k $from", (example) => {
    for (const [unit, expected] of Object.entries(example)) {
      if (unit === "k" || unit === "from") continue;
      relClose(convertRateConstant(example.k, example.from, unit), expected as number, 1e-10);
    }
  });
  it("round-trips through the canonical unit for every supported unit", () => {
    for (const order of [1, 2, 3] as const) {
      for (const u of SUPPORTED_UNITS.rateConstant[order]) {
        const k = 3.7e-13;
        relClose(fromCanonicalRateConstant(toCanonicalRateConstant(k, u.id, order), u.id, order), k, 1e-15);
      }
    }
  });
  it("accepts the documented spellings", () => {
    const spellings = [
      "cm3 molecule-1 s-1",
      "cm^3 molecule^-1 s^-1",
      "cm³ molecule⁻¹ s⁻¹",
      "cm3/molecule/s",
      "cm3·molecule-1·s-1",
      "  cm3   molecule-1 s-1 ",
    ];
    for (const s of spellings) expect(parseRateConstantUnit(s, 2).id).toBe("cm3 molecule-1 s-1");
    for (const s of ["L mol-1 s-1", "M-1 s-1", "dm3 mol-1 s-1", "dm³ mol⁻¹ s⁻¹", "L/mol/s"]) {
      expect(parseRateConstantUnit(s, 2).id).toBe("L mol-1 s-1");
    }
    expect(parseRateConstantUnit("s^-1", 1).id).toBe("s-1");
    expect(parseRateConstantUnit("M-2 s-1", 3).id).toBe("L2 mol-2 s-1");
  });
  it("rejects an unknown unit, listing what is accepted", () => {
    const attempt = () => parseRateConstantUnit("cm3 s-1", 2);
    expect(attempt).toThrow(UnitError);
    expect(attempt).toThrow(/Unknown second-order rate-constant unit "cm3 s-1"\. Accepted: cm3 molecule-1 s-1/);
    try {
      attempt();
    } catch (e) {
      expect((e as UnitError).code).toBe("unknown_unit");
      expect((e as UnitError).accepted).toContain("L mol-1 s-1");
    }
    // Case matters: "m" is metre, "M" is molar.
    expect(() => parseRateConstantUnit("m-1 s-1", 2)).toThrow(UnitError);
  });
  it("rejects a unit of another reaction order", () => {
    expect(() => parseRateConstantUnit("L2 mol-2 s-1", 2)).toThrow(/third-order unit, but this reaction is second order/);
    expect(() => convertRateConstant(1, "s-1", "cm3 molecule-1 s-1")).toThrow(
      /Cannot convert s-1 \(first order\) to cm3 molecule-1 s-1 \(second order\)/,
    );
  });
});

describe("energy conversions (fixture factors and worked examples)", () => {
  const spelling: Record<string, string> = {
    J_per_mol: "J/mol",
    kJ_per_mol: "kJ/mol",
    kcal_per_mol: "kcal/mol",
    eV_per_molecule: "eV",
    Ea_over_R_K: "K",
  };
  it("factors per J mol⁻¹", () => {
    const f = codata.energy_factors_per_J_per_mol;
    relClose(convertEnergy(1, "J mol-1", "kJ mol-1"), f.kJ_per_mol);
    relClose(convertEnergy(1, "J mol-1", "kcal mol-1"), f.kcal_per_mol);
    relClose(convertEnergy(1, "J mol-1", "eV"), f.eV_per_molecule);
    relClose(convertEnergy(1, "J mol-1", "K"), f["K (Ea/R)"]);
  });
  it.each(codata.energy_examples)("example %#", (example) => {
    const from = "from" in example ? (example.from as string) : null;
    const source =
      from === "1 eV"
        ? { v: 1, u: "eV" }
        : from === "1 kcal/mol"
          ? { v: 1, u: "kcal/mol" }
          : from === "Ea/R = 1000 K"
            ? { v: 1000, u: "K" }
            : { v: example.Ea_J_per_mol as number, u: "J/mol" };
    for (const [key, unit] of Object.entries(spelling)) {
      relClose(convertEnergy(source.v, source.u, unit), (example as unknown as Record<string, number>)[key], 1e-13);
    }
  });
  it("wavenumbers: 1 cm⁻¹ = h·c·100 m⁻¹·N_A J mol⁻¹", () => {
    relClose(toJoulesPerMole(1, "cm-1"), 11.9626565638697, 1e-12);
    expect(parseEnergyUnit("cm⁻¹").id).toBe("cm-1");
  });
  it("K is E/R for energies but kelvin for temperatures", () => {
    expect(parseEnergyUnit("K").factor).toBe(GAS_CONSTANT);
    expect(parseTemperatureUnit("K").factor).toBe(1);
  });
  it("rejects an unknown energy unit", () => {
    expect(() => toJoulesPerMole(1, "kJ")).toThrow(/Unknown energy unit "kJ"\. Accepted: J mol-1/);
  });
});

describe("temperature and pressure", () => {
  it("converts °C and K and refuses temperatures below absolute zero", () => {
    expect(toKelvin(25, "°C")).toBeCloseTo(298.15, 12);
    expect(toKelvin(25, "degC")).toBeCloseTo(298.15, 12);
    expect(convertTemperature(300, "K", "degC")).toBeCloseTo(26.85, 12);
    expect(toKelvin(0, "K")).toBe(0);
    expect(() => toKelvin(-300, "degC")).toThrow(/below absolute zero/);
    expect(() => toKelvin(-1, "K")).toThrow(UnitError);
    expect(() => toKelvin(Number.NaN, "K")).toThrow(/finite number/);
  });
  it("converts pressures by their exact definitions", () => {
    expect(toPascal(1, "atm")).toBe(101325);
    expect(toPascal(760, "Torr")).toBeCloseTo(101325, 9);
    expect(toPascal(1, "bar")).toBe(1e5);
    expect(toPascal(1, "mbar")).toBe(100);
    expect(toPascal(2.5, "kPa")).toBe(2500);
    expect(convertPressure(1, "atm", "Torr")).toBeCloseTo(760, 10);
    expect(() => toPascal(-1, "Pa")).toThrow(/cannot be negative/);
    expect(() => toPascal(1, "psi")).toThrow(/Unknown pressure unit "psi"/);
  });
  it("exports the supported units for pickers", () => {
    expect(SUPPORTED_UNITS.rateConstant[2].map((u) => u.id)).toEqual([
      "cm3 molecule-1 s-1",
      "cm3 mol-1 s-1",
      "L mol-1 s-1",
      "m3 mol-1 s-1",
      "m3 molecule-1 s-1",
    ]);
    expect(SUPPORTED_UNITS.pressure.map((u) => u.id)).toEqual(["Pa", "kPa", "bar", "mbar", "atm", "Torr"]);
    expect(SUPPORTED_UNITS.energy.map((u) => u.id)).toContain("kcal mol-1");
  });
});

describe("uncertainty conversions to σ(ln k)", () => {
  it("absolute, relative and factor forms", () => {
    expect(sigmaLnKFromAbsolute(2e-12, 2e-13)).toBeCloseTo(0.1, 15);
    expect(sigmaLnKFromRelative(15)).toBeCloseTo(0.15, 15);
    expect(sigmaLnKFromFactor(1.1)).toBeCloseTo(Math.log(1.1), 15);
    expect(sigmaLnKFromFactor(2, 2)).toBeCloseTo(Math.log(2) / 2, 15);
  });
  it("refuses meaningless uncertainties", () => {
    expect(() => sigmaLnKFromFactor(1)).toThrow(/greater than 1/);
    expect(() => sigmaLnKFromFactor(0.5)).toThrow(UnitError);
    expect(() => sigmaLnKFromRelative(0)).toThrow(/positive percentage/);
    expect(() => sigmaLnKFromAbsolute(0, 1)).toThrow(/k must be positive/);
  });
});
