import { describe, expect, it } from "vitest";
import {
  AnalysisError,
  analyseDataset,
  AVOGADRO,
  BOLTZMANN,
  evaluateRateExpression,
  GAS_CONSTANT,
  PLANCK,
  type AnalysisInput,
  type RatePoint,
} from "@/lib/kinetics";
import { bonferroniStudentT } from "@/lib/kinetics/distributions";

/** Every number reachable from value is finite (no NaN, no ±Infinity); returns the count checked. */
function expectAllFinite(value: unknown, path = "result"): number {
  if (typeof value === "number") {
    expect(Number.isFinite(value), `${path} = ${value}`).toBe(true);
    return 1;
  }
  if (Array.isArray(value)) return value.reduce((n: number, v, i) => n + expectAllFinite(v, `${path}[${i}]`), 0);
  if (value && typeof value === "object") {
    return Object.entries(value).reduce((n: number, [k, v]) => n + expectAllFinite(v, `${path}.${k}`), 0);
  }
  return 0;
}

/** Deterministic noise in [−1, 1]. */
function noise(i: number): number {
  return Math.sin(12.9898 * (i + 1)) * 0.5 + Math.sin(78.233 * (i + 3)) * 0.5;
}

function arrheniusPoints(
  n: number,
  opts: { A?: number; Ea?: number; T1?: number; T2?: number; sd?: number; sigma?: number } = {},
): RatePoint[] {
  const { A = 2.45e-12, Ea = 14757.67, T1 = 220, T2 = 400, sd = 0.03, sigma } = opts;
  return Array.from({ length: n }, (_, i) => {
    const T = T1 + ((T2 - T1) * i) / (n - 1);
    const k = evaluateRateExpression({ A, Ea }, T) * Math.exp(sd * noise(i));
    return sigma === undefined ? { T, k } : { T, k, sigmaLnK: sigma };
  });
}

function expectAnalysisError(input: unknown, code: string, message: RegExp, pointIndex?: number) {
  let caught: unknown;
  try {
    analyseDataset(input as AnalysisInput);
  } catch (e) {
    caught = e;
  }
  expect(caught).toBeInstanceOf(AnalysisError);
  const err = caught as AnalysisError;
  expect(err.code).toBe(code);
  expect(err.message).toMatch(message);
  if (pointIndex !== undefined) expect(err.pointIndex).toBe(pointIndex);
}

describe("analyseDataset: degenerate input", () => {
  const good = arrheniusPoints(5);
  it.each([
    [{ points: [{ T: 300, k: 1e-12 }], order: 2 }, "too_few_points", /At least two points/],
    [{ points: [], order: 2 }, "too_few_points", /got 0/],
    [{ points: "x", order: 2 }, "invalid_input", /points must be an array/],
    [{ points: good, order: 4 }, "invalid_order", /Reaction order must be 1, 2 or 3 \(got 4\)/],
    [{ points: good, order: "2" }, "invalid_order", /got "2"/],
    [{ points: good, order: 2, T0: 0 }, "invalid_reference_temperature", /T0 must be a positive temperature/],
    [{ points: good, order: 2, reportedFit: { A: -1, Ea: 1000 } }, "invalid_reported_fit", /A = -1; A must be a positive/],
    [{ points: good, order: 2, reportedFit: { A: 1e-12, Ea: Number.NaN } }, "invalid_reported_fit", /Ea = NaN/],
  ])("%# rejects with %s", (input, code, message) => expectAnalysisError(input, code, message));

  it("names the temperature problem and the point", () => {
    const pts = good.map((p) => ({ ...p }));
    pts[2].T = -5;
    expectAnalysisError(
      { points: pts, order: 2 },
      "invalid_point",
      /Point 3 \(points\[2\]\) has temperature T = -5; temperatures must be positive finite numbers in kelvin/,
      2,
    );
    pts[2].T = Number.POSITIVE_INFINITY;
    expectAnalysisError({ points: pts, order: 2 }, "invalid_point", /T = Infinity/, 2);
  });
  it("names a non-positive or non-finite k", () => {
    const pts = good.map((p) => ({ ...p }));
    pts[4].k = 0;
    expectAnalysisError(
      { points: pts, order: 2 },
      "invalid_point",
      /Point 5 \(points\[4\]\) has rate constant k = 0; rate constants must be positive finite numbers/,
      4,
    );
    pts[4].k = Number.NaN;
    expectAnalysisError({ points: pts, order: 2 }, "invalid_point", /k = NaN/, 4);
    (pts[4] as { k: unknown }).k = undefined;
    expectAnalysisError({ points: pts, order: 2 }, "invalid_point", /k = missing/, 4);
  });
  it("names a bad sigmaLnK", () => {
    const pts: RatePoint[] = good.map((p) => ({ ...p, sigmaLnK: 0.1 }));
    pts[1].sigmaLnK = -0.1;
    expectAnalysisError({ points: pts, order: 2 }, "invalid_point", /Point 2 \(points\[1\]\) has uncertainty sigmaLnK = -0.1/, 1);
  });
  it("needs two different temperatures", () => {
    const pts = [300, 300, 300].map((T, i) => ({ T, k: 1e-12 * (1 + i / 10) }));
    expectAnalysisError({ points: pts, order: 2 }, "too_few_temperatures", /All 3 points are at the same temperature \(300 K\)/);
  });
});

describe("analyseDataset: edge cases never produce NaN", () => {
  const cases: [string, AnalysisInput][] = [
    ["2 points", { points: arrheniusPoints(2), order: 2 }],
    ["3 points", { points: arrheniusPoints(3), order: 2 }],
    ["4 points", { points: arrheniusPoints(4), order: 2 }],
    ["identical k", { points: [250, 300, 350, 400, 450].map((T) => ({ T, k: 3e-11 })), order: 2 }],
    ["weighted, dof 0", { points: arrheniusPoints(2, { sigma: 0.1 }), order: 2 }],
    ["weighted, 3 points (modified dof 0)", { points: arrheniusPoints(3, { sigma: 0.1 }), order: 3 }],
    ["noise-free, 10 points", { points: arrheniusPoints(10, { sd: 0 }), order: 2 }],
    [
      "two temperatures, repeats",
      { points: [300, 300, 400, 400].map((T, i) => ({ T, k: 1e-12 * (T / 300) ** 3 * (1 + 0.01 * i) })), order: 2 },
    ],
    ["a point with leverage 1", { points: [300, 300, 300, 400].map((T, i) => ({ T, k: 1e-3 * (1 + 0.05 * i) })), order: 1 }],
    [
      "huge A (k near overflow)",
      {
        points: [
          { T: 2000, k: 1e300 },
          { T: 2001, k: 1.1e300 },
          { T: 2002, k: 1.05e300 },
        ],
        order: 1,
      },
    ],
    ["tiny k", { points: arrheniusPoints(6, { A: 1e-300, Ea: 1000 }), order: 3 }],
  ];
  it.each(cases)("%s", (_, input) => {
    const r = analyseDataset(input);
    expect(expectAllFinite(r)).toBeGreaterThan(10);
    // JSON-safe: a round trip changes nothing (NaN and ±Infinity would turn into null).
    const json = JSON.stringify(r);
    expect(JSON.stringify(JSON.parse(json))).toBe(json);
    expect(r.band.T).toHaveLength(50);
  });

  it("dof = 0 gives null standard errors, limits and band, and too_few_points", () => {
    const r = analyseDataset({ points: arrheniusPoints(2), order: 2 });
    expect(r.arrhenius.dof).toBe(0);
    expect(r.arrhenius.se).toEqual({ lnA: null, Ea: null });
    expect(r.arrhenius.covariance).toBeNull();
    expect(r.arrhenius.aicc).toBeNull();
    expect(r.arrhenius.k298.lower).toBeNull();
    expect(r.band.lower).toBeNull();
    expect(r.modifiedArrhenius).toBeNull();
    expect(r.diagnostics).toBeNull();
    expect(r.curvature).toBeNull();
    expect(r.flags.find((f) => f.code === "too_few_points")?.message).toMatch(/need at least 4 points \(there are 2\)/);
  });

  it("identical k: R² is null, Ea is 0, no curvature", () => {
    const r = analyseDataset({ points: [250, 300, 350, 400, 450].map((T) => ({ T, k: 3e-11 })), order: 2 });
    expect(r.arrhenius.r2).toBeNull();
    expect(Math.abs(r.arrhenius.params.Ea)).toBeLessThan(1e-6);
    expect(r.curvature!.p).toBe(1);
  });

  it("a point with leverage 1 reports 0 for its undefined studentized residual", () => {
    const r = analyseDataset({ points: [300, 300, 300, 400].map((T, i) => ({ T, k: 1e-3 * (1 + 0.05 * i) })), order: 1 });
    expect(r.diagnostics!.leverage[3]).toBeCloseTo(1, 12);
    expect(r.diagnostics!.studentized[3]).toBe(0);
    expect(r.diagnostics!.cooksDistance[3]).toBe(0);
  });
});

describe("analyseDataset: fits and statistics", () => {
  it("follows the documented conventions on a weighted fit", () => {
    const points = arrheniusPoints(10, { sigma: 0.03 });
    const r = analyseDataset({ points, order: 2 });
    expect(r.weighted).toBe(true);
    const a = r.arrhenius;
    expect(a.dof).toBe(8);
    expect(a.residualSD!).toBeCloseTo(Math.sqrt(a.rss / 8), 14);
    expect(a.chi2Reduced!).toBeCloseTo(a.rss / 8, 14);
    expect(a.se.Ea!).toBeCloseTo(Math.sqrt(a.covariance![1][1]), 10);
    // AICc: −2 ln L + 2k + 2k(k+1)/(n−k−1), ln L at σ̂² = RSS/n with ½Σ ln w (Hurvich & Tsai 1989).
    const n = 10;
    const lnL = -0.5 * n * (Math.log((2 * Math.PI * a.rss) / n) + 1) + 0.5 * n * Math.log(1 / 0.03 ** 2);
    expect(a.aicc!).toBeCloseTo(-2 * lnL + 4 + 12 / 7, 9);
    // k(298.15) and its interval bracket the point estimate.
    expect(a.k298.lower!).toBeLessThan(a.k298.value!);
    expect(a.k298.upper!).toBeGreaterThan(a.k298.value!);
    expect(a.k298.value! / Math.exp(a.params.lnA - a.params.Ea / (GAS_CONSTANT * 298.15))).toBeCloseTo(1, 12);
    expect(r.band.lnk[0]).toBeCloseTo(a.params.lnA - a.params.Ea / (GAS_CONSTANT * 220), 10);
    expect(r.band.T[0]).toBe(220);
    expect(r.band.T[49]).toBe(400);
  });

  it("ignores partial uncertainties and says so", () => {
    const points: RatePoint[] = arrheniusPoints(6);
    points[0] = { ...points[0], sigmaLnK: 0.1 };
    const r = analyseDataset({ points, order: 2 });
    expect(r.weighted).toBe(false);
    expect(r.arrhenius.chi2Reduced).toBeUndefined();
    expect(r.flags.find((f) => f.code === "uncertainties_ignored")?.message).toBe(
      "Only 1 of 6 points state an uncertainty, so all fits are unweighted.",
    );
  });

  it("Eyring recovers ΔH‡ and ΔS‡ from exact transition-state data (orders 1 and 2)", () => {
    const dH = 80000;
    const dS = -20;
    const kB_h = BOLTZMANN / PLANCK;
    for (const order of [1, 2] as const) {
      // k_c = (k_B T/h) exp(ΔS/R) exp(−ΔH/RT) in (dm³ mol⁻¹)^(m−1) s⁻¹, then to molecule cm³ units.
      const toCanonical = (AVOGADRO * 1e-3) ** -(order - 1);
      const points = [300, 320, 340, 360, 380].map((T) => ({
        T,
        k: kB_h * T * Math.exp(dS / GAS_CONSTANT - dH / (GAS_CONSTANT * T)) * toCanonical,
      }));
      const r = analyseDataset({ points, order });
      expect(r.eyring!.params.dH).toBeCloseTo(dH, 5);
      expect(r.eyring!.params.dS).toBeCloseTo(dS, 8);
      expect(r.eyring!.convention).toMatch(order === 1 ? /no standard-state/ : /1 mol dm⁻³/);
    }
  });

  it("diagnostics match the textbook formulas for an unweighted fit", () => {
    const points = arrheniusPoints(8, { sd: 0.1 });
    const r = analyseDataset({ points, order: 2 });
    const d = r.diagnostics!;
    const n = 8;
    const p = 2;
    // Σ hᵢ = p (trace of the hat matrix).
    expect(d.leverage.reduce((a, b) => a + b, 0)).toBeCloseTo(p, 12);
    // Leverage of simple regression: 1/n + (xᵢ − x̄)²/Sxx on x = 1/T.
    const x = points.map((pt) => 1 / pt.T);
    const xbar = x.reduce((a, b) => a + b) / n;
    const sxx = x.reduce((a, b) => a + (b - xbar) ** 2, 0);
    x.forEach((xi, i) => expect(d.leverage[i]).toBeCloseTo(1 / n + (xi - xbar) ** 2 / sxx, 12));
    // External from internal: tᵢ = rᵢ √((n−p−1)/(n−p−rᵢ²)) (Cook & Weisberg 1982, eq. 2.2.9).
    d.studentized.forEach((ri, i) => expect(d.externallyStudentized[i]).toBeCloseTo(ri * Math.sqrt((n - p - 1) / (n - p - ri * ri)), 10));
  });
});

describe("analyseDataset: flags", () => {
  const codes = (r: ReturnType<typeof analyseDataset>) => r.flags.map((f) => f.code);

  it("outlier: beyond the Bonferroni bound, with the point index", () => {
    const points = arrheniusPoints(12, { sd: 0.02 });
    points[5] = { ...points[5], k: points[5].k * 4 };
    const r = analyseDataset({ points, order: 2 });
    const flag = r.flags.find((f) => f.code === "outlier")!;
    expect(flag.points).toEqual([5]);
    expect(flag.message).toMatch(/^Point 6 lies off the Arrhenius fit/);
    const bound = bonferroniStudentT(0.05, 12, 9);
    expect(Math.abs(r.diagnostics!.externallyStudentized[5])).toBeGreaterThan(bound);
    expect(flag.message).toContain(bound.toFixed(2));
  });

  it("curvature: rising apparent Ea with Ea(T) at both range ends, band from modified Arrhenius", () => {
    const points = Array.from({ length: 12 }, (_, i) => {
      const T = 300 + 150 * i;
      return { T, k: evaluateRateExpression({ A: 1e-14, n: 2.5, Ea: 5000 }, T) * Math.exp(0.02 * noise(i)) };
    });
    const r = analyseDataset({ points, order: 2 });
    expect(r.curvature!.p).toBeLessThan(1e-6);
    expect(r.curvature!.direction).toBe("up");
    expect(r.curvature!.deltaAICc!).toBeLessThan(0);
    expect(r.band.model).toBe("modified_arrhenius");
    const m = r.modifiedArrhenius!.params;
    const at = (T: number) => Number(((m.Ea + m.n * GAS_CONSTANT * T) / 1000).toPrecision(4));
    const msg = r.flags.find((f) => f.code === "curvature")!.message;
    expect(msg).toContain("rises with temperature");
    expect(msg).toContain(`F(1, 9) = `);
    expect(msg).toContain(`p < 0.0001`);
    expect(msg).toContain(`${at(300)} kJ mol⁻¹ at 300 K`);
    expect(msg).toContain(`${at(1950)} kJ mol⁻¹ at 1950 K`);
  });

  it("narrow_range: Tmax/Tmin below 1.05", () => {
    const r = analyseDataset({ points: arrheniusPoints(6, { T1: 300, T2: 310 }), order: 2 });
    expect(r.flags.find((f) => f.code === "narrow_range")?.message).toMatch(
      /span only 300–310 K \(Tmax\/Tmin = 1\.033 in kelvin, below 1\.05\)/,
    );
  });
  it("narrow_range is not raised for a well-determined Ea near zero", () => {
    const r = analyseDataset({ points: arrheniusPoints(8, { Ea: 100, sd: 0.001, T1: 200, T2: 400 }), order: 2 });
    expect(codes(r)).not.toContain("narrow_range");
  });

  it("negative_activation_energy is information only", () => {
    const r = analyseDataset({ points: arrheniusPoints(6, { A: 3.3e-12, Ea: -2245 }), order: 2 });
    const f = r.flags.find((x) => x.code === "negative_activation_energy")!;
    expect(f.severity).toBe("info");
    expect(f.message).toMatch(/negative \(-2\.\d+ kJ mol⁻¹, 95 % interval -2\.\d+ kJ mol⁻¹ to -\d\.\d+ kJ mol⁻¹\)/);
  });

  it("excess_scatter: weighted fit whose scatter exceeds the stated σ", () => {
    expect(codes(analyseDataset({ points: arrheniusPoints(10, { sd: 0.3, sigma: 0.01 }), order: 2 }))).toContain("excess_scatter");
    expect(codes(analyseDataset({ points: arrheniusPoints(10, { sd: 0.01, sigma: 0.05 }), order: 2 }))).not.toContain("excess_scatter");
  });

  it("too_few_points for 3 points", () => {
    const r = analyseDataset({ points: arrheniusPoints(3), order: 2 });
    expect(r.flags.find((f) => f.code === "too_few_points")?.severity).toBe("info");
    expect(r.diagnostics).toBeNull();
    // Three coefficients through three points: not determinable (no residual dof).
    expect(r.modifiedArrhenius).toBeNull();
    expect(r.flags.map((f) => f.code)).toContain("modified_fit_undetermined");
  });

  it("reported_fit_disagrees only when the reported expression leaves the band", () => {
    const points = arrheniusPoints(10, { sd: 0.02 });
    const same = analyseDataset({ points, order: 2, reportedFit: { A: 2.45e-12, Ea: 14757.67 } });
    expect(codes(same)).not.toContain("reported_fit_disagrees");
    const off = analyseDataset({ points, order: 2, reportedFit: { A: 2.45e-12, Ea: 12000 } });
    const flag = off.flags.find((f) => f.code === "reported_fit_disagrees")!;
    expect(flag.message).toMatch(/outside the 95 % confidence band of the refit between 220 and 400 K/);
    expect(flag.message).toMatch(/factor of \d\.\d\d \(higher\) at 220 K/);
    // A reported n and T0 are honoured.
    const zeroN = analyseDataset({ points, order: 2, reportedFit: { A: 2.45e-12, n: 0, Ea: 14757.67, T0: 300 } });
    expect(codes(zeroN)).not.toContain("reported_fit_disagrees");
    const withN = analyseDataset({ points, order: 2, reportedFit: { A: 2.45e-12, n: 1, Ea: 14757.67, T0: 300 } });
    expect(codes(withN)).toContain("reported_fit_disagrees");
  });
});
