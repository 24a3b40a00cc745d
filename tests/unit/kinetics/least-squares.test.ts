import { describe, expect, it } from "vitest";
import { Matrix, QrDecomposition, pseudoInverse } from "ml-matrix";
import { linearRegression } from "simple-statistics";
import { LeastSquaresError, solveLeastSquares } from "@/lib/kinetics/least-squares";
import { analyseDataset, GAS_CONSTANT } from "@/lib/kinetics";

import filip from "@/tests/fixtures/nist-strd/Filip.json";
import longley from "@/tests/fixtures/nist-strd/Longley.json";
import noInt1 from "@/tests/fixtures/nist-strd/NoInt1.json";
import noInt2 from "@/tests/fixtures/nist-strd/NoInt2.json";
import norris from "@/tests/fixtures/nist-strd/Norris.json";
import pontius from "@/tests/fixtures/nist-strd/Pontius.json";
import wampler1 from "@/tests/fixtures/nist-strd/Wampler1.json";
import wampler2 from "@/tests/fixtures/nist-strd/Wampler2.json";
import wampler3 from "@/tests/fixtures/nist-strd/Wampler3.json";
import wampler4 from "@/tests/fixtures/nist-strd/Wampler4.json";
import wampler5 from "@/tests/fixtures/nist-strd/Wampler5.json";

interface StrdDataset {
  source: string;
  x: number[] | number[][];
  y: number[];
  certified: { params: number[]; stderr: number[]; residualSD: number; r2: number };
}

/** Number of agreeing significant digits (LRE of McCullough 1998); exact agreement → 15. */
function agreeingDigits(value: number, certified: number): number {
  if (value === certified) return 15;
  if (certified === 0) return Math.min(15, -Math.log10(Math.abs(value)));
  return Math.min(15, -Math.log10(Math.abs(value - certified) / Math.abs(certified)));
}

function polynomialDesign(x: number[], degree: number): number[][] {
  return x.map((v) => Array.from({ length: degree + 1 }, (_, k) => v ** k));
}

/** Certified zero standard errors (exact fits) are checked in absolute terms, relative to the parameter. */
function expectSe(se: number, certified: number, param: number, digits: number) {
  if (certified === 0) expect(Math.abs(se)).toBeLessThan(Math.abs(param) * 10 ** -digits);
  else expect(agreeingDigits(se, certified)).toBeGreaterThanOrEqual(digits);
}

// Source: NIST/ITL Statistical Reference Datasets, linear least squares (certified values),
// https://www.itl.nist.gov/div898/strd/lls/lls.shtml — transcribed in tests/fixtures/nist-strd/.
const cases: { name: string; data: StrdDataset; design: () => number[][]; digits: number }[] = [
  { name: "Norris", data: norris, design: () => polynomialDesign(norris.x, 1), digits: 9 },
  { name: "Pontius", data: pontius, design: () => polynomialDesign(pontius.x, 2), digits: 9 },
  { name: "NoInt1", data: noInt1, design: () => noInt1.x.map((v) => [v]), digits: 9 },
  { name: "NoInt2", data: noInt2, design: () => noInt2.x.map((v) => [v]), digits: 9 },
  { name: "Longley", data: longley, design: () => longley.x.map((row) => [1, ...row]), digits: 9 },
  { name: "Wampler1", data: wampler1, design: () => polynomialDesign(wampler1.x, 5), digits: 7 },
  { name: "Wampler2", data: wampler2, design: () => polynomialDesign(wampler2.x, 5), digits: 7 },
  { name: "Wampler3", data: wampler3, design: () => polynomialDesign(wampler3.x, 5), digits: 7 },
  { name: "Wampler4", data: wampler4, design: () => polynomialDesign(wampler4.x, 5), digits: 7 },
  { name: "Wampler5", data: wampler5, design: () => polynomialDesign(wampler5.x, 5), digits: 7 },
  // Filip (degree 10, extremely ill-conditioned): 7.1 digits reached on parameters and standard errors.
  { name: "Filip", data: filip, design: () => polynomialDesign(filip.x, 10), digits: 7 },
];

describe("solveLeastSquares against NIST StRD certified values", () => {
  it.each(cases)("$name: parameters, standard errors, residual SD and R² to ≥ $digits digits", ({ data, design, digits }) => {
    const fit = solveLeastSquares(design(), data.y);
    const c = data.certified;
    fit.params.forEach((b, j) => expect(agreeingDigits(b, c.params[j])).toBeGreaterThanOrEqual(digits));
    expect(fit.se).not.toBeNull();
    fit.se!.forEach((se, j) => expectSe(se, c.stderr[j], c.params[j], digits));
    if (c.residualSD === 0) expect(fit.residualSD!).toBeLessThan(1e-6);
    else expect(agreeingDigits(fit.residualSD!, c.residualSD)).toBeGreaterThanOrEqual(digits);
    expect(agreeingDigits(fit.r2!, c.r2)).toBeGreaterThanOrEqual(digits);
  });
});

describe("solveLeastSquares behaviour", () => {
  it("rejects a rank-deficient design with a clear error", () => {
    const x = [
      [1, 2, 4],
      [1, 3, 6],
      [1, 4, 8],
      [1, 5, 10],
    ];
    expect(() => solveLeastSquares(x, [1, 2, 3, 4])).toThrow(LeastSquaresError);
    expect(() => solveLeastSquares(x, [1, 2, 3, 4])).toThrow(/linearly dependent/);
  });

  it("rejects mismatched lengths, non-finite values and non-positive weights", () => {
    expect(() => solveLeastSquares([[1], [2]], [1])).toThrow(/y has 1 values but X has 2 rows/);
    expect(() => solveLeastSquares([[1], [NaN]], [1, 2])).toThrow(/X\[1\]\[0\]/);
    expect(() => solveLeastSquares([[1], [2]], [1, 2], [1, 0])).toThrow(/Weight 1/);
  });

  it("weights equal to integer multiplicities reproduce the fit on repeated rows", () => {
    const x = [
      [1, 0],
      [1, 1],
      [1, 2],
      [1, 3],
    ];
    const y = [0.1, 1.2, 1.9, 3.3];
    const weighted = solveLeastSquares(x, y, [1, 2, 1, 3]);
    const repeated = solveLeastSquares([x[0], x[1], x[1], x[2], x[3], x[3], x[3]], [y[0], y[1], y[1], y[2], y[3], y[3], y[3]]);
    weighted.params.forEach((b, j) => expect(b).toBeCloseTo(repeated.params[j], 12));
    expect(weighted.rss).toBeCloseTo(repeated.rss, 12);
  });

  it("returns null standard errors when there are no degrees of freedom", () => {
    const fit = solveLeastSquares(
      [
        [1, 0],
        [1, 1],
      ],
      [1, 3],
    );
    expect(fit.dof).toBe(0);
    expect(fit.se).toBeNull();
    expect(fit.covariance).toBeNull();
    expect(fit.params[0]).toBeCloseTo(1, 14);
    expect(fit.params[1]).toBeCloseTo(2, 14);
  });
});

/** A reproducible noisy Arrhenius dataset. */
function makeArrheniusData(n: number, seed: number, weighted: boolean) {
  let s = seed;
  const rand = () => {
    s = (s * 16807) % 2147483647;
    return s / 2147483647;
  };
  return Array.from({ length: n }, (_, i) => {
    const T = 220 + (180 * i) / (n - 1);
    const lnk = Math.log(3.1e-12) - 15000 / (GAS_CONSTANT * T) + 0.08 * (rand() - 0.5);
    return weighted ? { T, k: Math.exp(lnk), sigmaLnK: 0.02 + 0.05 * rand() } : { T, k: Math.exp(lnk) };
  });
}

describe("cross-checks against general-purpose npm libraries", () => {
  it("simple-statistics linearRegression gives the same slope and intercept on well-conditioned data", () => {
    const points = makeArrheniusData(12, 7, false);
    const result = analyseDataset({ points, order: 2 });
    // simple-statistics 7.12 linearRegression: least squares of ln k on 1/T (slope = −Ea/R).
    const { m, b } = linearRegression(points.map((p) => [1 / p.T, Math.log(p.k)]));
    expect(result.arrhenius.params.lnA).toBeCloseTo(b, 9);
    expect(-result.arrhenius.params.Ea / GAS_CONSTANT / m).toBeCloseTo(1, 9);
  });

  it.each([false, true])("ml-matrix pseudo-inverse and QR give the same covariance s²(XᵀWX)⁻¹ (weighted: %s; s² ≥ 1 then)", (weighted) => {
    const points = makeArrheniusData(15, 11, weighted);
    const result = analyseDataset({ points, order: 2 });
    const sw = points.map((p) => ("sigmaLnK" in p ? 1 / (p.sigmaLnK as number) : 1));
    const X = new Matrix(points.map((p, i) => [sw[i], -sw[i] / (GAS_CONSTANT * p.T)]));
    const y = Matrix.columnVector(points.map((p, i) => sw[i] * Math.log(p.k)));
    // ml-matrix 6.15: β = X⁺y, (XᵀWX)⁻¹ = X⁺X⁺ᵀ.
    const pinv = pseudoInverse(X);
    const beta = pinv.mmul(y);
    const resid = y.clone().sub(X.mmul(beta));
    const chi2Reduced = resid.transpose().mmul(resid).get(0, 0) / (points.length - 2);
    // Weighted: the stated σ are a floor, s² = max(1, χ²/dof) (conventions.ts); unweighted s² = RSS/dof.
    const s2 = weighted ? Math.max(1, chi2Reduced) : chi2Reduced;
    const cov = pinv.mmul(pinv.transpose()).mul(s2);
    const qrBeta = new QrDecomposition(X).solve(y);
    expect(result.arrhenius.params.lnA).toBeCloseTo(beta.get(0, 0), 8);
    expect(result.arrhenius.params.Ea / qrBeta.get(1, 0)).toBeCloseTo(1, 9);
    for (let i = 0; i < 2; i++) {
      for (let j = 0; j < 2; j++) {
        expect(result.arrhenius.covariance![i][j] / cov.get(i, j)).toBeCloseTo(1, 7);
      }
    }
  });
});
