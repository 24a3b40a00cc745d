import { describe, expect, it } from "vitest";
import { analyseDataset, evaluateRateExpression, GAS_CONSTANT, toJoulesPerMole } from "@/lib/kinetics";
// The expressions in this fixture were written down FROM MEMORY of evaluated compilations (see its
// "WARNING" field): they are plausibility checks, not authoritative data. The checks below only
// use each entry's own numbers (A, E/R or Ea, and k computed from them).
import handbook from "@/tests/fixtures/handbook-arrhenius-from-memory.json";

const bimolecular = handbook["bimolecular_cm3_molecule-1_s-1"].map((e) => ({
  id: e.id,
  order: 2 as const,
  A: e.A,
  Ea: toJoulesPerMole(e.E_over_R_K, "K"),
  range: e.valid_T_range,
  k298: e.k_298_computed,
  k250: e.k_250_computed as number | undefined,
}));
const unimolecular = handbook["unimolecular_s-1"].map((e) => ({
  id: e.id,
  order: 1 as const,
  A: e.A_per_s,
  Ea: e.Ea_J_per_mol,
  range: e.valid_T_range,
  k298: e.k_298_computed,
  k250: undefined,
}));
const entries = [...bimolecular, ...unimolecular];

function parseRange(text: string): [number, number] {
  const m = /(\d+)\s*-\s*(\d+)/.exec(text);
  if (!m) throw new Error(`no range in ${text}`);
  return [Number(m[1]), Number(m[2])];
}

describe("handbook Arrhenius expressions (values from memory; fixture handbook-arrhenius-from-memory.json)", () => {
  it("the engine's R is the one the file's E/R ↔ Ea figures were computed with", () => {
    expect(GAS_CONSTANT).toBe(handbook.R_J_per_mol_K);
    // toJoulesPerMole(E/R in K) is the code under test; Ea_kJ_per_mol is the file's own figure.
    for (const e of handbook["bimolecular_cm3_molecule-1_s-1"])
      expect(toJoulesPerMole(e.E_over_R_K, "K") / 1000 / e.Ea_kJ_per_mol).toBeCloseTo(1, 12);
  });

  it.each(entries)("$id: k(298 K) and k(250 K) from A and E/R match the file's computed values", (e) => {
    expect(evaluateRateExpression({ A: e.A, Ea: e.Ea }, 298) / e.k298).toBeCloseTo(1, 12);
    if (e.k250 !== undefined) expect(evaluateRateExpression({ A: e.A, Ea: e.Ea }, 250) / e.k250).toBeCloseTo(1, 12);
  });

  it.each(entries)("$id: noise-free data over the stated range return A and Ea to 1e-10", (e) => {
    const [lo, hi] = parseRange(e.range);
    const points = Array.from({ length: 9 }, (_, i) => {
      const T = lo + ((hi - lo) * i) / 8;
      return { T, k: evaluateRateExpression({ A: e.A, Ea: e.Ea }, T) };
    });
    const r = analyseDataset({ points, order: e.order });
    expect(Math.abs(r.arrhenius.params.A! / e.A - 1)).toBeLessThan(1e-10);
    expect(Math.abs(r.arrhenius.params.Ea / e.Ea - 1)).toBeLessThan(1e-10);
    // Exact data: no outlier and no curvature reported from rounding noise.
    expect(r.flags.map((f) => f.code)).not.toContain("outlier");
    expect(r.flags.map((f) => f.code)).not.toContain("curvature");
    expect(r.band.model).toBe("arrhenius");
    if (e.Ea < 0) expect(r.flags.map((f) => f.code)).toContain("negative_activation_energy");
  });
});
