/**
 * Tails for large degrees of freedom: the regularised incomplete gamma P and Q (χ² tails), the F
 * and Student-t upper tails, over a ∈ {0.5 … 1e6}, x/a ∈ [0.01, 100] and dof up to 1e6.
 * Reference values: tests/fixtures/large-dof/reference.json, computed once with mpmath 1.3.0 at
 * 40 digits from the exact binary64 inputs it lists (its `source` field names every call).
 *
 * Tolerance: a tail value cannot be more exact than its argument allows. Its relative condition
 * number with respect to x is x·|dQ/dx|/Q, which in the tails is about |x − a|·max(1, x/a) for the
 * gamma function (e.g. 1e4 at a = 1e6, x = 0.99a: a rounding of x alone moves P by 1e-12); the
 * bound is a small multiple of the double rounding times that number, never less than 1e-13.
 */
import { describe, expect, it } from "vitest";
import reference from "@/tests/fixtures/large-dof/reference.json";
import far from "@/tests/fixtures/far-gamma-tails/reference.json";
import { regularisedGamma } from "@/lib/kinetics/incomplete-gamma";
import { survivalChiSquare, survivalF, survivalStudentT } from "@/lib/kinetics/distributions";
import { analyseDataset } from "@/lib/kinetics/analyse-dataset";

function relErr(value: number, exact: string): number {
  const x = Number(exact);
  // "0" in the fixture: the exact value is below 1e-300.
  if (x === 0) return value >= 0 && value < 1e-300 ? 0 : Infinity;
  if (!Number.isFinite(value)) return Infinity;
  return Math.abs(value - x) / Math.abs(x);
}

describe("regularised incomplete gamma P and Q (reference: mpmath 1.3, 40 digits)", () => {
  it(`${reference.gamma.length} cases, a from 0.5 to 1e6, x/a from 0.01 to 100, both tails, down to 1e-300`, () => {
    let worst = { ratio: 0, what: "" };
    for (const c of reference.gamma) {
      const cond = Math.max(1, Math.abs(c.x - c.a) * Math.max(1, c.x / c.a));
      const tol = 1e-13 * cond;
      for (const [upper, exact] of [
        [true, c.Q],
        [false, c.P],
      ] as const) {
        const err = relErr(regularisedGamma(c.a, c.x, upper), exact);
        if (err / tol > worst.ratio) worst = { ratio: err / tol, what: `${upper ? "Q" : "P"}(${c.a}, ${c.x}) off by ${err}` };
      }
    }
    expect(worst.ratio, worst.what).toBeLessThanOrEqual(1);
    expect(reference.gamma.some((c) => Number(c.Q) > 0 && Number(c.Q) < 1e-250)).toBe(true);
  });
  it.each([
    [5000, 5000],
    [1000, 3000],
    [3000, 1000],
    [1e6, 1e6],
  ])("Q(%d, %d) near the median of a large-dof χ² is right to 1e-14 (it was 1 % off)", (a, x) => {
    const c = reference.gamma.find((g) => g.a === a && g.x === x);
    if (c) {
      expect(relErr(regularisedGamma(a, x, true), c.Q)).toBeLessThan(1e-14);
    } else {
      // (1000, 3000) and (3000, 1000) are off the grid: P + Q = 1 and the tails on either side of the mean.
      const q = regularisedGamma(a, x, true);
      const p = regularisedGamma(a, x, false);
      expect(Math.abs(p + q - 1)).toBeLessThan(1e-15);
      expect(x > a ? q < 1e-100 : p < 1e-100).toBe(true);
    }
  });
  it("Q(5000, 5000) = 0.49811936596618… (the value that was 0.50376)", () => {
    expect(regularisedGamma(5000, 5000, true)).toBeCloseTo(0.4981193659661827, 14);
  });
});

describe("far tails at large a (reference: tests/fixtures/far-gamma-tails, mpmath 1.3.0 at 80 digits)", () => {
  it(`${far.cases.length} cases, a from 150 to 1e6, x = a ± z√a with z from 0.5 to 35, down to 1e-300, within 1e-12 relative`, () => {
    // The reference is computed at the exact binary64 a and x, so no condition number enters: this is the engine's own error.
    let worst = { err: 0, what: "" };
    for (const c of far.cases) {
      const err = relErr(regularisedGamma(c.a, c.x, c.tail === "Q"), c.value);
      if (err > worst.err) worst = { err, what: `${c.tail}(${c.a}, ${c.x}) off by ${err}` };
    }
    expect(worst.err, worst.what).toBeLessThanOrEqual(1e-12);
    // The case the tail was 1e-10 off in: dof ≥ 2e4 and Q below 1e-39.
    expect(far.cases.some((c) => c.a >= 1e4 && c.tail === "Q" && Number(c.value) < 1e-39)).toBe(true);
    expect(far.source).toMatch(/^mpmath 1\.3\.0, mp\.dps = 80/);
  });
  it("χ² upper tail at dof 2e6, 3.5 standard deviations out (Q ≈ 1.26e-38), as survivalChiSquare reads it", () => {
    const c = far.cases.find((x) => x.a === 1e6 && x.tail === "Q" && Number(x.value) < 1e-37 && Number(x.value) > 1e-39)!;
    expect(relErr(survivalChiSquare(2 * c.x, 2 * c.a), c.value)).toBeLessThanOrEqual(1e-12);
  });
});

describe("chi-square upper tail for many points (excess scatter p above ~700 points)", () => {
  it("survivalChiSquare(x, dof) = Q(dof/2, x/2) over the grid at even dof", () => {
    for (const c of reference.gamma.filter((g) => g.a >= 100 && g.Q !== "0" && Number(g.Q) > 1e-300)) {
      const cond = Math.max(1, Math.abs(c.x - c.a) * Math.max(1, c.x / c.a));
      expect(relErr(survivalChiSquare(2 * c.x, 2 * c.a), c.Q), `dof = ${2 * c.a}, x = ${2 * c.x}`).toBeLessThanOrEqual(1e-13 * cond);
    }
  });
  it("a 2000-point weighted dataset scattering exactly as stated is not flagged for excess scatter", () => {
    // Residuals ±σ alternating, so χ² = n − 2 + (rounding) on n − 2 dof: p ≈ 0.5, never < 0.01.
    const n = 2000;
    const points = Array.from({ length: n }, (_, i) => {
      const T = 250 + (500 * i) / (n - 1);
      return { T, k: Math.exp(-20 - 3000 / T + (i % 2 === 0 ? 0.05 : -0.05)), sigmaLnK: 0.05 };
    });
    const r = analyseDataset({ order: 1, points });
    const chi2 = r.arrhenius.rss;
    const dof = r.arrhenius.dof;
    const p = survivalChiSquare(chi2, dof);
    // P(χ²_1998 > 2000) by mpmath 1.3 is 0.4864…; χ² here is 1998 + O(1), so p lies near ½.
    expect(p).toBeGreaterThan(0.4);
    expect(p).toBeLessThan(0.6);
    expect(r.flags.map((f) => f.code)).not.toContain("excess_scatter");
  });
});

describe("F and Student-t upper tails for large dof (reference: mpmath 1.3, 40 digits)", () => {
  it(`F survival, ${reference.fSurvival.length} cases, d1 ≤ 3 (the engine's tests) within 1e-13 × condition`, () => {
    for (const c of reference.fSurvival.filter((f) => f.d1 <= 3)) {
      // Condition with respect to f: about (d1/2)·max(1, |f − 1|)·… in the tail; bounded by d1·(1 + f).
      const tol = 1e-13 * Math.max(1, Math.min(1e4, c.d1 * (1 + c.f)));
      expect(relErr(survivalF(c.f, c.d1, c.d2), c.p), `F(${c.d1}, ${c.d2}) at ${c.f}`).toBeLessThanOrEqual(tol);
    }
  });
  it("F survival with d1 = 10 or 1000 within 1e-10 (the incomplete beta for d2/2 ≥ 5e4 is good to ~2e-11)", () => {
    for (const c of reference.fSurvival.filter((f) => f.d1 > 3)) {
      expect(relErr(survivalF(c.f, c.d1, c.d2), c.p), `F(${c.d1}, ${c.d2}) at ${c.f}`).toBeLessThan(1e-10);
    }
  });
  it(`Student-t upper tail, ${reference.tUpper.length} cases, dof 1 … 1e6, t from 1e-8 to 1e8, within 1e-13`, () => {
    for (const c of reference.tUpper) {
      expect(relErr(survivalStudentT(c.t, c.dof), c.p), `t = ${c.t}, dof = ${c.dof}`).toBeLessThan(1e-13);
    }
  });
  it("Student-t tail is symmetric: P(T > −t) = 1 − P(T > t)", () => {
    expect(survivalStudentT(-2, 7) + survivalStudentT(2, 7)).toBeCloseTo(1, 15);
    expect(survivalStudentT(0, 5)).toBe(0.5);
  });
});
