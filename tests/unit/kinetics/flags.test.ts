import { describe, expect, it } from "vitest";
import fMedians from "@/tests/fixtures/f-median-scipy.json";
import {
  AnalysisError,
  analyseDataset,
  cooksDistanceBound,
  extrapolationOf,
  formatFlagMessage,
  formatP,
  GAS_CONSTANT,
  type AnalysisInput,
  type Flag,
  type RatePoint,
} from "@/lib/kinetics";
import { bonferroniStudentT, quantileStudentT, t95 } from "@/lib/kinetics/distributions";
import { formatNumber } from "@/lib/kinetics/flag-text";

/*
 * Constructed data whose answers are known by construction: ln k = ln A − Ea/(RT) + eᵢ with the
 * pattern e orthogonal to the columns [1, 1/T] of the Arrhenius design, so the fit recovers the
 * line exactly and its residuals are exactly e. Leverage, residual variance, studentized residuals
 * and Cook's distances then follow from the textbook formulas in a few lines (Cook & Weisberg 1982).
 */
const LN_A = Math.log(2.45e-12);
const EA = 14757.67;

/** n temperatures evenly spaced in 1/T from T1 to T2. */
function evenInInverseT(n: number, T1: number, T2: number): number[] {
  return Array.from({ length: n }, (_, i) => 1 / (1 / T1 - (i / (n - 1)) * (1 / T1 - 1 / T2)));
}

/** The part of v that no straight line in 1/T absorbs: v minus its least-squares projection on [1, 1/T]. */
function residualPattern(v: number[], T: number[]): number[] {
  const n = v.length;
  const x = T.map((t) => 1 / t);
  const xb = x.reduce((a, b) => a + b) / n;
  const vb = v.reduce((a, b) => a + b) / n;
  const sxx = x.reduce((a, xi) => a + (xi - xb) ** 2, 0);
  const b = x.reduce((a, xi, i) => a + (xi - xb) * (v[i] - vb), 0) / sxx;
  return v.map((vi, i) => vi - vb - b * (x[i] - xb));
}

function pointsOf(T: number[], e: number[], sigma?: number): RatePoint[] {
  return T.map((t, i) => {
    const k = Math.exp(LN_A - EA / (GAS_CONSTANT * t) + e[i]);
    return sigma === undefined ? { T: t, k } : { T: t, k, sigmaLnK: sigma };
  });
}

/** Unweighted simple-regression diagnostics by hand (Cook & Weisberg 1982, §2.2, §3.2). */
function handDiagnostics(T: number[], e: number[]) {
  const n = T.length;
  const x = T.map((t) => 1 / t);
  const xb = x.reduce((a, b) => a + b) / n;
  const sxx = x.reduce((a, xi) => a + (xi - xb) ** 2, 0);
  const h = x.map((xi) => 1 / n + (xi - xb) ** 2 / sxx);
  const s2 = e.reduce((a, ei) => a + ei * ei, 0) / (n - 2);
  const r = e.map((ei, i) => ei / Math.sqrt(s2 * (1 - h[i])));
  const D = r.map((ri, i) => (ri * ri * h[i]) / (2 * (1 - h[i])));
  const t = r.map((ri) => ri * Math.sqrt((n - 3) / (n - 2 - ri * ri)));
  return { h, s2, r, D, t };
}

const flagOf = (r: ReturnType<typeof analyseDataset>, code: Flag["code"]) => r.flags.find((f) => f.code === code);

describe("outliers", () => {
  const spike = (n: number) => {
    const v = Array.from({ length: n }, (_, i) => 0.01 * Math.sin(3.1 * i + 0.4));
    v[2] += 0.8;
    return v;
  };

  it("with 5 points (n − p − 1 = 2) no point is tested, and one message says so", () => {
    const T = evenInInverseT(5, 250, 400);
    const r = analyseDataset({ points: pointsOf(T, residualPattern(spike(5), T)), order: 2 });
    expect(flagOf(r, "outlier")).toBeUndefined();
    const info = r.flags.filter((f) => f.code === "too_few_points");
    expect(info).toHaveLength(1);
    expect(info[0].severity).toBe("info");
    expect(info[0].message).toBe("Some checks were skipped: too few points to test for outliers (the test needs at least 6; there are 5).");
    // No bound such as ±50 appears anywhere.
    for (const f of r.flags) expect(f.message).not.toMatch(/±\s*\d{2,}/);
  });

  it("with 6 points (n − p − 1 = 3) the spike is tested and found, at the Bonferroni bound", () => {
    const T = evenInInverseT(6, 250, 400);
    const e = residualPattern(spike(6), T);
    const r = analyseDataset({ points: pointsOf(T, e), order: 2 });
    const hand = handDiagnostics(T, e);
    const bound = bonferroniStudentT(0.05, 6, 3);
    expect(r.diagnostics!.externallyStudentized[2] / hand.t[2]).toBeCloseTo(1, 6);
    expect(Math.abs(hand.t[2])).toBeGreaterThan(bound);
    hand.t.forEach((t, i) => i !== 2 && expect(Math.abs(t)).toBeLessThan(bound));
    const flag = flagOf(r, "outlier")!;
    expect(flag.points).toEqual([2]);
    expect(flag.message).toContain(`±${bound.toFixed(2)}`);
    expect(flag.message).toContain("3 dof");
    expect(flagOf(r, "too_few_points")).toBeUndefined();
  });

  it("a point nearer the fit than its stated uncertainty is never an outlier", () => {
    const T = evenInInverseT(8, 250, 400);
    const e = residualPattern(spike(8), T);
    expect(Math.abs(e[2])).toBeGreaterThan(0.5);
    expect(Math.abs(e[2])).toBeLessThan(1);
    // Equal σ: the same fit and the same diagnostics as unweighted, only σ differs.
    const wide = analyseDataset({ points: pointsOf(T, e, 1), order: 2 });
    expect(Math.abs(wide.diagnostics!.externallyStudentized[2])).toBeGreaterThan(bonferroniStudentT(0.05, 8, 5));
    expect(flagOf(wide, "outlier")).toBeUndefined();
    const tight = analyseDataset({ points: pointsOf(T, e, 0.1), order: 2 });
    expect(flagOf(tight, "outlier")?.points).toEqual([2]);
  });
});

describe("influence", () => {
  it.each(fMedians.cases)("the bound is the median of F($d1, $d2) (scipy)", ({ d1, d2, median }) => {
    // Source: tests/fixtures/f-median-scipy.json, scipy 1.17.1 scipy.stats.f.ppf(0.5, d1, d2).
    const got = cooksDistanceBound(d1, d1 + d2);
    expect(Math.abs(got - median) / median).toBeLessThan(d1 === 2 ? 1e-14 : 1e-6);
  });

  const T = evenInInverseT(10, 250, 400);
  const withEnd = (a: number) => residualPattern([0.03, -0.04, 0.05, -0.02, 0.01, -0.05, 0.04, -0.03, 0.02, a], T);

  it("an end point with an ordinary residual is not reported, though its Cook's distance passes 4/n and the median of F", () => {
    const e = withEnd(0.1);
    const hand = handDiagnostics(T, e);
    const bound = cooksDistanceBound(2, 10);
    expect(bound).toBeCloseTo(4 * (2 ** 0.25 - 1), 14); // median of F(2, 8), closed form
    expect(hand.D[9]).toBeGreaterThan(4 / 10);
    expect(hand.D[9]).toBeGreaterThan(bound);
    expect(Math.abs(hand.t[9])).toBeLessThan(quantileStudentT(0.975, 7));
    const r = analyseDataset({ points: pointsOf(T, e), order: 2 });
    r.diagnostics!.cooksDistance.forEach((D, i) => expect(D).toBeCloseTo(hand.D[i], 9));
    expect(flagOf(r, "influential_point")).toBeUndefined();
  });

  it("an end point off the line of the others is reported, with the bound stated", () => {
    const e = withEnd(0.25);
    const hand = handDiagnostics(T, e);
    expect(hand.D[9]).toBeGreaterThan(cooksDistanceBound(2, 10));
    expect(Math.abs(hand.t[9])).toBeGreaterThan(quantileStudentT(0.975, 7));
    // Judged on the Arrhenius fit the analysis prefers: the same point 0.125 off gives no significant curvature.
    const mild = withEnd(0.125);
    const rMild = analyseDataset({ points: pointsOf(T, mild), order: 2 });
    expect(rMild.band.model).toBe("arrhenius");
    const flagMild = flagOf(rMild, "influential_point")!;
    const handMild = handDiagnostics(T, mild);
    expect(flagMild.points).toEqual([9]);
    expect(flagMild.severity).toBe("info");
    expect(flagMild.message).toContain("weighs heavily on the Arrhenius parameters");
    expect(flagMild.message).toContain("above 0.757, the median of F(2, 8)");
    expect(flagMild.message).toContain(`±${quantileStudentT(0.975, 7).toFixed(2)}`);
    expect(flagMild.message).toContain(`Cook's distance ${Number(handMild.D[9].toPrecision(3))}`);
    // 0.25 off, the end point bends the line enough for the curvature test: judged on the modified fit (p = 3).
    const r = analyseDataset({ points: pointsOf(T, e), order: 2 });
    expect(r.band.model).toBe("modified_arrhenius");
    const flag = flagOf(r, "influential_point")!;
    expect(flag.points).toEqual([9]);
    expect(flag.message).toContain("weighs heavily on the modified Arrhenius parameters");
    expect(flag.message).toContain(`above ${Number(cooksDistanceBound(3, 10).toPrecision(3))}, the median of F(3, 7)`);
    expect(flag.message).not.toMatch(/leverage|end point/i);
    // Within its stated uncertainty (σ = 0.5 > |e₉|), the same point is not reported.
    expect(flagOf(analyseDataset({ points: pointsOf(T, e, 0.5), order: 2 }), "influential_point")).toBeUndefined();
  });
});

describe("k(298.15 K) and k at mid-range", () => {
  it("data at 1000–2000 K: k298 is an extrapolation, 701.85 K below, 4.7 widths of the range in 1/T", () => {
    const T = evenInInverseT(8, 1000, 2000);
    const e = residualPattern([0.02, -0.01, 0.03, -0.02, 0, 0.01, -0.03, 0.01], T);
    const a = analyseDataset({ points: pointsOf(T, e), order: 2 }).arrhenius;
    expect(a.k298.extrapolated).toBe(true);
    expect(a.k298.extrapolation!.side).toBe("below");
    expect(a.k298.extrapolation!.kelvin).toBeCloseTo(701.85, 10);
    expect(a.k298.extrapolation!.inverseTWidths).toBeCloseTo((1 / 298.15 - 1 / 1000) / (1 / 1000 - 1 / 2000), 12);
    expect(a.k298.value! / Math.exp(LN_A - EA / (GAS_CONSTANT * 298.15))).toBeCloseTo(1, 9);
  });

  it("kMid sits at the middle of the range in 1/T, where (evenly spaced, unweighted) se(ln k) = s/√n", () => {
    const T = evenInInverseT(8, 1000, 2000);
    const e = residualPattern([0.02, -0.01, 0.03, -0.02, 0, 0.01, -0.03, 0.01], T);
    const { arrhenius: a, band } = analyseDataset({ points: pointsOf(T, e), order: 2 });
    const Tmid = 2 / (1 / 1000 + 1 / 2000);
    expect(a.kMid.T).toBeCloseTo(Tmid, 10);
    expect(Math.log(a.kMid.value!)).toBeCloseTo(LN_A - EA / (GAS_CONSTANT * Tmid), 10);
    const s = Math.sqrt(e.reduce((acc, ei) => acc + ei * ei, 0) / 6);
    expect(Math.log(a.kMid.upper! / a.kMid.value!)).toBeCloseTo((t95(6) * s) / Math.sqrt(8), 12);
    expect(Math.log(a.kMid.value! / a.kMid.lower!)).toBeCloseTo((t95(6) * s) / Math.sqrt(8), 12);
    // The narrowest point of the band: every band half-width is at least kMid's.
    const halfMid = Math.log(a.kMid.upper! / a.kMid.value!);
    band.upper!.forEach((u, i) => expect(u - band.lnk[i]).toBeGreaterThanOrEqual(halfMid * (1 - 1e-12)));
  });

  it("kMid agrees with the covariance formula on a weighted fit with unequal σ", () => {
    const T = evenInInverseT(7, 290, 800);
    const points = pointsOf(T, residualPattern([0.05, -0.02, 0.04, -0.06, 0.01, 0.03, -0.02], T)).map((p, i) => ({
      ...p,
      sigmaLnK: 0.02 + 0.01 * i,
    }));
    const a = analyseDataset({ points, order: 2 }).arrhenius;
    const x = -1 / (GAS_CONSTANT * a.kMid.T);
    const c = a.covariance!;
    const half = t95(a.dof) * Math.sqrt(c[0][0] + 2 * x * c[0][1] + x * x * c[1][1]);
    expect(Math.log(a.kMid.upper! / a.kMid.value!) / half).toBeCloseTo(1, 8);
    expect(a.k298.extrapolated).toBe(false);
    expect(a.k298.extrapolation).toBeNull();
  });

  it("data at 200–290 K: 8.15 K above; data spanning 298.15 K: no extrapolation", () => {
    const x = extrapolationOf(298.15, 200, 290);
    expect(x).toMatchObject({ extrapolated: true, extrapolation: { side: "above", kelvin: 298.15 - 290 } });
    // (1/290 − 1/298.15)/(1/200 − 1/290) by mpmath 1.3 at 40 digits: 0.0607449643169916550890…
    expect(Math.abs(x.extrapolation!.inverseTWidths / 0.06074496431699165509 - 1)).toBeLessThan(1e-15);
    expect(extrapolationOf(298.15, 298.15, 400)).toEqual({ extrapolated: false, extrapolation: null });
    const T = evenInInverseT(6, 200, 290);
    const a = analyseDataset({ points: pointsOf(T, residualPattern([0.01, -0.02, 0.02, 0, -0.01, 0.01], T)), order: 2 }).arrhenius;
    expect(a.k298.extrapolation!.side).toBe("above");
    expect(a.k298.extrapolation!.kelvin).toBeCloseTo(8.15, 10);
  });
});

describe("reported expression against the refit", () => {
  // The data follow E1; E2 has Ea 1 kJ mol⁻¹ higher and meets E1 at 260 K, so the two agree near
  // 250–270 K (≤ 1.9 % apart) and part by a factor 1.18 at 400 K.
  const T = evenInInverseT(10, 250, 400);
  const e = residualPattern([0.03, -0.02, 0.01, -0.03, 0.02, 0.0, -0.01, 0.02, -0.02, 0.01], T);
  const points = pointsOf(T, e);
  const E2 = { A: Math.exp(LN_A + 1000 / (GAS_CONSTANT * 260)), Ea: EA + 1000 };
  const codes = (input: Partial<AnalysisInput>) => analyseDataset({ points, order: 2, ...input }).flags.map((f) => f.code);

  it("is compared over the whole data when no range is stated, and over the overlap when one is", () => {
    expect(codes({ reportedFit: E2 })).toContain("reported_fit_disagrees");
    expect(codes({ reportedFit: { ...E2, Tmin: 250, Tmax: 270 } })).not.toContain("reported_fit_disagrees");
    expect(codes({ reportedFit: { ...E2, Tmin: 200, Tmax: 270 } })).not.toContain("reported_fit_disagrees");
    const r = analyseDataset({ points, order: 2, reportedFit: { ...E2, Tmin: 250, Tmax: 330 } });
    const flag = flagOf(r, "reported_fit_disagrees")!;
    expect(flag.message).toContain("Compared only over 250–330 K, where the stated range of the expression (250–330 K) overlaps the data.");
    expect(flag.message).toMatch(/\(higher\) at 330 K/);
    // A stated range that covers the data changes nothing.
    const full = analyseDataset({ points, order: 2, reportedFit: { ...E2, Tmin: 200, Tmax: 500 } });
    expect(flagOf(full, "reported_fit_disagrees")!.message).toBe(
      flagOf(analyseDataset({ points, order: 2, reportedFit: E2 }), "reported_fit_disagrees")!.message,
    );
  });

  it("a stated range that misses the data is its own finding, naming the likely unit mistake", () => {
    const r = analyseDataset({ points, order: 2, reportedFit: { ...E2, Tmin: 520, Tmax: 670 } });
    expect(r.flags.map((f) => f.code)).not.toContain("reported_fit_disagrees");
    const flag = flagOf(r, "reported_range_outside_data")!;
    expect(flag.severity).toBe("warn");
    expect(flag.message).toBe(
      "The stated range of the reported expression (520–670 K) does not overlap the measured temperatures (250–400 K), so the expression cannot be compared with the data. This usually means the range was entered in the wrong unit (for example °C, or 1000/T, instead of K).",
    );
    const lowOnly = analyseDataset({ points, order: 2, reportedFit: { ...E2, Tmin: 500 } });
    expect(flagOf(lowOnly, "reported_range_outside_data")!.message).toContain("(from 500 K)");
    // In °C the same finding reads in °C.
    expect(formatFlagMessage(flag, { temperature: "degC" })).toContain(
      "(246.9–396.9 °C) does not overlap the measured temperatures (\u221223.2 to 126.9 °C)",
    );
  });

  it.each([
    [{ Tmin: 400, Tmax: 300 }, /highest temperature must be above its lowest/],
    [{ Tmin: 0 }, /Tmin = 0; Tmin must be a positive temperature in kelvin/],
    [{ Tmax: Number.NaN }, /Tmax = NaN/],
  ])("refuses a stated range %o", (range, message) => {
    let caught: unknown;
    try {
      analyseDataset({ points, order: 2, reportedFit: { ...E2, ...range } });
    } catch (err) {
      caught = err;
    }
    expect(caught).toBeInstanceOf(AnalysisError);
    expect((caught as AnalysisError).code).toBe("invalid_reported_fit");
    expect((caught as AnalysisError).message).toMatch(message);
  });
});

describe("curvature of noise-free data", () => {
  // A modified Arrhenius expression sampled without noise (common practice: data constructed from a
  // known expression). In exact arithmetic the modified fit's RSS is 0 and F is not finite; in
  // doubles that RSS is rounding of ln k, and any F computed from it is a ratio of rounding errors.
  const T = evenInInverseT(20, 250, 1500);
  const r = analyseDataset({
    points: pointsOf(
      T,
      T.map((t) => 2.5 * Math.log(t / 298.15)),
    ),
    order: 2,
  });

  it("says the curvature is exact within the arithmetic instead of printing an F of rounding errors", () => {
    expect(r.curvature).toMatchObject({ exact: true, F: null, p: null, dfNum: 1, dfDenom: 17 });
    expect(r.diagnostics!.model).toBe("modified_arrhenius");
    const flag = flagOf(r, "curvature")!;
    expect(flag.message).toContain("exactly, within the arithmetic");
    expect(flag.message).toContain("p below any printable bound");
    expect(flag.message).not.toMatch(/F\(1/);
    expect(flag.quantities).not.toHaveProperty("F");
    expect(r.modifiedArrhenius!.params.n).toBeCloseTo(2.5, 9);
  });

  it("judges excess scatter on the preferred (modified) fit: a curved set within its stated σ is not told its uncertainties are too small", () => {
    // Curved data with small scatter well inside σ(ln k) = 0.05: the straight line misses the curve
    // by far more than 0.05, the modified fit does not (χ² test on the preferred model, common practice).
    const curved = analyseDataset({
      points: pointsOf(
        T,
        T.map((t, i) => 2.5 * Math.log(t / 298.15) + 0.01 * Math.sin(2.3 * i)),
        0.05,
      ),
      order: 2,
    });
    expect(curved.diagnostics!.model).toBe("modified_arrhenius");
    expect(flagOf(curved, "excess_scatter")).toBeUndefined();
    // The same curve with scatter beyond its stated σ is still flagged.
    const scattered = analyseDataset({
      points: pointsOf(
        T,
        T.map((t, i) => 2.5 * Math.log(t / 298.15) + 0.3 * Math.sin(2.3 * i)),
        0.05,
      ),
      order: 2,
    });
    expect(flagOf(scattered, "excess_scatter")).toBeDefined();
  });

  it("keeps the F-test for data with scatter, and for noise-free straight data finds no curvature", () => {
    const noisy = analyseDataset({
      points: pointsOf(
        T,
        T.map((t, i) => 2.5 * Math.log(t / 298.15) + 0.02 * Math.sin(2.3 * i)),
      ),
      order: 2,
    });
    expect(noisy.curvature!.exact).toBe(false);
    expect(noisy.curvature!.F).toBeGreaterThan(100);
    const straight = analyseDataset({
      points: pointsOf(
        T,
        T.map(() => 0),
      ),
      order: 2,
    });
    expect(straight.curvature!.exact).toBe(false);
    expect(flagOf(straight, "curvature")).toBeUndefined();
  });
});

describe("flag messages in the reader's units", () => {
  // A strongly curved set (modified Arrhenius, n = 2.5) with a point far off and a reported expression that disagrees.
  const curved = () => {
    const T = evenInInverseT(12, 300, 1950);
    const v = T.map((t, i) => 2.5 * Math.log(t / 298.15) + 0.02 * Math.sin(2.3 * i));
    return analyseDataset({ points: pointsOf(T, v), order: 2 });
  };

  it("energies follow the chosen unit, temperatures too", () => {
    const flag = flagOf(curved(), "curvature")!;
    const q = flag.quantities!;
    expect(q.eaLow.kind).toBe("energy");
    expect(q.tLow).toEqual({ kind: "temperature", value: 300 });
    const kcal = (j: number) => `${Number((j / 4184).toPrecision(4))} kcal mol⁻¹`;
    const inKcal = formatFlagMessage(flag, { energy: "kcal mol-1" });
    expect(inKcal).toContain(`${kcal(q.eaLow.value)} at 300 K`);
    expect(inKcal).toContain(`${kcal(q.eaHigh.value)} at 1950 K`);
    expect(inKcal).not.toContain("kJ");
    const inK = formatFlagMessage(flag, { energy: "K" });
    expect(inK).toContain(`${Number((q.eaLow.value / GAS_CONSTANT).toPrecision(4))} K (E/R) at 300 K`);
    expect(formatFlagMessage(flag, { temperature: "degC" })).toContain("at 26.85 °C");
    // The stored message is the same function in kJ mol⁻¹ and K.
    expect(flag.message).toBe(formatFlagMessage(flag, { energy: "kJ mol-1", temperature: "K" }));
  });

  it("every message is its quantities written in kJ mol⁻¹ and K, with p-values as p < 0.0001", () => {
    const T = evenInInverseT(10, 250, 400);
    const results = [
      curved(),
      analyseDataset({
        points: pointsOf(
          T,
          residualPattern(
            T.map((_, i) => (i === 4 ? 1 : 0.2 * Math.sin(i))),
            T,
          ),
          0.01,
        ),
        order: 2,
      }),
      analyseDataset({
        points: pointsOf(
          T,
          T.map(() => 0),
        ).map((p, i) => ({ ...p, T: 300 + i })),
        order: 2,
      }),
      analyseDataset({ points: pointsOf([250, 300, 350], [0, 0, 0]).map((p) => ({ ...p, k: 1e-12 * (300 / p.T) })), order: 2 }),
      analyseDataset({
        points: [
          ...pointsOf(
            T,
            T.map(() => 0),
          ).slice(0, 5),
          { T: 500, k: 1e-12, sigmaLnK: 0.1 },
        ],
        order: 2,
      }),
      analyseDataset({
        points: pointsOf(
          T,
          T.map(() => 0),
        ),
        order: 2,
        reportedFit: { A: 1e-11, Ea: EA },
      }),
      analyseDataset({
        points: pointsOf(
          T,
          T.map(() => 0),
        ),
        order: 2,
        reportedFit: { A: 1e-11, Ea: EA, Tmin: 600, Tmax: 700 },
      }),
    ];
    const seen = new Set<string>();
    for (const r of results) {
      for (const f of r.flags) {
        seen.add(f.code);
        expect(f.quantities, f.code).toBeDefined();
        expect(f.message.length, f.code).toBeGreaterThan(20);
        expect(f.message).toBe(formatFlagMessage(f));
        expect(f.message).not.toMatch(/= <|NaN|undefined|Infinity/);
      }
    }
    expect([...seen].sort()).toEqual(
      [
        "curvature",
        "excess_scatter",
        "influential_point",
        "modified_fit_undetermined",
        "reported_fit_disagrees",
        "reported_range_outside_data",
        "narrow_range",
        "negative_activation_energy",
        "outlier",
        "too_few_points",
        "uncertainties_ignored",
      ].sort(),
    );
    expect(flagOf(curved(), "curvature")!.message).toMatch(/\(F\(1, 9\) = \d+, p < 0\.0001\)/);
  });

  it("formatNumber gives what toPrecision gives, without trailing zeros", () => {
    // Reference: ECMAScript Number.prototype.toPrecision (V8), on deterministic values over the whole range.
    let seed = 7;
    const next = () => (seed = (seed * 16807) % 2147483647) / 2147483647;
    for (let i = 0; i < 20000; i++) {
      const x = (next() < 0.5 ? -1 : 1) * 10 ** (-3 + 9 * next());
      for (const digits of [2, 3, 4]) {
        const a = Math.abs(x);
        const ref = a >= 1e5 || a < 1e-2 ? x.toExponential(digits - 2) : String(Number(x.toPrecision(digits)));
        expect(formatNumber(x, digits), `${x} to ${digits}`).toBe(ref);
      }
    }
    expect([0, 14757.67, 999.96, 0.0123456, -12.125, 300].map((x) => formatNumber(x))).toEqual([
      "0",
      "14760",
      "1000",
      "0.01235",
      "-12.13",
      "300",
    ]);
  });

  it("formatP writes p = 0.012 or p < 0.0001", () => {
    expect(formatP(0.0123)).toBe("p = 0.012");
    expect(formatP(1e-5)).toBe("p < 0.0001");
    expect(formatP(0.0001)).toBe("p = 0.00010");
  });

  it("a flag stored without quantities keeps its words, without the old 'p = <'", () => {
    const old: Flag = { code: "curvature", severity: "warn", message: "The Arrhenius plot is curved (F = 12, p = < 0.0001): …" };
    expect(formatFlagMessage(old, { energy: "kcal mol-1" })).toBe("The Arrhenius plot is curved (F = 12, p < 0.0001): …");
    const flag = flagOf(curved(), "curvature")!;
    expect(formatFlagMessage(flag, { energy: "no such unit" })).toBe(flag.message);
  });
});

describe("result fields", () => {
  const T = evenInInverseT(9, 250, 450);
  const e = residualPattern([0.04, -0.03, 0.02, 0.05, -0.06, 0.01, 0.03, -0.02, -0.04], T);
  const ss = e.reduce((a, ei) => a + ei * ei, 0);

  it("weighted: scaleFactor = √(χ²/dof) in units of σ, residualSDLnK in ln k, residuals and fitted per point", () => {
    const sigma = 0.02;
    const r = analyseDataset({ points: pointsOf(T, e, sigma), order: 2 });
    const a = r.arrhenius;
    expect(a.scaleFactor!).toBeCloseTo(Math.sqrt(ss / sigma ** 2 / 7), 10);
    expect(a.scaleFactor!).toBeCloseTo(Math.sqrt(a.chi2Reduced!), 14);
    expect(a.residualSDLnK!).toBeCloseTo(Math.sqrt(ss / 7), 12);
    a.residuals.forEach((ri, i) => expect(ri).toBeCloseTo(e[i], 12));
    a.fitted.forEach((fi, i) => expect(fi).toBeCloseTo(LN_A - EA / (GAS_CONSTANT * T[i]), 10));
    const m = r.modifiedArrhenius!;
    expect(m.residuals).toHaveLength(9);
    m.residuals.forEach((ri, i) => expect(ri + m.fitted[i]).toBeCloseTo(Math.log(pointsOf(T, e)[i].k), 12));
    expect(m.scaleFactor!).toBeCloseTo(Math.sqrt(m.rss / 6), 12);
    expect(r.curvature!.dfNum).toBe(1);
    expect(r.curvature!.dfDenom).toBe(6);
  });

  it("unweighted: no scale factor; residualSDLnK is the residual SD; dof = 0 gives nulls", () => {
    const a = analyseDataset({ points: pointsOf(T, e), order: 2 }).arrhenius;
    expect(a.scaleFactor).toBeNull();
    expect(a.residualSDLnK!).toBeCloseTo(Math.sqrt(ss / 7), 12);
    expect(a.residualSDLnK).toBe(a.residualSD);
    const two = analyseDataset({ points: pointsOf([300, 400], [0, 0], 0.1), order: 2 }).arrhenius;
    expect(two.scaleFactor).toBeNull();
    expect(two.residualSDLnK).toBeNull();
    expect(two.kMid.lower).toBeNull();
    expect(two.kMid.value).not.toBeNull();
  });
});
