import { describe, expect, it } from "vitest";
import { analyseDataset } from "@/lib/kinetics";
import { EXAMPLE_DEPOSIT } from "@/lib/deposits/example";
import { normalisePoints, sigmaLnKOf, toAnalysisInput } from "@/lib/deposits/normalise";
import type { DepositDocument } from "@/lib/deposits/types";
import { validateDeposit } from "@/lib/deposits/validate";

function example(): DepositDocument {
  return structuredClone(EXAMPLE_DEPOSIT);
}

describe("normalisePoints: canonical units", () => {
  it("1.0e10 L mol⁻¹ s⁻¹ is 1.6605390671738466e-11 cm³ molecule⁻¹ s⁻¹", () => {
    // Hand-computed: 1e10 × 10³ cm³/L ÷ N_A, with N_A = 6.02214076e23 mol⁻¹ exactly (CODATA 2018,
    // https://physics.nist.gov/cgi-bin/cuu/Value?na); the same figure is in tests/fixtures/units-codata2018.json.
    const doc = example();
    doc.units.k = "L mol-1 s-1";
    doc.points = [
      { T: 298.15, k: 1.0e10 },
      { T: 310, k: 2.0e10 },
    ];
    const [p] = normalisePoints(doc);
    expect(p.k).toBe(1.6605390671738466e-11);
    expect(p.original).toEqual({ T: 298.15, k: 1.0e10, unitT: "K", unitK: "L mol-1 s-1" });
  });

  it("25 °C is 298.15 K and 760 Torr is 101325 Pa", () => {
    // 0 °C = 273.15 K by definition; 1 Torr = 101325/760 Pa by definition (1 atm = 101325 Pa).
    const doc = example();
    doc.units = { k: "cm3 molecule-1 s-1", T: "degC", pressure: "Torr" };
    doc.conditions = { pressure: { value: 760 } };
    doc.points = [
      { T: 25, k: 6e-15 },
      { T: 50, k: 9e-15, pressure: 7.6 },
    ];
    const [a, b] = normalisePoints(doc);
    expect(a.T).toBe(298.15);
    expect(a.pressurePa).toBe(101325);
    expect(b.T).toBeCloseTo(323.15, 12);
    expect(b.pressurePa).toBeCloseTo(1013.25, 9);
  });

  it("keeps the document's values next to the converted ones and applies per-point overrides", () => {
    const points = normalisePoints(example());
    expect(points).toHaveLength(10);
    expect(points[0]).toMatchObject({
      T: 250,
      k: 2.09e-15,
      bathGas: "He",
      original: { T: 250, k: 2.09e-15, unitT: "K", unitK: "cm3 molecule-1 s-1" },
    });
    // 50 Torr from conditions; the eighth point says 100 Torr; the last point's bath gas is N2.
    expect(points[0].pressurePa).toBeCloseTo((50 * 101325) / 760, 9);
    expect(points[7].pressurePa).toBeCloseTo((100 * 101325) / 760, 9);
    expect(points[7].note).toBe("Measured at 100 Torr to check for pressure dependence.");
    expect(points[9].bathGas).toBe("N2");
  });

  it("third-order rate constants in L² mol⁻² s⁻¹ divide by N_A² and multiply by 10⁶", () => {
    const doc = example();
    doc.reaction.order = 3;
    doc.units.k = "L2 mol-2 s-1";
    doc.points = [
      { T: 300, k: 1e9 },
      { T: 400, k: 5e8 },
    ];
    delete doc.reportedFit;
    expect(validateDeposit(doc).ok).toBe(true);
    const [p] = normalisePoints(doc);
    expect(p.k / ((1e9 * 1e6) / 6.02214076e23 / 6.02214076e23)).toBeCloseTo(1, 14);
  });
});

describe("σ(ln k) from stated uncertainties", () => {
  it.each([
    ["absolute, 1σ", { kind: "absolute", value: 1e-15 }, 1e-14, 0.1],
    ["absolute, 2σ", { kind: "absolute", value: 2e-15, confidence: "2sigma" }, 1e-14, 0.1],
    ["relative 8 %, 1σ", { kind: "relative", value: 8 }, 1e-14, 0.08],
    ["relative 8 %, 2σ", { kind: "relative", value: 8, confidence: "2sigma" }, 1e-14, 0.04],
    ["factor 1.1, 1σ", { kind: "factor", value: 1.1 }, 1e-14, Math.log(1.1)],
    ["factor 1.2, 2σ", { kind: "factor", value: 1.2, confidence: "2sigma" }, 1e-14, Math.log(1.2) / 2],
  ] as const)("%s", (_label, uncertainty, k, expected) => {
    expect(sigmaLnKOf({ k, uncertainty: { ...uncertainty } })).toBeCloseTo(expected, 15);
  });

  it("is absent without an uncertainty", () => {
    expect(sigmaLnKOf({ k: 1e-14 })).toBeUndefined();
  });
});

describe("toAnalysisInput", () => {
  it("gives canonical points, the order and the reported fit in canonical units", () => {
    const input = toAnalysisInput(example());
    expect(input.order).toBe(2);
    expect(input.points).toHaveLength(10);
    expect(input.points[0]).toEqual({ T: 250, k: 2.09e-15, sigmaLnK: 1.7e-16 / 2.09e-15 / 2 });
    expect(input.T0).toBeUndefined();
    expect(input.reportedFit).toEqual({ A: 2.2e-12, n: 0, Ea: 14550, T0: 298.15, Tmin: 250, Tmax: 420 });
  });

  it("converts A, Ea, T0 and the stated range from the document's units", () => {
    const doc = example();
    doc.units = { k: "L mol-1 s-1", T: "degC" };
    delete doc.conditions;
    doc.points = [
      { T: 0, k: 1e9 },
      { T: 100, k: 3e9 },
    ];
    doc.reportedFit = { model: "modified_arrhenius", A: 1e10, n: 1.5, Ea: 2, EaUnit: "kcal mol-1", T0: 26.85, Tmin: 0, Tmax: 100 };
    expect(validateDeposit(doc).ok).toBe(true);
    const input = toAnalysisInput(doc);
    expect(input.points[0].T).toBe(273.15);
    expect(input.T0).toBeCloseTo(300, 12);
    expect(input.reportedFit!.A).toBe(1.6605390671738466e-11);
    expect(input.reportedFit!.Ea).toBeCloseTo(8368, 9); // 2 × 4184 J (thermochemical calorie)
    expect(input.reportedFit!.n).toBe(1.5);
    expect(input.reportedFit!.T0).toBeCloseTo(300, 12);
    expect(input.reportedFit!.Tmin).toBe(273.15);
    expect(input.reportedFit!.Tmax).toBe(373.15);
  });

  it("feeds analyseDataset, whose Arrhenius fit recovers the invented parameters", () => {
    const result = analyseDataset(toAnalysisInput(example()));
    // The example was generated from Ea/R = 1750 K, i.e. Ea = 14.55 kJ mol⁻¹, with a few percent of scatter.
    expect(result.arrhenius.params.Ea / 1000).toBeGreaterThan(13);
    expect(result.arrhenius.params.Ea / 1000).toBeLessThan(16);
  });
});
