/**
 * Standard errors of weighted fits: the stated uncertainties are a floor, s² = max(1, χ²/dof).
 * Reference values from scipy.optimize.curve_fit (numpy and scipy versions in the fixture's
 * `source`; tests/fixtures/weighted-se/generate.py): absolute_sigma=True gives the standard errors of
 * the stated σ alone, absolute_sigma=False those times √(χ²/dof).
 */
import { describe, expect, it } from "vitest";
import { analyseDataset, describeWeightedErrors, GAS_CONSTANT, type AnalysisResult } from "@/lib/kinetics";
import { t95 } from "@/lib/kinetics/distributions";
import reference from "../../fixtures/weighted-se/reference.json";

interface ReferenceFit {
  params: number[];
  chi2Reduced: number;
  seAbsoluteSigma: number[];
  seScaledByChi2: number[];
  covarianceAbsoluteSigma: number[][];
}

const sets = reference.sets as Record<
  string,
  { points: { T: number; k: number; sigmaLnK: number }[]; arrhenius: ReferenceFit; modifiedArrhenius: ReferenceFit }
>;

/** curve_fit iterates (Levenberg–Marquardt, exact Jacobian given) to its tolerance of 1e-15. */
const REL = 1e-9;

function expectRelative(actual: number | null, expected: number): void {
  expect(actual).not.toBeNull();
  expect(Math.abs((actual as number) / expected - 1)).toBeLessThan(REL);
}

/** The modified fit's [lnA, n, Ea] standard errors against reference values in that order. */
function expectModifiedSe(m: AnalysisResult["modifiedArrhenius"], expected: number[]): void {
  expect(m).not.toBeNull();
  const se = m!.se;
  [se.lnA, se.n, se.Ea].forEach((v, i) => expectRelative(v, expected[i]));
}

describe("weighted-fit standard errors against scipy curve_fit", () => {
  it("a set scattering less than its stated σ keeps the σ's standard errors (absolute_sigma=True), not smaller ones", () => {
    const s = sets.tighter_than_stated;
    const r = analyseDataset({ points: s.points, order: 2 });
    const ref = s.arrhenius;
    expect(ref.chi2Reduced).toBeLessThan(1);
    expectRelative(r.arrhenius.chi2Reduced ?? null, ref.chi2Reduced);
    expectRelative(r.arrhenius.scaleFactor, Math.sqrt(ref.chi2Reduced));
    expectRelative(r.arrhenius.params.Ea, ref.params[1]);
    expectRelative(r.arrhenius.se.lnA, ref.seAbsoluteSigma[0]);
    expectRelative(r.arrhenius.se.Ea, ref.seAbsoluteSigma[1]);
    // Not the scaled-down errors a plain s²(XᵀWX)⁻¹ would give (a factor √0.47 ≈ 0.69 smaller).
    expect((r.arrhenius.se.Ea as number) / ref.seScaledByChi2[1]).toBeGreaterThan(1.4);
    expectRelative(r.arrhenius.covariance![1][1], ref.seAbsoluteSigma[1] ** 2);
    expect(s.modifiedArrhenius.chi2Reduced).toBeLessThan(1);
    expectModifiedSe(r.modifiedArrhenius, s.modifiedArrhenius.seAbsoluteSigma);
  });

  it("a set scattering more than its stated σ has them enlarged by √(χ²/dof) (absolute_sigma=False)", () => {
    const s = sets.wider_than_stated;
    const r = analyseDataset({ points: s.points, order: 2 });
    const ref = s.arrhenius;
    expect(ref.chi2Reduced).toBeGreaterThan(1);
    expectRelative(r.arrhenius.se.lnA, ref.seScaledByChi2[0]);
    expectRelative(r.arrhenius.se.Ea, ref.seScaledByChi2[1]);
    expectRelative(r.arrhenius.se.Ea, ref.seAbsoluteSigma[1] * Math.sqrt(ref.chi2Reduced));
    expectModifiedSe(r.modifiedArrhenius, s.modifiedArrhenius.seScaledByChi2);
  });

  it("the confidence limits of k follow the same rule: the stated σ's own interval when the scatter is smaller", () => {
    const s = sets.tighter_than_stated;
    const r = analyseDataset({ points: s.points, order: 2 });
    const mid = r.arrhenius.kMid;
    // Variance of ln k̂ at kMid's temperature from curve_fit's absolute_sigma covariance: xᵀCx, x = (1, −1/(RT)).
    const C = s.arrhenius.covarianceAbsoluteSigma;
    const x = [1, -1 / (GAS_CONSTANT * mid.T)];
    const variance = x[0] * (C[0][0] * x[0] + C[0][1] * x[1]) + x[1] * (C[1][0] * x[0] + C[1][1] * x[1]);
    const half = Math.log((mid.upper as number) / (mid.value as number));
    expectRelative(half / t95(r.arrhenius.dof), Math.sqrt(variance));
  });
});

describe("describeWeightedErrors", () => {
  it("says the errors were enlarged, or not reduced, with √(χ²/dof) to three digits, as the row beside it", () => {
    expect(describeWeightedErrors(1.83)).toBe(
      "The points scatter more than their stated uncertainties allow (√(χ²/dof) = 1.83); the standard errors are enlarged by that factor.",
    );
    expect(describeWeightedErrors(0.49)).toBe(
      "The points scatter less than their stated uncertainties allow (√(χ²/dof) = 0.49); the standard errors still use the uncertainties as stated.",
    );
    // A factor just above 1 is never written as a bare "1".
    expect(describeWeightedErrors(1.0004)).toContain("(√(χ²/dof) = 1.00); the standard errors are enlarged");
    expect(describeWeightedErrors(1.032)).toContain("(√(χ²/dof) = 1.03); the standard errors are enlarged");
    expect(describeWeightedErrors(0.899)).toContain("(√(χ²/dof) = 0.899); the standard errors still use");
    expect(describeWeightedErrors(null)).toBeNull();
  });
});
