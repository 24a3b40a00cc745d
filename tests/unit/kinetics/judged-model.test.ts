/**
 * Rules of the analysis stated in conventions.ts, checked on constructed data whose answer is
 * known by construction: points judged on the preferred model, the modified fit refused when n is
 * not determined, the negative-Ea note only for an Ea distinguishable from zero, no confidence
 * interval for k(298.15 K) far outside the data.
 */
import { describe, expect, it } from "vitest";
import reference from "@/tests/fixtures/tails/reference.json";
import { analyseDataset } from "@/lib/kinetics/analyse-dataset";
import { describeExtrapolation } from "@/lib/kinetics/flag-text";
import { GAS_CONSTANT } from "@/lib/kinetics/constants";

const PATTERN = [
  0.31, -0.52, 0.83, -0.14, -0.95, 0.47, 0.05, -0.66, 0.29, 0.77, -0.38, 0.12, -0.81, 0.58, -0.23, 0.91, -0.47, 0.36, -0.09, 0.64,
];
type Pt = { T: number; k: number; sigmaLnK?: number };
const codes = (r: ReturnType<typeof analyseDataset>) => r.flags.map((f) => f.code);

/** 20 points 200–2000 K even in 1/T on k = 1e-13 (T/298.15)^2.8 exp(−900/T), 1 % scatter (a computed OH + CH₄-like set). */
const curved = reference.curved.points as Pt[];

describe("points are judged on the model the dataset's own analysis prefers", () => {
  it("a strongly curved 200–2000 K set: judged on the modified fit, no end point flagged", () => {
    const r = analyseDataset({ order: 2, points: curved });
    expect(r.band.model).toBe("modified_arrhenius");
    expect(r.diagnostics!.model).toBe("modified_arrhenius");
    // Against the straight line the 2000 K end misses by its curvature: |residual| far beyond 1 %.
    expect(Math.abs(r.arrhenius.residuals[19])).toBeGreaterThan(0.1);
    expect(codes(r)).not.toContain("outlier");
    expect(codes(r)).not.toContain("influential_point");
    // The modified fit's residuals are the 1 % scatter: externally studentized residuals are ordinary.
    expect(Math.max(...r.diagnostics!.externallyStudentized.map(Math.abs))).toBeLessThan(3);
  });
  it("a real outlier in a curved set is named, with the model it was judged on", () => {
    const pts = curved.map((p, i) => (i === 9 ? { ...p, k: p.k * Math.exp(0.2) } : p));
    const r = analyseDataset({ order: 2, points: pts });
    const flag = r.flags.find((f) => f.code === "outlier")!;
    expect(flag.points).toEqual([9]);
    expect(flag.message).toMatch(/^Point 10 lies off the modified Arrhenius fit/);
    expect(flag.quantities!.coefficients.value).toBe(3);
    // Bonferroni bound on n − p − 1 = 16 dof.
    expect(flag.quantities!.dof.value).toBe(16);
  });
  it("a straight set is still judged on the Arrhenius fit", () => {
    const pts = Array.from({ length: 10 }, (_, i) => {
      const T = 250 + 20 * i;
      return { T, k: Math.exp(-25 - 1500 / T + 0.01 * PATTERN[i] + (i === 4 ? 0.2 : 0)) };
    });
    const r = analyseDataset({ order: 2, points: pts });
    expect(r.diagnostics!.model).toBe("arrhenius");
    expect(r.flags.find((f) => f.code === "outlier")?.message).toMatch(/^Point 5 lies off the Arrhenius fit/);
  });
});

describe("modified Arrhenius fit refused when the data do not determine n", () => {
  const window = (T0: number, width: number) =>
    Array.from({ length: 10 }, (_, i) => {
      const T = T0 + (width * i) / 9;
      return { T, k: Math.exp(-25 - 1500 / T + 0.01 * PATTERN[i]) };
    });
  it("300–300.5 K with 1 % scatter: null, flag with n and its standard error, Arrhenius fit kept", () => {
    const r = analyseDataset({ order: 2, points: window(300, 0.5) });
    expect(r.modifiedArrhenius).toBeNull();
    expect(r.curvature).toBeNull();
    const flag = r.flags.find((f) => f.code === "modified_fit_undetermined")!;
    expect(flag.quantities!.seN.value).toBeGreaterThan(5);
    expect(flag.message).toMatch(/over 300\.0–300\.5 K the temperature exponent comes out as n = .* with a standard error of .*, above 5/);
    expect(Number.isFinite(r.arrhenius.params.Ea)).toBe(true);
    expect(r.band.model).toBe("arrhenius");
  });
  it("the wide curved set keeps its modified fit, n = 2.8 within its 95 % interval and se(n) ≪ 5", () => {
    const r = analyseDataset({ order: 2, points: curved });
    const m = r.modifiedArrhenius!;
    expect(m.se.n!).toBeLessThan(0.1);
    expect(Math.abs(m.params.n - 2.8)).toBeLessThan(3 * m.se.n!);
    expect(codes(r)).not.toContain("modified_fit_undetermined");
  });
  it("three points at three temperatures (no residual dof): not determinable, null with a flag in plain words", () => {
    // 1 % scatter on k = 1e-12 (T/298.15)^1.5 exp(−1000 K/T) (invented): the exact fit through three points
    // turns the scatter into n — here hundreds, as the n = −4244 a three-point set once showed.
    const pts = [250, 251, 252].map((T, i) => ({ T, k: 1e-12 * (T / 298.15) ** 1.5 * Math.exp(-1000 / T + 0.01 * [1, -1, 1][i]) }));
    const r = analyseDataset({ order: 2, points: pts });
    expect(r.modifiedArrhenius).toBeNull();
    expect(r.curvature).toBeNull();
    const flag = r.flags.find((f) => f.code === "modified_fit_undetermined")!;
    expect(flag.quantities!.points.value).toBe(3);
    expect(flag.message).toBe(
      "The modified Arrhenius expression cannot be determined from these data: its three coefficients pass exactly through the 3 points over 250–252 K, whatever their scatter, so n would be the scatter itself and has no standard error. At least 4 points at 3 or more temperatures are needed.",
    );
    // The Arrhenius fit (one residual dof) is kept.
    expect(r.arrhenius.dof).toBe(1);
    // Noise-free points are no different: with no dof nothing shows that n is right.
    const exact = [250, 300, 350].map((T) => ({ T, k: 1e-12 * (T / 298.15) ** 1.5 * Math.exp(-1000 / T) }));
    expect(analyseDataset({ order: 2, points: exact }).modifiedArrhenius).toBeNull();
  });
  it("four points (one residual dof) fall under the se(n) rule instead", () => {
    const pts = [250, 251, 252, 253].map((T, i) => ({ T, k: 1e-12 * Math.exp(-1000 / T + 0.01 * [1, -1, 1, -1][i]) }));
    const flag = analyseDataset({ order: 2, points: pts }).flags.find((f) => f.code === "modified_fit_undetermined")!;
    expect(flag.quantities!.seN.value).toBeGreaterThan(5);
    expect(flag.quantities!.points).toBeUndefined();
  });
});

describe("negative activation energy: only when its 95 % interval excludes zero", () => {
  const set = (Ea: number, sd: number) =>
    Array.from({ length: 8 }, (_, i) => {
      const T = 250 + 25 * i;
      return { T, k: 1e-11 * Math.exp(-Ea / (GAS_CONSTANT * T) + sd * PATTERN[i]) };
    });
  it("Ea = −2 kJ mol⁻¹ with 0.1 % scatter: reported with its interval", () => {
    const r = analyseDataset({ order: 2, points: set(-2000, 0.001) });
    const f = r.flags.find((x) => x.code === "negative_activation_energy")!;
    expect(f.quantities!.upper.value).toBeLessThan(0);
    expect(f.message).toMatch(/95 % interval -\d\.\d+ kJ mol⁻¹ to -\d\.\d+ kJ mol⁻¹/);
  });
  it("Ea = −0.5 kJ mol⁻¹ with 20 % scatter: the interval contains 0, nothing is said", () => {
    const r = analyseDataset({ order: 2, points: set(-500, 0.2) });
    expect(r.arrhenius.params.Ea).toBeLessThan(-1);
    const half = 2.447 * r.arrhenius.se.Ea!; // t_{0.975, 6} = 2.4469 (published tables)
    expect(r.arrhenius.params.Ea + half).toBeGreaterThan(0);
    expect(codes(r)).not.toContain("negative_activation_energy");
  });
  it("two points (no interval): nothing is said", () => {
    const r = analyseDataset({ order: 2, points: set(-2000, 0).slice(0, 2) });
    expect(r.arrhenius.params.Ea).toBeLessThan(-1000);
    expect(codes(r)).not.toContain("negative_activation_energy");
  });
});

describe("k(298.15 K) far outside the data is given without an interval", () => {
  const line = (T1: number, T2: number) =>
    Array.from({ length: 8 }, (_, i) => {
      const T = T1 + ((T2 - T1) * i) / 7;
      return { T, k: Math.exp(-25 - 1500 / T + 0.01 * PATTERN[i]) };
    });
  it("data at 1000–2000 K (4.7 widths in 1/T below): value and distance, limits null, and the words say why", () => {
    const k = analyseDataset({ order: 2, points: line(1000, 2000) }).arrhenius.k298;
    expect(k.value).toBeGreaterThan(0);
    expect(k.lower).toBeNull();
    expect(k.upper).toBeNull();
    expect(k.intervalOmitted).toBe(true);
    expect(k.extrapolation!.inverseTWidths).toBeCloseTo((1 / 298.15 - 1 / 1000) / (1 / 1000 - 1 / 2000), 12);
    expect(describeExtrapolation(k.extrapolation!)).toMatch(/no confidence interval is given beyond 1 width/);
  });
  it("data at 200–290 K (0.06 widths above): the interval is given", () => {
    const k = analyseDataset({ order: 2, points: line(200, 290) }).arrhenius.k298;
    expect(k.intervalOmitted).toBe(false);
    expect(k.lower!).toBeLessThan(k.value!);
    expect(k.upper!).toBeGreaterThan(k.value!);
    expect(describeExtrapolation(k.extrapolation!)).not.toMatch(/no confidence interval/);
  });
  it("data spanning 298.15 K: not extrapolated, interval given", () => {
    const k = analyseDataset({ order: 2, points: line(250, 350) }).arrhenius.k298;
    expect(k.extrapolated).toBe(false);
    expect(k.intervalOmitted).toBe(false);
    expect(k.lower).not.toBeNull();
  });
});
