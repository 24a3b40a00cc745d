import { describe, expect, it } from "vitest";
import { Matrix, inverse } from "ml-matrix";
import {
  AnalysisError,
  analyseDataset,
  AVOGADRO,
  consensus,
  evaluateRateExpression,
  GAS_CONSTANT,
  matchUnitMistake,
  type ConsensusDataset,
  type RatePoint,
} from "@/lib/kinetics";

/** Reproducible standard normal deviates (Park–Miller + Box–Muller). */
function makeNormal(seed: number): () => number {
  let s = seed;
  const u = () => {
    s = (s * 16807) % 2147483647;
    return s / 2147483647;
  };
  return () => Math.sqrt(-2 * Math.log(u())) * Math.cos(2 * Math.PI * u());
}

const TRUE = { A: 2.45e-12, Ea: 14757.67 };

function makeSet(
  id: string,
  normal: () => number,
  opts: { n?: number; T1?: number; T2?: number; sd?: number; factor?: number; sigma?: number } = {},
): ConsensusDataset {
  const { n = 10, T1 = 230, T2 = 420, sd = 0.05, factor = 1, sigma } = opts;
  const points: RatePoint[] = Array.from({ length: n }, (_, i) => {
    const T = T1 + ((T2 - T1) * i) / (n - 1);
    const k = evaluateRateExpression(TRUE, T) * factor * Math.exp(sd * normal());
    return sigma === undefined ? { T, k } : { T, k, sigmaLnK: sigma };
  });
  return { id, order: 2, points };
}

function expectAllFinite(value: unknown): void {
  if (typeof value === "number") expect(Number.isFinite(value)).toBe(true);
  else if (Array.isArray(value)) value.forEach(expectAllFinite);
  else if (value && typeof value === "object") Object.values(value).forEach(expectAllFinite);
}

describe("consensus", () => {
  it("with one unweighted dataset reproduces the single-dataset Arrhenius fit and covariance", () => {
    const set = makeSet("only", makeNormal(3), { n: 14 });
    const c = consensus([set]);
    const a = analyseDataset({ points: set.points, order: 2 }).arrhenius;
    expect(c.arrhenius.params.Ea).toBeCloseTo(a.params.Ea, 6);
    expect(c.arrhenius.params.lnA).toBeCloseTo(a.params.lnA, 10);
    expect(c.arrhenius.tau2).toBe(0);
    for (let i = 0; i < 2; i++) for (let j = 0; j < 2; j++) expect(c.arrhenius.covariance[i][j] / a.covariance![i][j]).toBeCloseTo(1, 8);
    expect(c.members[0].zScore).toBeNull();
    expect(c.flags.map((f) => f.code)).toEqual(["few_datasets"]);
  });

  it("solves the random-effects GLS exactly (checked against an explicit V⁻¹ with ml-matrix)", () => {
    const normal = makeNormal(11);
    const sets = [
      makeSet("a", normal, { n: 6, sd: 0.05, factor: 1.3 }),
      makeSet("b", normal, { n: 5, T1: 300, T2: 500, sd: 0.05, sigma: 0.04, factor: 0.8 }),
      makeSet("c", normal, { n: 7, T1: 200, T2: 330, sd: 0.08 }),
      makeSet("d", normal, { n: 4, sd: 0.02, factor: 1.1, sigma: 0.03 }),
    ];
    const c = consensus(sets);
    expect(c.arrhenius.tau2).toBeGreaterThan(0);
    // Dense GLS: β = (XᵀV⁻¹X)⁻¹XᵀV⁻¹y with V = diag(σ²) + τ²·(block of ones per dataset).
    const rows: number[][] = [];
    const y: number[] = [];
    const sig2: number[] = [];
    const block: number[] = [];
    sets.forEach((s, j) => {
      for (const p of s.points) {
        rows.push([1, -1 / (GAS_CONSTANT * p.T)]);
        y.push(Math.log(p.k));
        sig2.push((p.sigmaLnK ?? c.members[j].sigmaLnK!) ** 2);
        block.push(j);
      }
    });
    const N = y.length;
    const V = Matrix.zeros(N, N);
    for (let i = 0; i < N; i++) {
      for (let k = 0; k < N; k++) V.set(i, k, (i === k ? sig2[i] : 0) + (block[i] === block[k] ? c.arrhenius.tau2 : 0));
    }
    const X = new Matrix(rows);
    const Vi = inverse(V);
    const XtVi = X.transpose().mmul(Vi);
    const cov = inverse(XtVi.mmul(X));
    const beta = cov.mmul(XtVi).mmul(Matrix.columnVector(y));
    expect(c.arrhenius.params.lnA).toBeCloseTo(beta.get(0, 0), 8);
    expect(c.arrhenius.params.Ea / beta.get(1, 0)).toBeCloseTo(1, 9);
    for (let i = 0; i < 2; i++) for (let j = 0; j < 2; j++) expect(c.arrhenius.covariance[i][j] / cov.get(i, j)).toBeCloseTo(1, 7);
  });

  it("finds no between-dataset variance for consistent datasets and flags none of them", () => {
    const normal = makeNormal(5);
    const sets = [
      makeSet("a", normal),
      makeSet("b", normal, { T1: 200, T2: 300, n: 8 }),
      makeSet("c", normal, { T1: 280, T2: 450, n: 12 }),
      makeSet("d", normal, { sigma: 0.05 }),
      makeSet("e", normal, { n: 6 }),
    ];
    const c = consensus(sets);
    expect(c.arrhenius.tau2).toBeLessThan(1e-4);
    expect(c.flags).toEqual([]);
    expect(c.arrhenius.params.Ea / TRUE.Ea).toBeCloseTo(1, 1);
    for (const m of c.members) expect(Math.abs(m.offsetLog10)).toBeLessThan(0.05);
  });

  it("flags a dataset a factor of 3 off the others", () => {
    const normal = makeNormal(8);
    const sets = [
      makeSet("a", normal),
      makeSet("b", normal, { n: 8 }),
      makeSet("c", normal, { n: 12 }),
      makeSet("d", normal),
      makeSet("high", normal, { factor: 3 }),
    ];
    const c = consensus(sets);
    const off = c.flags.filter((f) => f.code === "off_consensus");
    expect(off.map((f) => f.datasetIds)).toEqual([["high"]]);
    expect(off[0].message).toMatch(/Dataset high lies a factor of (2\.9\d|3\.0\d) above the other datasets/);
    const high = c.members.find((m) => m.id === "high")!;
    expect(high.offsetFromOthersLog10!).toBeCloseTo(Math.log10(3), 1);
    expect(high.zScore!).toBeGreaterThan(2);
    expect(c.arrhenius.tau2).toBeGreaterThan(0.05);
    expect(c.arrhenius.uncertaintyFactor[0].f).toBeGreaterThan(1.5);
  });

  it.each([
    ["a factor of N_A (molecule ↔ mol)", AVOGADRO],
    ["a factor of (N_A/1000) (L mol⁻¹ ↔ cm³ molecule⁻¹)", AVOGADRO * 1e-3],
    ["a factor of 10^3 (L ↔ cm³)", 1e3],
    ["a factor of 10^6 (m³ ↔ cm³)", 1e-6],
  ])("marks a dataset off by %s as unit_suspect and leaves it out", (label, factor) => {
    const normal = makeNormal(21);
    const sets = [makeSet("a", normal), makeSet("b", normal, { n: 7 }), makeSet("c", normal), makeSet("wrong", normal, { factor })];
    const c = consensus(sets);
    const flag = c.flags.find((f) => f.code === "unit_suspect")!;
    expect(flag.datasetIds).toEqual(["wrong"]);
    expect(flag.message).toContain(label);
    expect(flag.message).toContain("left out of the consensus");
    expect(c.members.find((m) => m.id === "wrong")!.included).toBe(false);
    expect(c.members.find((m) => m.id === "wrong")!.offsetLog10).toBeCloseTo(Math.log10(factor), 1);
    // The consensus itself is not dragged by the mistaken dataset.
    expect(c.arrhenius.params.Ea / TRUE.Ea).toBeCloseTo(1, 1);
    expect(c.arrhenius.tau2).toBeLessThan(1e-3);
  });

  it("recognises unit-mistake factors per reaction order", () => {
    expect(matchUnitMistake(23.7, 2)).toMatch(/N_A/);
    expect(matchUnitMistake(-23.9, 2)).toMatch(/N_A/);
    expect(matchUnitMistake(3.1, 2)).toMatch(/10\^3/);
    expect(matchUnitMistake(6, 2)).toMatch(/10\^6/);
    expect(matchUnitMistake(47.56, 3)).toMatch(/N_A²/);
    expect(matchUnitMistake(12, 3)).toMatch(/10\^12/);
    expect(matchUnitMistake(1.0, 2)).toBeNull();
    expect(matchUnitMistake(23.78, 1)).toBeNull();
  });

  it("reports uncertainty factors at 298.15 K and the range ends, and no NaN", () => {
    const normal = makeNormal(2);
    const sets = [
      makeSet("a", normal, { T1: 350, T2: 600 }),
      makeSet("b", normal, { T1: 400, T2: 700, factor: 1.5 }),
      makeSet("c", normal, { n: 3, T1: 500, T2: 500.5 }),
    ];
    const c = consensus(sets);
    const [at298, atMin, atMax] = c.arrhenius.uncertaintyFactor;
    expect(at298).toMatchObject({ T: 298.15, extrapolated: true });
    expect(atMin).toMatchObject({ T: 350, extrapolated: false });
    expect(atMax).toMatchObject({ T: 700, extrapolated: false });
    for (const u of [at298, atMin, atMax]) expect(u.f).toBeGreaterThan(1);
    // Extrapolating to 298 K widens the band.
    expect(at298.f).toBeGreaterThan(atMin.f);
    expect(c.arrhenius.band.T).toHaveLength(50);
    expectAllFinite(c);
  });

  it("accepts single-temperature datasets alongside others", () => {
    const normal = makeNormal(4);
    const room: ConsensusDataset = {
      id: "room",
      order: 2,
      points: [298, 298, 298].map((T) => ({ T, k: evaluateRateExpression(TRUE, T) * Math.exp(0.05 * normal()) })),
    };
    const c = consensus([makeSet("a", normal), makeSet("b", normal), room]);
    expect(c.members.find((m) => m.id === "room")!.sigmaLnK!).toBeGreaterThan(0);
    expect(c.modifiedArrhenius).not.toBeNull();
    expectAllFinite(c);
  });

  it("handles a large dataset in one pass", () => {
    const normal = makeNormal(9);
    const sets = [makeSet("big", normal, { n: 200_000, T1: 200, T2: 1000 }), makeSet("small", normal)];
    const c = consensus(sets);
    expect(c.points).toBe(200_010);
    expect(c.arrhenius.params.Ea / TRUE.Ea).toBeCloseTo(1, 2);
  });

  it("rejects mixed orders, bad points and empty input with clear messages", () => {
    const normal = makeNormal(1);
    const a = makeSet("a", normal);
    expect(() => consensus([])).toThrow(/at least one dataset/);
    expect(() => consensus([a, { ...makeSet("b", normal), order: 3 }])).toThrow(/Dataset b is order 3 but dataset a is order 2/);
    const bad = makeSet("bad", normal);
    bad.points = bad.points.map((p, i) => (i === 2 ? { ...p, k: -1 } : p));
    let caught: unknown;
    try {
      consensus([a, bad]);
    } catch (e) {
      caught = e;
    }
    expect(caught).toBeInstanceOf(AnalysisError);
    expect((caught as AnalysisError).datasetId).toBe("bad");
    expect((caught as AnalysisError).pointIndex).toBe(2);
    expect((caught as AnalysisError).message).toMatch(/^Dataset bad: Point 3 \(points\[2\]\) has rate constant k = -1/);
    expect(() =>
      consensus([
        {
          id: "flat",
          order: 2,
          points: [
            { T: 300, k: 1e-12 },
            { T: 300, k: 2e-12 },
          ],
        },
      ]),
    ).toThrow(/All points are at 300 K/);
  });
});
