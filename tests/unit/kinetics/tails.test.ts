/**
 * Exactness of the engine where doubles are hard: Student-t quantiles, upper-tail probabilities,
 * confidence limits in narrow windows, externally studentized residuals, extreme inputs.
 * Reference values: tests/fixtures/tails/reference.json, computed once with mpmath 1.3.0 at
 * 60 digits from the exact binary64 inputs it lists (its `source` field names every call).
 */
import { describe, expect, it } from "vitest";
import reference from "@/tests/fixtures/tails/reference.json";
import { analyseDataset } from "@/lib/kinetics/analyse-dataset";
import { AnalysisError } from "@/lib/kinetics/analysis-error";
import { bonferroniStudentT, quantileStudentT, survivalChiSquare, survivalF, t95 } from "@/lib/kinetics/distributions";
import { UnitError, convertEnergy, convertRateConstant, displayConversion, toPascal } from "@/lib/kinetics/units";
import { runAnalysisOrThrow } from "@/lib/analyses/analyse-request";
import { EXAMPLE_DEPOSIT } from "@/lib/deposits/example";
import type { DepositDocument } from "@/lib/deposits/types";
import { validateDeposit } from "@/lib/deposits/validate";
import { AppError } from "@/lib/errors";

function relErr(value: number | null | undefined, exact: string | number): number {
  const x = Number(exact);
  if (value === null || value === undefined || !Number.isFinite(value)) return Infinity;
  return Math.abs(value - x) / Math.abs(x);
}

describe("Student-t quantiles (reference: mpmath 1.3, 60 digits)", () => {
  it(`every fixture case (${reference.quantiles.length} of them, dof 1 … 1e6, p from 1e-300 to 1 − 1e-5 and Bonferroni levels) within 1e-13 relative`, () => {
    const worst = reference.quantiles
      .map((q) => ({ ...q, err: relErr(quantileStudentT(q.p, q.dof), q.t) }))
      .sort((a, b) => b.err - a.err)[0];
    expect(worst.err, `p = ${worst.p}, dof = ${worst.dof}`).toBeLessThan(1e-13);
  });
  it.each([
    [0.975, 903],
    [0.975, 19998],
    [0.975, 1],
    [0.975, 2],
    [0.975, 3],
    [0.975, 10],
    [0.975, 1000000],
    [1 - 1e-10, 8],
    [1 - 1e-10, 1000000],
  ])("t_{%d, %i} within 1e-14 relative", (p, dof) => {
    const ref = reference.quantiles.find((q) => q.p === p && q.dof === dof);
    expect(ref).toBeDefined();
    expect(relErr(quantileStudentT(p, dof), ref!.t)).toBeLessThan(1e-14);
  });
  it("t95 and the Bonferroni bound use the same exact quantile", () => {
    const ref = reference.quantiles.find((q) => q.p === 0.975 && q.dof === 19998)!;
    expect(relErr(t95(19998), ref.t)).toBeLessThan(1e-14);
    const bonf = reference.quantiles.find((q) => q.bonferroniN === 50 && q.dof === 7)!;
    expect(relErr(bonferroniStudentT(0.05, 50, 7), bonf.t)).toBeLessThan(1e-13);
  });
  it("is antisymmetric and 0 at the median", () => {
    expect(quantileStudentT(0.5, 4)).toBe(0);
    // 0.25 and 0.75 are each exact, so the two calls see the same tail.
    expect(quantileStudentT(0.25, 12)).toBe(-quantileStudentT(0.75, 12));
  });
});

describe("upper-tail probabilities computed directly (reference: mpmath 1.3 betainc / gammainc)", () => {
  it(`F survival, ${reference.fSurvival.length} cases down to 1e-300, within 1e-12 relative`, () => {
    for (const c of reference.fSurvival) expect(relErr(survivalF(c.f, c.d1, c.d2), c.p), `F = ${c.f}, d2 = ${c.d2}`).toBeLessThan(1e-12);
    expect(Math.min(...reference.fSurvival.map((c) => Number(c.p)))).toBeLessThan(1e-200);
  });
  it(`chi-square survival, ${reference.chiSquareSurvival.length} cases down to 1e-300, within 1e-12 relative`, () => {
    for (const c of reference.chiSquareSurvival)
      expect(relErr(survivalChiSquare(c.x, c.dof), c.p), `x = ${c.x}, dof = ${c.dof}`).toBeLessThan(1e-12);
    expect(Math.min(...reference.chiSquareSurvival.map((c) => Number(c.p)))).toBeLessThan(1e-250);
  });
});

type Pt = { T: number; k: number; sigmaLnK?: number };

describe("confidence band and k(298) limits in narrow windows (reference: mpmath 1.3 at 60 digits, same formula)", () => {
  it.each(reference.windows.map((w) => [w.width, w] as const))("window of %d K around 298.15 K, dof = 8", (_width, w) => {
    const r = analyseDataset({ order: 2, points: w.points as Pt[] });
    expect(r.arrhenius.dof).toBe(8);
    const k = r.arrhenius.k298;
    expect(relErr(k.lower, w.reference.k298.lower)).toBeLessThan(1e-12);
    expect(relErr(k.upper, w.reference.k298.upper)).toBeLessThan(1e-12);
    expect(relErr(Math.log(k.value!), w.reference.k298.lnk)).toBeLessThan(1e-14);
    const { band } = r;
    expect(band.model).toBe("arrhenius");
    const last = band.T.length - 1;
    expect(band.T[0]).toBe(w.reference.Tmin.T);
    expect(band.T[last]).toBe(w.reference.Tmax.T);
    expect(relErr(band.upper![0] - band.lnk[0], w.reference.Tmin.halfWidth)).toBeLessThan(1e-11);
    expect(relErr(band.upper![last] - band.lnk[last], w.reference.Tmax.halfWidth)).toBeLessThan(1e-11);
    expect(relErr(band.lnk[0], w.reference.Tmin.lnk)).toBeLessThan(1e-14);
    expect(band.lower!.every((lo, i) => lo < band.lnk[i] && band.upper![i] > band.lnk[i])).toBe(true);
  });
});

describe("externally studentized residuals (reference: mpmath 1.3, refit without each point at 60 digits)", () => {
  it("one point holding almost all the RSS: every residual matches the brute-force refit", () => {
    const r = analyseDataset({ order: 2, points: reference.dominated.points as Pt[] });
    // The floor is the rounding of ln k itself (1 ulp of |ln k| ≈ 31 against a scatter of 1e-7).
    r.diagnostics!.externallyStudentized.forEach((t, i) =>
      expect(relErr(t, reference.dominated.externallyStudentized[i]), `point ${i + 1}`).toBeLessThan(1e-8),
    );
    expect(r.flags.find((f) => f.code === "outlier")?.points).toEqual([3]);
  });
  it("an ordinary 1 %-scatter set within 1e-11", () => {
    const r = analyseDataset({ order: 2, points: reference.moderate.points as Pt[] });
    r.diagnostics!.externallyStudentized.forEach((t, i) =>
      expect(relErr(t, reference.moderate.externallyStudentized[i]), `point ${i + 1}`).toBeLessThan(1e-11),
    );
  });
});

describe("curvature p-value in the far tail (reference: mpmath 1.3)", () => {
  it("20 strongly curved points give the true p ≈ 3.2e-35, not 0", () => {
    const r = analyseDataset({ order: 2, points: reference.curved.points as Pt[] });
    expect(relErr(r.curvature!.F, reference.curved.reference.F)).toBeLessThan(1e-10);
    expect(relErr(r.curvature!.p, reference.curved.reference.p)).toBeLessThan(1e-9);
    expect(r.curvature!.p).toBeGreaterThan(0);
  });
});

describe("extreme but valid inputs", () => {
  const base = reference.moderate.points as Pt[];
  const unweighted = analyseDataset({ order: 2, points: base });
  it("σ(ln k) = 1e-155 (1/σ² overflows a double) is fitted after an exact rescaling: same fit, absolute χ²", () => {
    const r = analyseDataset({ order: 2, points: base.map((p) => ({ ...p, sigmaLnK: 1e-155 })) });
    expect(r.arrhenius.params.Ea).toBe(unweighted.arrhenius.params.Ea);
    expect(r.arrhenius.se.Ea).toBeCloseTo(unweighted.arrhenius.se.Ea!, 6);
    // χ² with the stated σ: the unweighted RSS over σ², by construction.
    expect(relErr(r.arrhenius.rss, unweighted.arrhenius.rss / 1e-310)).toBeLessThan(1e-12);
    expect(relErr(r.arrhenius.chi2Reduced!, unweighted.arrhenius.rss / 1e-310 / 8)).toBeLessThan(1e-12);
    expect(relErr(r.arrhenius.residualSD!, unweighted.arrhenius.residualSD! / 1e-155)).toBeLessThan(1e-12);
    // Equal weights are relative precisions: the likelihood, and so AICc, is that of the unweighted fit.
    expect(r.arrhenius.aicc).toBeCloseTo(unweighted.arrhenius.aicc!, 8);
    expect(r.flags.map((f) => f.code)).toContain("excess_scatter");
  });
  it("σ(ln k) = 1e-200 is refused as weights out of range, not as close temperatures", () => {
    const run = () => analyseDataset({ order: 2, points: base.map((p) => ({ ...p, sigmaLnK: 1e-200 })) });
    expect(run).toThrow(AnalysisError);
    expect(run).toThrow(/sigmaLnK/);
    expect(run).not.toThrow(/temperatures/);
  });
  it("σ spanning more than 1e140 between points is refused, naming both points", () => {
    const pts = base.map((p, i) => ({ ...p, sigmaLnK: i === 2 ? 1e-150 : 1 }));
    expect(() => analyseDataset({ order: 2, points: pts })).toThrow(/sigmaLnK = 1e-150 at point 3/);
  });
  it("σ = 1e-320 (1/σ overflows) is refused at its point", () => {
    const pts = base.map((p, i) => ({ ...p, sigmaLnK: i === 4 ? 1e-320 : 0.05 }));
    try {
      analyseDataset({ order: 2, points: pts });
      expect.unreachable();
    } catch (e) {
      expect(e).toBeInstanceOf(AnalysisError);
      expect((e as AnalysisError).code).toBe("weights_out_of_range");
      expect((e as AnalysisError).pointIndex).toBe(4);
    }
  });
  it("T = 1e-310 K is refused at its point with the real reason", () => {
    const pts = base.map((p, i) => (i === 0 ? { ...p, T: 1e-310 } : p));
    expect(() => analyseDataset({ order: 2, points: pts })).toThrow(
      /Point 1 \(points\[0\]\) has temperature T = 1e-310 K, too small to fit/,
    );
  });
  it("temperatures 1 ulp apart still fit (the columns are formed as exact differences)", () => {
    const T0 = 300;
    const T1 = 300 + 2 ** -44; // 5.7e-14 K
    const r = analyseDataset({
      order: 1,
      points: [
        { T: T0, k: 1 },
        { T: T1, k: 1.01 },
        { T: T0, k: 1.02 },
      ],
    });
    expect(Number.isFinite(r.arrhenius.params.Ea)).toBe(true);
    expect(r.modifiedArrhenius).toBeNull();
  });
});

describe("modified Arrhenius fit in a window where ln T and 1/T are collinear to rounding", () => {
  it("1 µK window: not determinable (null, with a flag saying why), Arrhenius fit and band still given", () => {
    const w = reference.windows.find((x) => x.width === 1e-6)!;
    const r = analyseDataset({ order: 2, points: w.points as Pt[] });
    expect(r.modifiedArrhenius).toBeNull();
    expect(r.curvature).toBeNull();
    const flag = r.flags.find((f) => f.code === "modified_fit_undetermined");
    expect(flag?.message).toMatch(/ln T and 1\/T are proportional/);
    expect(r.band.model).toBe("arrhenius");
  });
  it("a 0.1 K window is not refused for collinearity (columns distinct to 5e-5), but 1 % scatter leaves n undetermined", () => {
    const w = reference.windows.find((x) => x.width === 0.1)!;
    const r = analyseDataset({ order: 2, points: w.points as Pt[] });
    expect(r.modifiedArrhenius).toBeNull();
    const flag = r.flags.find((f) => f.code === "modified_fit_undetermined")!;
    expect(flag.quantities!.sine).toBeUndefined();
    expect(flag.quantities!.seN.value).toBeGreaterThan(5);
    expect(flag.message).toMatch(/standard error of .* above 5, so the data do not fix n/);
    expect(flag.message).not.toMatch(/proportional/);
  });
});

describe("unit conversions that leave the range of a double", () => {
  it("1e300 cm³ molecule⁻¹ s⁻¹ to cm³ mol⁻¹ s⁻¹ (×N_A) throws a UnitError, never Infinity", () => {
    expect(() => convertRateConstant(1e300, "cm3 molecule-1 s-1", "cm3 mol-1 s-1")).toThrow(UnitError);
    try {
      convertRateConstant(1e300, "cm3 molecule-1 s-1", "cm3 mol-1 s-1");
    } catch (e) {
      expect((e as UnitError).code).toBe("out_of_range");
      expect((e as UnitError).message).toMatch(/1e\+300 cm³ molecule⁻¹ s⁻¹ is beyond 1.8e308/);
    }
    // Values near the edge that still fit convert as before: 1e284 × 6.022e23 = 6.022e307.
    expect(convertRateConstant(1e284, "cm3 molecule-1 s-1", "cm3 mol-1 s-1")).toBeCloseTo(6.02214076e307, -300);
  });
  it("underflow (1e-300 cm³ mol⁻¹ s⁻¹ to molecule units) and energies and pressures are refused the same way", () => {
    expect(() => convertRateConstant(1e-300, "cm3 mol-1 s-1", "cm3 molecule-1 s-1")).toThrow(/below 2.2e-308/);
    expect(() => convertEnergy(1e307, "kcal/mol", "J mol-1")).toThrow(UnitError);
    expect(() => toPascal(1e305, "atm")).toThrow(UnitError);
    expect(convertEnergy(0, "kcal/mol", "J mol-1")).toBe(0);
  });
  it("tables show a value they cannot convert as NaN (printed as —) instead of failing", () => {
    expect(displayConversion(() => convertRateConstant(1e300, "cm3 molecule-1 s-1", "cm3 mol-1 s-1"))).toBeNaN();
    expect(displayConversion(() => convertRateConstant(1, "cm3 molecule-1 s-1", "cm3 mol-1 s-1"))).toBe(6.02214076e23);
    expect(() => displayConversion(() => convertRateConstant(1, "furlongs", "cm3 mol-1 s-1"))).toThrow(/Unknown/);
  });
  it("the analysis request answers 422 with the point's pointer", () => {
    try {
      runAnalysisOrThrow({
        order: 2,
        units: { k: "m3 molecule-1 s-1" },
        points: [
          { T: 300, k: 1e305 },
          { T: 400, k: 1e-20 },
        ],
      } as never);
      expect.unreachable();
    } catch (e) {
      expect(e).toBeInstanceOf(AppError);
      expect((e as AppError).status).toBe(422);
      expect((e as AppError).errors[0].pointer).toBe("/points/0/k");
    }
  });
  it("a deposit is refused with the pointer of the rate constant (and of the reported A)", () => {
    const doc = structuredClone(EXAMPLE_DEPOSIT) as DepositDocument;
    doc.units.k = "m3 molecule-1 s-1";
    doc.points[1].k = 1e305;
    const result = validateDeposit(doc);
    expect(result.ok).toBe(false);
    const errors = result.ok ? [] : result.errors;
    // The schema bounds a point's k at 1e100 before any conversion could overflow.
    expect(errors.find((e) => e.pointer === "/points/1/k")?.message).toMatch(/at most 1e\+100/);
  });
});
