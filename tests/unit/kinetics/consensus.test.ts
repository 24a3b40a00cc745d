import { describe, expect, it } from "vitest";
import { Matrix, inverse, pseudoInverse } from "ml-matrix";
import {
  AnalysisError,
  analyseDataset,
  AVOGADRO,
  combineEffectsDL,
  consensus,
  evaluateRateExpression,
  GAS_CONSTANT,
  matchUnitMistake,
  type ConsensusDataset,
  type ConsensusResult,
  type RatePoint,
  type RateExpression,
} from "@/lib/kinetics";
import { t95 } from "@/lib/kinetics/distributions";
import { buildRows, fitModel, leaveOneOutFits, symmetricEigen } from "@/lib/kinetics/consensus-fit";
import { ownCovariance, summariseDataset, Z95 } from "@/lib/kinetics/consensus-support";
import { analyseOutliers } from "@/lib/kinetics/analyse-dataset";
import reference from "@/tests/fixtures/meta-analysis-dl-statsmodels.json";

/** Reproducible standard normal deviates (Park–Miller + Box–Muller). */
function makeNormal(seed: number): () => number {
  let s = seed;
  const u = () => {
    s = (s * 16807) % 2147483647;
    return s / 2147483647;
  };
  return () => Math.sqrt(-2 * Math.log(u())) * Math.cos(2 * Math.PI * u());
}

/**
 * A seed spread over the generator's range (one step of the MINSTD multiplier 48271 plus an
 * offset). Park–Miller's first uniform from a small seed s is 16807·s/(2³¹ − 1) < 2e-3 for s ≤ 200,
 * so the first deviate of every small seed is beyond 3.5σ: each constructed set would start with the
 * same extreme point at its cold end. The many-seed tests use mixed seeds.
 */
function mixSeed(seed: number): number {
  return Number((BigInt(seed) * 48271n + 1013904223n) % 2147483647n);
}

/** The true expression of the constructed tests (invented). */
const TRUE: RateExpression = { A: 2.0e-12, Ea: 12000 };

interface SetOptions {
  n?: number;
  T1?: number;
  T2?: number;
  sd?: number;
  /** Stated σ(ln k); omitted → no uncertainties. */
  sigma?: number;
  /** Multiplies every k: a constant factor, or a function of T. */
  factor?: number | ((T: number) => number);
  truth?: RateExpression;
}

function makeSet(id: string, normal: () => number, opts: SetOptions = {}): ConsensusDataset {
  const { n = 10, T1 = 220, T2 = 420, sd = 0.05, sigma, factor = 1, truth = TRUE } = opts;
  const points: RatePoint[] = Array.from({ length: n }, (_, i) => {
    // Even in 1/T, as experiments are usually planned.
    const T = i === n - 1 ? T2 : 1 / (1 / T1 + ((1 / T2 - 1 / T1) * i) / (n - 1));
    const f = typeof factor === "number" ? factor : factor(T);
    const k = evaluateRateExpression(truth, T) * f * Math.exp(sd * normal());
    return sigma === undefined ? { T, k } : { T, k, sigmaLnK: sigma };
  });
  return { id, order: 2, points };
}

/**
 * A computed set over 200–2000 K whose curvature differs from the truth: same k and slope at
 * 300 K, ln(k/k_true) = δ·(ln(T/300) + 300/T − 1), i.e. n = δ more — 2.7 % at 220 and 420 K,
 * a factor 1.7 at 2000 K for δ = 0.5.
 */
function computedSet(id: string, normal: () => number, delta = 0.5): ConsensusDataset {
  const Tc = 300;
  return makeSet(id, normal, {
    n: 16,
    T1: 200,
    T2: 2000,
    sd: 0.01,
    factor: (T) => Math.exp(delta * (Math.log(T / Tc) + Tc / T - 1)),
  });
}

function expectAllFinite(value: unknown): void {
  if (typeof value === "number") expect(Number.isFinite(value)).toBe(true);
  else if (Array.isArray(value)) value.forEach(expectAllFinite);
  else if (value && typeof value === "object") Object.values(value).forEach(expectAllFinite);
}

function member(c: ConsensusResult, id: string) {
  const m = c.members.find((x) => x.id === id);
  if (!m) throw new Error(`no member ${id}`);
  return m;
}

function preferred(c: ConsensusResult) {
  return c.preferred === "modified_arrhenius" ? c.modifiedArrhenius! : c.arrhenius;
}

function lnkOf(c: ConsensusResult, T: number): number {
  const p = preferred(c).params;
  const n = "n" in p ? (p.n as number) : 0;
  return p.lnA + n * Math.log(T / 298.15) - p.Ea / (GAS_CONSTANT * T);
}

describe("combineEffectsDL (the one-parameter case of stage 2)", () => {
  // Reference: statsmodels 0.15.0 combine_effects(method_re="dl"), see the fixture's source field.
  it.each(reference.cases.map((c, i) => [i + 1, c] as const))("matches statsmodels on case %i", (_, c) => {
    const r = combineEffectsDL(c.effects, c.variances);
    expect(r.tau2).toBeCloseTo(c.tau2_DL, 12);
    expect(r.meanRandom).toBeCloseTo(c.mu_random, 12);
    expect(r.seRandom).toBeCloseTo(c.se_mu_random, 12);
    expect(r.q).toBeCloseTo(c.Q, 10);
    expect(r.meanFixed).toBeCloseTo(c.mu_fixed, 12);
  });

  it("truncates τ² at zero for homogeneous effects", () => {
    const r = combineEffectsDL([0.1, 0.11, 0.09], [0.01, 0.01, 0.01]);
    expect(r.tau2).toBe(0);
    expect(r.meanRandom).toBeCloseTo(0.1, 12);
    expect(r.seRandom).toBeCloseTo(Math.sqrt(0.01 / 3), 12);
  });
});

describe("consensus stage 1: each dataset summarised by its own fit", () => {
  it("uses the model its own analysis prefers, with the fitted ln k at its support temperatures", () => {
    const normal = makeNormal(17);
    const sets = [
      makeSet("straight", normal, { truth: { A: 2e-12, Ea: 12000 } }),
      makeSet("curved", normal, { n: 16, T1: 200, T2: 2000, sd: 0.01, truth: { A: 1e-13, n: 2.8, Ea: 4000 } }),
      makeSet("weighted", normal, { sigma: 0.05, n: 7 }),
      makeSet("three", normal, { n: 3 }),
    ];
    for (const s of sets) {
      const a = analyseDataset({ points: s.points, order: 2 });
      const sup = summariseDataset({ id: s.id, points: s.points, window: { Tmin: 0, Tmax: Infinity } }, 298.15)!;
      expect(sup.fit.model).toBe(a.band.model);
      expect(sup.temps[0]).toBe(a.band.T[0]);
      expect(sup.temps[sup.temps.length - 1]).toBe(a.band.T[a.band.T.length - 1]);
      // One support value per doubling of Tmax/Tmin, at least 3: 200–2000 K gets 5.
      expect(sup.temps).toHaveLength(s.id === "curved" ? 5 : 3);
      // The band starts and ends at the range ends: same ln k there.
      expect(sup.lnk[0]).toBeCloseTo(a.band.lnk[0], 9);
      expect(sup.lnk[sup.lnk.length - 1]).toBeCloseTo(a.band.lnk[a.band.lnk.length - 1], 9);
    }
  });

  it("carries the preferred fit's covariance (a straight set's is the Arrhenius one, rank 2) and is judged with the modified fit's", () => {
    const normal = makeNormal(23);
    const set = makeSet("u", normal, { n: 8 });
    const a = analyseDataset({ points: set.points, order: 2 });
    expect(a.band.model).toBe("arrhenius");
    const sup = summariseDataset({ id: "u", points: set.points, window: { Tmin: 0, Tmax: Infinity } }, 298.15)!;
    expect(sup.temps).toHaveLength(3);
    expect(sup.temps[1]).toBeCloseTo(2 / (1 / sup.temps[0] + 1 / sup.temps[2]), 10);
    // Values on the Arrhenius line; c = s²_Arrhenius·(t₆/z)²; covariance c·x₁ᵀ(XᵀX)⁻¹x₂ of the Arrhenius
    // fit (what its own analysis prefers), and the modified fit's for judging it against the others.
    const A = a.arrhenius.params;
    sup.temps.forEach((T, i) => expect(sup.lnk[i]).toBeCloseTo(A.lnA - A.Ea / (GAS_CONSTANT * T), 9));
    const c = a.arrhenius.residualSD! ** 2 * (t95(6) / Z95) ** 2;
    const cases = [
      { fit: a.arrhenius, cov: (i: number, j: number) => sup.cov[i * 3 + j], x: (T: number) => [1, -1 / (GAS_CONSTANT * T)] },
      {
        fit: a.modifiedArrhenius!,
        cov: (i: number, j: number) => ownCovariance(sup.judge, sup.temps[i], sup.temps[j]),
        x: (T: number) => [1, Math.log(T / 298.15), -1 / (GAS_CONSTANT * T)],
      },
    ];
    for (const { fit, cov, x } of cases) {
      const unscaled = fit.covariance!.map((row) => row.map((v) => v / fit.residualSD! ** 2));
      for (let i = 0; i < 3; i++) {
        for (let j = 0; j < 3; j++) {
          const [xi, xj] = [x(sup.temps[i]), x(sup.temps[j])];
          let q = 0;
          for (let r = 0; r < xi.length; r++) for (let k = 0; k < xi.length; k++) q += xi[r] * unscaled[r][k] * xj[k];
          expect(cov(i, j) / (c * q)).toBeCloseTo(1, 6);
        }
      }
    }
    // Rank 2: the values of a line have no curvature to carry.
    expect(symmetricEigen(sup.cov, 3).values.filter((v) => v > 1e-10 * Math.max(...sup.cov))).toHaveLength(2);
    // Two temperatures: the Arrhenius line's own 95 % band, as a normal variance (±1.96·√V = ±t·se).
    const pair = makeSet("p", normal, { n: 6 });
    pair.points = pair.points.map((p, i) => ({ ...p, T: i % 2 ? 400 : 250 }));
    const b = analyseDataset({ points: pair.points, order: 2 });
    const sup2 = summariseDataset({ id: "p", points: pair.points, window: { Tmin: 0, Tmax: Infinity } }, 298.15)!;
    expect(sup2.temps).toEqual([250, 400]);
    expect(Z95 * Math.sqrt(sup2.cov[0])).toBeCloseTo(b.band.lnk[0] - b.band.lower![0], 9);
    expect(Z95 * Math.sqrt(sup2.cov[3])).toBeCloseTo(b.band.lnk[49] - b.band.lower![49], 9);
  });

  it("never lets stated uncertainties shrink: the scale is max(1, χ²/dof)", () => {
    const normal = makeNormal(31);
    const tight = makeSet("tight", normal, { sd: 0.01, sigma: 0.05 });
    const sup = summariseDataset({ id: "t", points: tight.points, window: { Tmin: 0, Tmax: Infinity } }, 298.15)!;
    expect(sup.statedScale).toBe(1);
    const loose = makeSet("loose", normal, { sd: 0.2, sigma: 0.05 });
    const sup2 = summariseDataset({ id: "l", points: loose.points, window: { Tmin: 0, Tmax: Infinity } }, 298.15)!;
    expect(sup2.statedScale!).toBeCloseTo(analyseDataset({ points: loose.points, order: 2 }).arrhenius.chi2Reduced!, 8);
  });

  it("summarises one temperature by its mean and two points by the line through them, with a borrowed variance", () => {
    const normal = makeNormal(4);
    const room: ConsensusDataset = {
      id: "room",
      order: 2,
      points: [298, 298, 298].map((T) => ({ T, k: evaluateRateExpression(TRUE, T) * Math.exp(0.05 * normal()) })),
    };
    const pair: ConsensusDataset = {
      id: "pair",
      order: 2,
      points: [250, 350].map((T) => ({ T, k: evaluateRateExpression(TRUE, T) })),
    };
    const single: ConsensusDataset = { id: "single", order: 2, points: [{ T: 320, k: evaluateRateExpression(TRUE, 320), sigmaLnK: 0.1 }] };
    const c = consensus([makeSet("a", normal), makeSet("b", normal, { n: 8 }), room, pair, single]);
    expect(member(c, "room")).toMatchObject({ model: "single_temperature", scaleSource: "residuals" });
    expect(member(c, "room").support).toHaveLength(1);
    expect(member(c, "room").support[0].T).toBe(298);
    expect(member(c, "pair")).toMatchObject({ model: "arrhenius", scaleSource: "pooled" });
    expect(member(c, "pair").support.map((s) => s.T)).toEqual([250, 350]);
    expect(member(c, "single").support).toHaveLength(1);
    expect(member(c, "single").support[0].T).toBe(320);
    expect(member(c, "single").support[0].lnk).toBeCloseTo(Math.log(evaluateRateExpression(TRUE, 320)), 12);
    expect(member(c, "single").support[0].se).toBe(0.1);
    // A single temperature is compared at that temperature only, with the one-point bound 1.96.
    expect(member(c, "room").disagreement!.points.map((p) => p.T)).toEqual([298]);
    expect(member(c, "room").disagreement!.bound).toBeCloseTo(1.959964, 5);
    expectAllFinite(c);
  });
});

describe("consensus stage 2: GLS with V_j + τ²·I and DerSimonian–Laird τ²", () => {
  it("equals the dense GLS and the matrix DL estimator (checked with ml-matrix)", () => {
    const normal = makeNormal(11);
    const sets = [
      makeSet("a", normal, { n: 6, sd: 0.05, factor: 1.3 }),
      makeSet("b", normal, { n: 5, T1: 300, T2: 500, sd: 0.05, sigma: 0.04, factor: 0.8 }),
      makeSet("c", normal, { n: 12, T1: 200, T2: 1200, sd: 0.01, truth: { A: 1e-13, n: 2.8, Ea: 4000 } }),
      makeSet("d", normal, { n: 4, sd: 0.02, factor: 1.1, sigma: 0.03 }),
    ];
    const c = consensus(sets);
    expect(member(c, "c").model).toBe("modified_arrhenius");
    // Dense matrices from the reported support values and covariances.
    const ys: number[] = [];
    const F: number[][] = [];
    const blocks: { start: number; V: number[][] }[] = [];
    for (const m of c.members) {
      blocks.push({ start: ys.length, V: m.supportCovariance });
      for (const s of m.support) {
        ys.push(s.lnk);
        F.push([1, -1 / (GAS_CONSTANT * s.T)]);
      }
    }
    const N = ys.length;
    // V_j has the rank of its own fit (3 modified, 2 Arrhenius) however many support values: its
    // pseudo-inverse at τ² = 0, and as many independent rows.
    const rank = blocks.reduce((acc, b) => {
      const { values } = symmetricEigen(b.V.flat(), b.V.length);
      const top = Math.max(...values);
      return acc + values.filter((v) => v > 1e-10 * top).length;
    }, 0);
    expect(member(c, "c").support.length).toBe(4);
    expect(rank).toBe(c.members.reduce((acc, m) => acc + (m.model === "modified_arrhenius" ? 3 : 2), 0));
    expect(c.curveFrom).toEqual(["a", "b", "c", "d"]);
    const W = (tau2: number) => {
      const M = Matrix.zeros(N, N);
      for (const b of blocks) {
        const K = b.V.length;
        const Vt = new Matrix(b.V.map((row, i) => row.map((v, j) => v + (i === j ? tau2 : 0))));
        const Vi = tau2 > 0 ? inverse(Vt) : pseudoInverse(Vt, 1e-10);
        for (let i = 0; i < K; i++) for (let j = 0; j < K; j++) M.set(b.start + i, b.start + j, Vi.get(i, j));
      }
      return M;
    };
    const y = Matrix.columnVector(ys);
    const check = (
      X: Matrix,
      fit: { q: number; tau2: number; params: Record<string, number | null>; covariance: number[][] },
      order: string[],
    ) => {
      const p = X.columns;
      const gls = (w: Matrix) => {
        const cov = inverse(X.transpose().mmul(w).mmul(X));
        return { cov, beta: cov.mmul(X.transpose()).mmul(w).mmul(y) };
      };
      // DL: Q = rᵀV⁻¹r about the fixed-effect fit; tr P = tr W − tr((XᵀWX)⁻¹XᵀW²X).
      const W0 = W(0);
      const fixed = gls(W0);
      const r = y.clone().sub(X.mmul(fixed.beta));
      const Q = r.transpose().mmul(W0).mmul(r).get(0, 0);
      const trP = W0.trace() - fixed.cov.mmul(X.transpose().mmul(W0).mmul(W0).mmul(X)).trace();
      const tau2 = Math.max(0, (Q - (rank - p)) / trP);
      expect(fit.q / Q).toBeCloseTo(1, 8);
      expect(fit.tau2).toBeGreaterThan(0);
      expect(fit.tau2 / tau2).toBeCloseTo(1, 8);
      const random = gls(W(tau2));
      // Published order [lnA, (n,) Ea]; dense columns [1, −1/(RT), (ln(T/T0))].
      const idx = order.map((name) => ["lnA", "Ea", "n"].indexOf(name));
      order.forEach((name, a) => {
        expect((fit.params[name] as number) / random.beta.get(idx[a], 0)).toBeCloseTo(1, 8);
        order.forEach((_, b) => expect(fit.covariance[a][b] / random.cov.get(idx[a], idx[b])).toBeCloseTo(1, 7));
      });
    };
    check(new Matrix(F), c.arrhenius, ["lnA", "Ea"]);
    const F3 = F.map((row) => [...row, Math.log(-1 / (GAS_CONSTANT * row[1]) / 298.15)]);
    check(new Matrix(F3), c.modifiedArrhenius!, ["lnA", "n", "Ea"]);
  });

  it("with one dataset reproduces its own Arrhenius fit, with the covariance of its support values", () => {
    const set = makeSet("only", makeNormal(3), { n: 14, truth: { A: 2.45e-12, Ea: 14757.67 } });
    const c = consensus([set]);
    const a = analyseDataset({ points: set.points, order: 2 }).arrhenius;
    expect(c.arrhenius.params.Ea / a.params.Ea).toBeCloseTo(1, 9);
    expect(c.arrhenius.params.lnA).toBeCloseTo(a.params.lnA, 9);
    expect(c.arrhenius.tau2).toBe(0);
    const widen = (t95(12) / Z95) ** 2;
    for (let i = 0; i < 2; i++)
      for (let j = 0; j < 2; j++) expect(c.arrhenius.covariance[i][j] / (widen * a.covariance![i][j])).toBeCloseTo(1, 8);
    expect(member(c, "only").disagreement).toBeNull();
    expect(member(c, "only").verdict).toMatch(/only dataset in the consensus/);
    expect(c.flags.map((f) => f.code)).toEqual(["few_datasets"]);
  });

  it("diagonalises small covariances exactly (Jacobi)", () => {
    const A = [4, 1, 0.5, 1, 3, 0.2, 0.5, 0.2, 2];
    const { values, vectors } = symmetricEigen(A, 3);
    for (let i = 0; i < 3; i++) {
      for (let r = 0; r < 3; r++) {
        let Av = 0;
        for (let k = 0; k < 3; k++) Av += A[r * 3 + k] * vectors[k * 3 + i];
        expect(Av).toBeCloseTo(values[i] * vectors[r * 3 + i], 13);
      }
    }
    expect(values.reduce((a, b) => a + b, 0)).toBeCloseTo(9, 13);
  });

  it("merges prefix and suffix factors for many datasets: close to the exact leave-one-out fits", () => {
    const normal = makeNormal(41);
    const sets = Array.from({ length: 30 }, (_, j) => makeSet(`s${j}`, normal, { n: 6, factor: Math.exp(0.2 * normal()) }));
    const supports = sets.map((s) => summariseDataset({ id: s.id, points: s.points, window: { Tmin: 0, Tmax: Infinity } }, 298.15));
    const rows = buildRows(supports, 298.15);
    const blocks = sets.map((_, j) => j);
    const full = fitModel(rows, blocks, 2)!;
    expect(full.tau2).toBeGreaterThan(0);
    const exact = leaveOneOutFits(rows, blocks, 2, full, true);
    const approx = leaveOneOutFits(rows, blocks, 2, full, false);
    for (let i = 0; i < blocks.length; i++) {
      expect(approx[i]!.tau2).toBe(exact[i]!.tau2);
      expect(approx[i]!.beta[0]).toBeCloseTo(exact[i]!.beta[0], 2);
      // The exact one is the fit of the others at their own τ².
      const others = blocks.filter((j) => j !== i);
      const direct = fitModel(rows, others, 2)!;
      expect(exact[i]!.beta[0]).toBeCloseTo(direct.beta[0], 10);
      expect(exact[i]!.beta[1]).toBeCloseTo(direct.beta[1], 10);
      expect(exact[i]!.tau2).toBeCloseTo(direct.tau2, 12);
    }
  });
});

describe("consensus: constructed cases with a known answer", () => {
  /** Three measured sets from TRUE with noise, one wide computed set with another curvature. */
  function baseSets(seed: number, delta = 0.5, normal = makeNormal(mixSeed(seed))): ConsensusDataset[] {
    return [
      makeSet("m1", normal, { n: 10, T1: 220, T2: 420, sd: 0.05, sigma: 0.05 }),
      makeSet("m2", normal, { n: 8, T1: 250, T2: 400, sd: 0.06 }),
      makeSet("m3", normal, { n: 9, T1: 230, T2: 380, sd: 0.05, sigma: 0.05 }),
      computedSet("calc", normal, delta),
    ];
  }

  /**
   * Many seeds, judged against what chance allows (200 seeds; the computed set's temperature
   * exponent n off by δ). Three statements:
   * - Measured sets flagged in at most 5 % of their verdicts: each verdict is a family-level 0.05
   *   test (Bonferroni over its comparison temperatures), so a correct model flags a set that agrees
   *   with the truth in at most 5 % of cases (fewer where the Bonferroni bound is conservative).
   * - The consensus lies inside every measured set's 95 % band over its range (the band of its own
   *   analysis) not significantly less often than the true curve itself: McNemar's one-sided test at
   *   5 % on the seeds where exactly one of the two lies inside all three bands (b = truth only,
   *   c = consensus only; (b − c)/√(b + c) < 1.645). The truth is inside all three only in about
   *   58 % of seeds, so "inside in every seed" would be a wrong requirement; with δ = 0 the consensus
   *   must do at least as well as the truth.
   * - A measured set shifted by a factor 3 is flagged in every seed and every δ, above, with a mean
   *   factor within [2, 4.5].
   * About 2.5 s alone; the longer timeout is for a machine busy with other test files.
   */
  it("flags measured sets no more often than chance allows and lies in their bands as often as the truth does (200 seeds, δ = 0, 0.5; δ = 1 near it)", () => {
    const SEEDS = 200;
    const measured = ["m1", "m2", "m3"];
    const tally = new Map<number, { flags: number; inside: number; truthOnly: number; consensusOnly: number }>();
    let truthInside = 0;
    let shifted = 0;
    const missed: string[] = [];
    for (let seed = 1; seed <= SEEDS; seed++) {
      // The measured sets come first from the stream, so they are the same for every δ.
      const base = baseSets(seed, 0);
      const bands = base.slice(0, 3).map((s) => analyseDataset({ points: s.points, order: 2 }).band);
      const inside = (lnk: (T: number) => number) =>
        bands.every((band) => band.T.every((T, i) => lnk(T) > band.lower![i] && lnk(T) < band.upper![i]));
      const truthIn = inside((T) => Math.log(evaluateRateExpression(TRUE, T)));
      if (truthIn) truthInside++;
      for (const delta of [0, 0.5, 1]) {
        const c = consensus(delta === 0 ? base : baseSets(seed, delta));
        const t = tally.get(delta) ?? { flags: 0, inside: 0, truthOnly: 0, consensusOnly: 0 };
        t.flags += measured.filter((id) => member(c, id).disagreement!.off).length;
        const consensusIn = inside((T) => lnkOf(c, T));
        if (consensusIn) t.inside++;
        if (truthIn && !consensusIn) t.truthOnly++;
        if (consensusIn && !truthIn) t.consensusOnly++;
        tally.set(delta, t);
      }
      for (const delta of [0, 0.5, 1]) {
        const sets = baseSets(seed, delta);
        sets[1] = { ...sets[1], points: sets[1].points.map((p) => ({ ...p, k: p.k * 3 })) };
        const d = member(consensus(sets), "m2").disagreement!;
        const factor = 10 ** d.meanOffsetLog10;
        // Off, above wherever it is off, by a factor near 3.
        if (d.off && factor >= 2 && factor <= 4.5 && d.points.every((p) => p.agrees || p.z > 0)) shifted++;
        else missed.push(`seed ${seed}, δ = ${delta}: off ${d.off}, factor ${factor.toFixed(2)}`);
      }
    }
    for (const [delta, t] of tally) {
      expect(t.flags, `measured sets flagged at δ = ${delta}`).toBeLessThanOrEqual(0.05 * 3 * SEEDS);
      const n = t.truthOnly + t.consensusOnly;
      const mcnemar = n > 0 ? (t.truthOnly - t.consensusOnly) / Math.sqrt(n) : 0;
      // At δ = 1 the computed set is about 5 % off the truth over the measured range, with scatter 1 %.
      // The decision to set a dataset aside is family-wise (one Bonferroni bound over every comparison
      // of every included dataset, so that correct datasets are set aside in about 5 % of consensuses,
      // not 5 % per dataset); it sets this set aside in 26 of these 200 seeds (81 with a bound per
      // dataset), so the consensus follows it more often: inside every measured band in 130 seeds,
      // the truth in 148. The per-dataset words still call it off (59 seeds). Below δ = 1 the
      // consensus is as good as the truth; at δ = 1 it must stay inside in at least 60 % of seeds.
      if (delta < 1) {
        expect(mcnemar, `consensus inside ${t.inside}, truth ${truthInside} of ${SEEDS} at δ = ${delta}`).toBeLessThan(1.645);
      } else {
        expect(t.inside, `consensus inside ${t.inside}, truth ${truthInside} of ${SEEDS} at δ = ${delta}`).toBeGreaterThanOrEqual(
          0.6 * SEEDS,
        );
      }
      if (delta === 0) expect(t.inside).toBeGreaterThanOrEqual(truthInside);
    }
    expect(missed, "the ×3 set, every seed and δ").toEqual([]);
    expect(shifted).toBe(3 * SEEDS);
  }, 30_000);

  /**
   * Every set from one curved truth (modified Arrhenius, n = 2.5, invented): three narrow measured
   * sets, each too narrow to show the curvature on its own (their own analyses prefer a straight
   * line in most seeds), and one precise computed set over 200–2000 K that shows it plainly. A
   * straight line's values are off a curved truth at its ends and middle by more than the line's
   * own variance, so each set is judged by its modified fit (values and covariance), and the only
   * curved set is judged against the others' modified consensus of those fits. Measured sets are
   * flagged no more often than the family level allows (5 % of 600 verdicts, as above).
   *
   * Every set is correct, so every set aside is a false alarm. The choice of whom to set aside is
   * scored in the curve the data agree on: the three narrow sets together show the curvature on
   * their own (their modified fits' values and covariance) in most seeds, and then removals are
   * scored by the modified fit. Scored against a straight line always, the wide set was set aside
   * in 32 of these 200 seeds (173 of 1000): its curvature alone gave every rest that held it a large
   * Q, so it left whenever any set was off by chance. Now 8 of 200 (43 of 1000: 28 where the wide
   * set is itself off by chance — the off test's family level is 5 % — and 13 where the narrow sets'
   * curvature is not significant without it, so the straight score applies). Bounds: the wide set at
   * most the family level 5 % of 200, all four sets at most 5 % of their 800 verdicts.
   */
  it("does not flag correct narrow sets when the true curve bends and only the wide set shows it (200 seeds)", () => {
    const CURVED: RateExpression = { A: 3.0e-13, n: 2.5, Ea: 8000, T0: 298.15 };
    let flagged = 0;
    let wideSetAside = 0;
    let setAside = 0;
    for (let seed = 1; seed <= 200; seed++) {
      const normal = makeNormal(mixSeed(seed));
      const c = consensus([
        makeSet("m1", normal, { n: 10, T1: 220, T2: 420, sd: 0.05, sigma: 0.05, truth: CURVED }),
        makeSet("m2", normal, { n: 8, T1: 250, T2: 400, sd: 0.06, truth: CURVED }),
        makeSet("m3", normal, { n: 9, T1: 230, T2: 380, sd: 0.05, sigma: 0.05, truth: CURVED }),
        makeSet("calc", normal, { n: 16, T1: 200, T2: 2000, sd: 0.01, truth: CURVED }),
      ]);
      flagged += ["m1", "m2", "m3"].filter((id) => member(c, id).disagreement!.off).length;
      if (member(c, "calc").setAside) wideSetAside++;
      setAside += c.members.filter((m) => m.setAside).length;
    }
    expect(flagged).toBeLessThanOrEqual(0.05 * 3 * 200);
    expect(wideSetAside, "the correct wide set set aside").toBeLessThanOrEqual(0.05 * 200);
    expect(setAside, "correct sets set aside").toBeLessThanOrEqual(0.05 * 4 * 200);
  }, 30_000);

  /**
   * A measured set ×3 among two correct ones (220–700 K, σ = 0.1) and a computed set over
   * 200–2000 K with a curvature ln(k/k_true) = 0.3·ln²(T/600) (invented). The ×3 set is set aside
   * first; what remains is judged again. Choosing by one dataset's z set aside a correct measured
   * set and kept the computed one in 33 of 300 seeds (seed 21 the first): with three left, a
   * correct set can be the one off the other two while the computed set's curve carries them.
   * Choosing by the consistency of what remains (Cox 2007) keeps both correct sets.
   */
  function curvedComputedSets(seed: number): ConsensusDataset[] {
    const normal = makeNormal(seed);
    return [
      makeSet("m1", normal, { n: 8, T1: 220, T2: 420, sd: 0.1, sigma: 0.1, factor: 3 }),
      makeSet("m2", normal, { n: 8, T1: 250, T2: 500, sd: 0.1, sigma: 0.1 }),
      makeSet("m3", normal, { n: 8, T1: 300, T2: 700, sd: 0.1, sigma: 0.1 }),
      makeSet("calc", normal, { n: 15, T1: 200, T2: 2000, sd: 0.05, sigma: 0.05, factor: (T) => Math.exp(0.3 * Math.log(T / 600) ** 2) }),
    ];
  }

  it("sets aside the dataset whose removal leaves the rest most consistent, not a correct measured set (Cox 2007)", () => {
    const c = consensus(curvedComputedSets(21));
    expect(member(c, "m1").setAside).toBe(true);
    expect(member(c, "m2").included).toBe(true);
    expect(member(c, "m3").included).toBe(true);
    let correctSetAside = 0;
    let m1Kept = 0;
    for (let seed = 1; seed <= 60; seed++) {
      const r = consensus(curvedComputedSets(seed));
      if (!member(r, "m2").included || !member(r, "m3").included) correctSetAside++;
      if (member(r, "m1").included) m1Kept++;
    }
    // Seed 53 keeps everything: without m1 the computed set is off m2 and m3 at the family-wise
    // bound, and removing m1 with it leaves two, as many as set aside, which is allowed only when the
    // two set aside disagree grossly between themselves.
    expect(m1Kept).toBeLessThanOrEqual(1);
    // One seed of 60 (24) sets m2 aside with m1: without m1, m2 reads 0.8 of the consensus of m3 and
    // the computed set (z = −3.36, beyond the family-wise bound), while the computed set is not off
    // the consensus of m2 and m3 (z = 1.82), so only {m1, m2} leaves a rest that agrees with each
    // dataset set aside off it. The set-aside is one search over removal sets now, not one at a time.
    expect(correctSetAside).toBeLessThanOrEqual(1);
  });

  it("does not say the others' consensus rests on a dataset at a temperature outside that dataset's range", () => {
    for (let seed = 1; seed <= 60; seed++) {
      for (const m of consensus(curvedComputedSets(seed)).members) {
        const r = m.disagreement?.restsOn;
        if (!r) continue;
        const ds = r.id;
        expect(r.inRange, `${m.id} seed ${seed}`).toBe(r.T >= r.Tmin * (1 - 1e-12) && r.T <= r.Tmax * (1 + 1e-12));
        if (r.inRange) {
          expect(m.verdict).toContain(`rests ${Math.round(r.share * 100)} % on dataset ${ds} there`);
        } else {
          expect(m.verdict).not.toMatch(/rests \d+ % on/);
          expect(m.verdict).toContain(`is an extrapolation of dataset ${ds}`);
        }
      }
    }
    // A dataset at 300–360 K (×2) against a precise set at 445–507 K and two wide imprecise ones
    // (invented): at the worst comparison temperature the others' curve is mostly d1, extrapolated.
    const normal = makeNormal(2);
    const c = consensus([
      makeSet("t", normal, { n: 8, T1: 300, T2: 360, sd: 0.05, sigma: 0.05, factor: 2 }),
      makeSet("d1", normal, { n: 10, T1: 445, T2: 507, sd: 0.01, sigma: 0.01 }),
      makeSet("d2", normal, { n: 6, T1: 300, T2: 700, sd: 0.3, sigma: 0.3 }),
      makeSet("d3", normal, { n: 6, T1: 320, T2: 600, sd: 0.3, sigma: 0.3 }),
    ]);
    const t = member(c, "t");
    expect(t.disagreement!.restsOn).toMatchObject({ id: "d1", inRange: false });
    expect(t.disagreement!.restsOn!.share).toBeGreaterThan(2 / 3);
    expect(t.verdict).toMatch(
      /^Dataset t is off the consensus of the other 3 \(which at 3\d\d K is an extrapolation of dataset d1, measured at 445 K–507 K, with \d+ % of its weight\): /,
    );
    expect(t.verdict).not.toContain("rests");
  });

  it("flags a set shifted by a factor 3, above, by that factor, with the same activation energy", () => {
    const sets = baseSets(5, 0.5, makeNormal(5));
    sets[1] = { ...sets[1], points: sets[1].points.map((p) => ({ ...p, k: p.k * 3 })) };
    const c = consensus(sets);
    const m = member(c, "m2");
    const d = m.disagreement!;
    expect(d.off).toBe(true);
    for (const p of d.points) {
      expect(p.log10Ratio).toBeGreaterThan(Math.log10(2.4));
      expect(p.log10Ratio).toBeLessThan(Math.log10(3.7));
      expect(p.z).toBeGreaterThan(0);
    }
    expect(d.meanOffsetLog10).toBeCloseTo(Math.log10(3), 1);
    expect(d.activationEnergy).toBe("same");
    expect(m.verdict).toMatch(
      /^Dataset m2 is off the consensus of the other 3( \(which rests \d+ % on [^)]+\))?: a factor (2\.[6-9]\d|3\.[0-4]\d) above at 250 K, .* above at 400 K — about the same factor throughout/,
    );
    const flags = c.flags.filter((f) => f.code === "off_consensus");
    expect(flags.map((f) => f.datasetIds)).toEqual([["m2"]]);
    for (const id of ["m1", "m3"]) expect(member(c, id).disagreement!.off).toBe(false);
  });

  it("flags a set whose slope disagrees and says where: ×5 at the cold end, agreeing at the hot end", () => {
    const normal = makeNormal(8);
    const sets = [
      makeSet("a", normal, { sigma: 0.05 }),
      makeSet("b", normal, { n: 8, T1: 240, T2: 400 }),
      makeSet("c", normal, { n: 9, sigma: 0.05 }),
      // k × 5 at 220 K falling to × 1 at 420 K, linear in 1/T: a lower activation energy.
      makeSet("tilted", normal, { sd: 0.03, factor: (T) => 5 ** ((1 / T - 1 / 420) / (1 / 220 - 1 / 420)) }),
    ];
    const c = consensus(sets);
    const d = member(c, "tilted").disagreement!;
    expect(d.off).toBe(true);
    expect(d.points[0].T).toBe(220);
    expect(d.points[0].agrees).toBe(false);
    expect(d.points[0].ratio!).toBeGreaterThan(4);
    expect(d.points[0].ratio!).toBeLessThan(6.2);
    expect(d.points.at(-1)!.T).toBe(420);
    expect(d.points.at(-1)!.agrees).toBe(true);
    expect(d.activationEnergy).toBe("lower");
    expect(member(c, "tilted").verdict).toMatch(
      /^Dataset tilted is off the consensus of the other 3( \(which rests \d+ % on [^)]+\))?: a factor ([4-6]\.\d\d) above at 220 K, .*agrees at .*420 K: its activation energy is lower than the others'\. Off the consensus — not used for the curve\.$/,
    );
    const flag = c.flags.find((f) => f.code === "off_consensus")!;
    expect(flag.datasetIds).toEqual(["tilted"]);
    // Largest consistent subset: the set off the others' consensus does not shape the curve.
    expect(member(c, "tilted")).toMatchObject({ setAside: true, included: false, leftOut: "off the consensus — not used for the curve" });
    expect(c.curveFrom).toEqual(["a", "b", "c"]);
  });

  it("never flags a very precise set that agrees", () => {
    const normal = makeNormal(13);
    const sets = [
      makeSet("a", normal, { sd: 0.08 }),
      makeSet("b", normal, { n: 8, sd: 0.08, T1: 240, T2: 400 }),
      makeSet("c", normal, { n: 9, sd: 0.08 }),
      makeSet("precise", normal, { n: 30, sd: 0.002, sigma: 0.002 }),
    ];
    const c = consensus(sets);
    const m = member(c, "precise");
    expect(m.disagreement!.off).toBe(false);
    for (const p of m.disagreement!.points) expect(Math.abs(p.z)).toBeLessThan(m.disagreement!.bound);
    expect(c.flags.some((f) => f.datasetIds?.includes("precise"))).toBe(false);
    expect(m.verdict).toMatch(
      /^Dataset precise agrees with the consensus of the other 3( \(which rests \d+ % on [^)]+\))? (within its uncertainty )?at 220, 289 and 420 K/,
    );
  });

  it("says in words where two datasets disagree when only two are in the consensus", () => {
    const normal = makeNormal(2);
    const c = consensus([makeSet("a", normal, { sd: 0.02 }), makeSet("b", normal, { sd: 0.02, factor: 2 })]);
    expect(c.flags.map((f) => f.code).sort()).toEqual(["datasets_disagree", "datasets_disagree", "few_datasets"]);
    expect(member(c, "b").verdict).toMatch(
      /^Dataset b is off the only other dataset: a factor (1\.9\d|2\.[01]\d) above at 220 K, .* above at 420 K/,
    );
    expect(member(c, "a").verdict).toMatch(/^Dataset a is off the only other dataset: a factor (1\.9\d|2\.[01]\d) below at 220 K/);
  });

  it("judges two disagreeing datasets alike, a curved one by its own curve", () => {
    const normal = makeNormal(53);
    const curved = makeSet("curved", normal, {
      n: 16,
      T1: 200,
      T2: 2000,
      sd: 0.01,
      factor: (T) => (T / 298.15) ** 2.4 * Math.exp(2.4 * (1 - 298.15 / T)),
    });
    const c = consensus([makeSet("straight", normal), curved]);
    expect(member(c, "curved").model).toBe("modified_arrhenius");
    for (const id of ["straight", "curved"]) {
      const d = member(c, id).disagreement!;
      expect(d.off).toBe(true);
      // The other side is one dataset: its own fit, no between-dataset variance to hide behind.
      expect(d.tau2).toBe(0);
      expect(d.points[0].T).toBe(220);
      expect(Math.abs(d.points[0].log10Ratio)).toBeGreaterThan(Math.log10(4));
    }
    expect(member(c, "straight").disagreement!.model).toBe("modified_arrhenius");
    expect(member(c, "straight").disagreement!.activationEnergy).toBe("lower");
    expect(member(c, "curved").disagreement!.activationEnergy).toBe("higher");
    expect(c.flags.filter((f) => f.code === "datasets_disagree").map((f) => f.datasetIds![0])).toEqual(["straight", "curved"]);
  });

  it("does not compare a dataset the others do not overlap, and gives f(T) only where the data are", () => {
    const normal = makeNormal(19);
    const c = consensus([
      makeSet("a", normal),
      makeSet("b", normal, { n: 8 }),
      makeSet("c", normal, { n: 8, T1: 240, T2: 400 }),
      makeSet("hot", normal, { T1: 800, T2: 1200, n: 6 }),
    ]);
    const hot = member(c, "hot");
    expect(hot.disagreement!.range).toBeNull();
    expect(hot.disagreement!.points).toEqual([]);
    expect(hot.verdict).toMatch(
      /^Dataset hot \(800 K–1200 K\) lies outside the temperatures of the consensus of the other 3 \(220 K–420 K\): not compared\.$/,
    );
    expect(c.flags.find((f) => f.code === "not_compared")!.datasetIds).toEqual(["hot"]);
    const f = preferred(c).uncertaintyFactor;
    expect(f[0].T).toBe(220);
    expect(f.at(-1)!.T).toBe(1200);
    expect(f.every((u) => u.T >= 220 && u.T <= 1200)).toBe(true);
    expect(preferred(c).band.T[0]).toBe(220);
    expect(preferred(c).band.T.at(-1)).toBe(1200);
  });
});

describe("consensus: unit mistakes, window, exclusions, input errors", () => {
  it.each([
    ["a factor of N_A (molecule ↔ mol)", AVOGADRO],
    ["a factor of (N_A/1000) (L mol⁻¹ ↔ cm³ molecule⁻¹)", AVOGADRO * 1e-3],
    ["a factor of 10³ (L ↔ cm³)", 1e3],
    ["a factor of 10⁶ (m³ ↔ cm³)", 1e-6],
  ])("marks a dataset off by %s as unit_suspect and leaves it out", (label, factor) => {
    const normal = makeNormal(21);
    const sets = [makeSet("a", normal), makeSet("b", normal, { n: 7 }), makeSet("c", normal), makeSet("wrong", normal, { factor })];
    const c = consensus(sets);
    const flag = c.flags.find((f) => f.code === "unit_suspect")!;
    expect(flag.datasetIds).toEqual(["wrong"]);
    expect(flag.message).toContain(label);
    expect(flag.message).toContain("Left out of the consensus: a likely unit mistake");
    const wrong = member(c, "wrong");
    expect(wrong.included).toBe(false);
    expect(wrong.disagreement!.meanOffsetLog10).toBeCloseTo(Math.log10(factor), 1);
    expect(c.included).toBe(3);
    // The consensus is not dragged by the mistaken dataset.
    expect(Math.abs(lnkOf(c, 300) - Math.log(evaluateRateExpression(TRUE, 300)))).toBeLessThan(0.05);
    expect(c.flags.filter((f) => f.code === "off_consensus")).toEqual([]);
  });

  it("recognises unit-mistake factors per reaction order", () => {
    expect(matchUnitMistake(23.7, 2)).toMatch(/N_A/);
    expect(matchUnitMistake(-23.9, 2)).toMatch(/N_A/);
    expect(matchUnitMistake(3.1, 2)).toMatch(/10³/);
    expect(matchUnitMistake(6, 2)).toMatch(/10⁶/);
    expect(matchUnitMistake(47.56, 3)).toMatch(/N_A²/);
    expect(matchUnitMistake(12, 3)).toMatch(/10¹²/);
    expect(matchUnitMistake(1.0, 2)).toBeNull();
    expect(matchUnitMistake(23.78, 1)).toBeNull();
  });

  it("keeps only the points inside a temperature window and says what went in", () => {
    const normal = makeNormal(29);
    const sets = [makeSet("a", normal), makeSet("b", normal, { n: 8 }), makeSet("hot", normal, { T1: 600, T2: 900 })];
    const c = consensus(sets, { window: { Tmin: 250, Tmax: 380 } });
    expect(c.window).toEqual({ Tmin: 250, Tmax: 380 });
    expect(c.datasets).toBe(3);
    expect(c.included).toBe(2);
    const a = member(c, "a");
    expect(a.pointsGiven).toBe(10);
    expect(a.n).toBe(a.pointsGiven - sets[0].points.filter((p) => p.T < 250 || p.T > 380).length);
    expect(a.Tmin!).toBeGreaterThanOrEqual(250);
    expect(a.Tmax!).toBeLessThanOrEqual(380);
    expect(member(c, "hot")).toMatchObject({
      n: 0,
      included: false,
      leftOut: "no points inside the temperature window",
      disagreement: null,
    });
    expect(c.points).toBe(a.n + member(c, "b").n);
    expect(c.range.Tmin).toBeGreaterThanOrEqual(250);
    expect(c.range.Tmax).toBeLessThanOrEqual(380);
  });

  it("compares a dataset left out by the caller without letting it into the consensus", () => {
    const normal = makeNormal(37);
    const sets = [makeSet("a", normal), makeSet("b", normal, { n: 8 }), makeSet("c", normal), makeSet("x", normal, { factor: 3 })];
    const without = consensus(sets.slice(0, 3));
    const c = consensus([...sets.slice(0, 3), { ...sets[3], excludedReason: "superseded by a later measurement" }]);
    expect(member(c, "x")).toMatchObject({ included: false, leftOut: "superseded by a later measurement" });
    expect(member(c, "x").disagreement!.off).toBe(true);
    expect(member(c, "x").verdict).toMatch(
      /^Dataset x is off the consensus: .*Left out of the consensus: superseded by a later measurement\.$/,
    );
    // Equal up to rounding (the design is centred on every dataset's support temperatures).
    expect(c.arrhenius.params.Ea / without.arrhenius.params.Ea).toBeCloseTo(1, 12);
    expect(c.arrhenius.params.lnA).toBeCloseTo(without.arrhenius.params.lnA, 11);
  });

  it("handles a large dataset in one pass", () => {
    const normal = makeNormal(9);
    const c = consensus([makeSet("big", normal, { n: 200_000, T1: 200, T2: 1000 }), makeSet("small", normal)]);
    // A 5 % Bonferroni outlier test over 200 000 points may leave out a point by chance, never more than a few.
    const leftOut = member(c, "big").outliers.length + member(c, "small").outliers.length;
    expect(leftOut).toBeLessThanOrEqual(2);
    expect(c.points).toBe(200_010 - leftOut);
    expect(Math.abs(lnkOf(c, 400) - Math.log(evaluateRateExpression(TRUE, 400)))).toBeLessThan(0.01);
  });

  it("rejects mixed orders, bad points, repeated ids, bad windows and empty input with clear messages", () => {
    const normal = makeNormal(1);
    const a = makeSet("a", normal);
    expect(() => consensus([])).toThrow(/at least one dataset/);
    expect(() => consensus([a, { ...makeSet("b", normal), order: 3 }])).toThrow(/Dataset b is order 3 but dataset a is order 2/);
    expect(() => consensus([a, a])).toThrow(/Dataset a is given twice/);
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
    expect(() => consensus([a], { window: { Tmin: 400, Tmax: 300 } })).toThrow(/Tmin \(400 K\) must be below its Tmax \(300 K\)/);
    expect(() => consensus([a], { window: { Tmin: -5 } })).toThrow(/window's Tmin must be a positive temperature/);
    expect(() => consensus([a], { window: { Tmin: 1000 } })).toThrow(/No dataset has points between 1000 and ∞ K/);
    expect(() => consensus([{ ...a, excludedReason: "test" }])).toThrow(/Every dataset is left out/);
    const flat = (id: string): ConsensusDataset => ({
      id,
      order: 2,
      points: [
        { T: 300, k: 1e-12 },
        { T: 300, k: 2e-12 },
      ],
    });
    expect(() => consensus([flat("f1"), flat("f2")])).toThrow(/cover a single temperature/);
  });
});

describe("consensus: who carries the consensus", () => {
  it("gives each dataset's share in the prediction, the shares adding up to 1", async () => {
    const { buildRows: build, fitModel: fit, shareDirection, shareVectors } = await import("@/lib/kinetics/consensus-fit");
    const normal = makeNormal(43);
    const sets = [makeSet("a", normal), makeSet("b", normal, { n: 8, sigma: 0.05 }), computedSet("calc", normal)];
    const supports = sets.map((s) => summariseDataset({ id: s.id, points: s.points, window: { Tmin: 0, Tmax: Infinity } }, 298.15));
    const rows = build(supports, 298.15);
    const blocks = [0, 1, 2];
    for (const q of [2, 3] as const) {
      const f = fit(rows, blocks, q)!;
      const g = shareVectors(rows, blocks, f.weightTau2);
      for (const T of [200, 300, 420, 1500]) {
        const a = shareDirection(rows, f, T);
        const shares = blocks.map((j) => a[0] * g[3 * j] + a[1] * g[3 * j + 1] + a[2] * g[3 * j + 2]);
        expect(shares.reduce((x, y) => x + y, 0)).toBeCloseTo(1, 10);
      }
    }
  });

  it("reports every dataset's share at common temperatures (adding up to 1 at each), and each member's at its own stated temperature", () => {
    const normal = makeNormal(43);
    const sets = [makeSet("a", normal), makeSet("b", normal, { n: 8, sigma: 0.05, T1: 250, T2: 400 }), computedSet("calc", normal)];
    const c = consensus(sets);
    const temps = preferred(c)
      .uncertaintyFactor.filter((u) => u.T !== 298.15)
      .map((u) => u.T);
    expect(c.shares.map((r) => r.T)).toEqual(temps);
    for (const row of c.shares) {
      expect(row.shares.map((x) => x.id)).toEqual(["a", "b", "calc"]);
      // The GLS prediction is linear in the support values with weights summing to 1 (an intercept in the design).
      expect(row.shares.reduce((acc, x) => acc + x.share, 0)).toBeCloseTo(1, 10);
    }
    // A member's share is read at the middle of its own range in 1/T, so members' shares need not add up to 1.
    const b = member(c, "b");
    expect(b.shareT).toBeCloseTo(2 / (1 / 250 + 1 / 400), 9);
    // Where only the computed set speaks (2000 K), it carries the consensus alone.
    expect(c.shares.at(-1)!.shares.find((x) => x.id === "calc")!.share).toBeGreaterThan(0.9);
  });

  it("names datasets by their labels and says when the others' consensus rests on one of them", () => {
    const normal = makeNormal(47);
    const c = consensus([
      { ...makeSet("a", normal, { sd: 0.1 }), label: "“first measurement” (dataset 7)" },
      { ...makeSet("b", normal, { n: 30, sd: 0.003, sigma: 0.003 }), label: "“precise calculation” (dataset 8)" },
      { ...makeSet("c", normal, { sd: 0.1, factor: 3 }), label: "“third measurement” (dataset 9)" },
    ]);
    const third = member(c, "c");
    expect(third.disagreement!.restsOn!.id).toBe("b");
    expect(third.verdict).toMatch(
      /^“third measurement” \(dataset 9\) is off the consensus of the other 2 \(which rests \d+ % on “precise calculation” \(dataset 8\) there\): a factor/,
    );
  });
});

describe("consensus: a gross outlier of a dataset's own fit", () => {
  /**
   * Two measured sets from TRUE (8 points, stated 6 %), the first with its 5th point ×4, and a
   * precise computed set with Ea 10 kJ mol⁻¹ higher, equal to TRUE at 310 K (invented).
   */
  function sets(): ConsensusDataset[] {
    const normal = makeNormal(41);
    const m1 = makeSet("m1", normal, { n: 8, T1: 250, T2: 400, sd: 0.04, sigma: 0.06 });
    m1.points = m1.points.map((p, i) => (i === 4 ? { ...p, k: p.k * 4 } : p));
    const m2 = makeSet("m2", normal, { n: 8, T1: 260, T2: 410, sd: 0.04, sigma: 0.06 });
    const higher = (T: number) => Math.exp((-10000 / GAS_CONSTANT) * (1 / T - 1 / 310));
    const calc = makeSet("calc", normal, { n: 8, T1: 250, T2: 410, sd: 0.01, factor: higher });
    return [m1, m2, calc];
  }

  it("is flagged by the dataset's own analysis (the case the rule is for)", () => {
    const a = analyseDataset({ points: sets()[0].points, order: 2 });
    expect(a.flags.find((f) => f.code === "outlier")?.points).toEqual([4]);
    // Kept in, it would make the set say almost nothing: χ²/dof far above 1.
    expect(a.arrhenius.chi2Reduced!).toBeGreaterThan(20);
  });

  it("is left out of that dataset's summary, so the computed set is off (and set aside) and both measured sets agree", () => {
    const c = consensus(sets());
    const m1 = member(c, "m1");
    expect(member(c, "m2").disagreement!.off).toBe(false);
    expect(m1.outliers).toEqual([4]);
    expect(m1.n).toBe(7);
    expect(m1.pointsGiven).toBe(8);
    expect(m1.verdict).toMatch(/ Point 5, an outlier of its own fit, is left out of its summary\.$/);
    expect(member(c, "m2").outliers).toEqual([]);
    expect(member(c, "m2").verdict).not.toMatch(/outlier/);
    expect(m1.disagreement!.off).toBe(false);
    expect(member(c, "m2").disagreement!.off).toBe(false);
    const calc = member(c, "calc");
    expect(calc.disagreement!.off).toBe(true);
    expect(calc.disagreement!.activationEnergy).toBe("higher");
    // Off the consensus of the others, the computed set is set aside: the curve comes from the measured sets.
    expect(calc.setAside).toBe(true);
    expect(c.curveFrom).toEqual(["m1", "m2"]);
    expect(c.points).toBe(7 + 8);
    // Without the outlier m1's summary is its line through the other 7 points: close to TRUE.
    expect(Math.abs(m1.support[0].lnk - Math.log(evaluateRateExpression(TRUE, m1.support[0].T)))).toBeLessThan(0.1);
  });

  it("numbers the outlier as the reader sees it, and never drops a point of a set too small to test", () => {
    const [m1, m2, calc] = sets();
    const c = consensus([{ ...m1, pointNumbers: [3, 4, 5, 6, 9, 10, 11, 12] }, m2, calc]);
    expect(member(c, "m1").verdict).toMatch(/Point 9, an outlier of its own fit/);
    const small = consensus([{ ...m1, points: m1.points.slice(0, 5) }, m2, calc]);
    expect(member(small, "m1")).toMatchObject({ outliers: [], n: 5 });
  });
});

describe("consensus: outliers taken from a dataset's stored analysis", () => {
  it("gives the same result as analysing the dataset itself, and checks the indices it is given", () => {
    const normal = makeNormal(41);
    const m1 = makeSet("m1", normal, { n: 8, T1: 250, T2: 400, sd: 0.04, sigma: 0.06 });
    m1.points = m1.points.map((p, i) => (i === 4 ? { ...p, k: p.k * 4 } : p));
    const others = [makeSet("m2", normal, { n: 8, T1: 260, T2: 410, sd: 0.04 }), makeSet("m3", normal, { n: 9, sd: 0.05 })];
    const stored = analyseDataset({ points: m1.points, order: 2 }).flags.find((f) => f.code === "outlier")!.points!;
    const fresh = consensus([m1, ...others]);
    const given = consensus([{ ...m1, outliers: stored }, ...others]);
    expect(given).toEqual(fresh);
    expect(member(given, "m1").outliers).toEqual([4]);
    // An empty list is an answer too: nothing is left out.
    expect(member(consensus([{ ...m1, outliers: [] }, ...others]), "m1")).toMatchObject({ outliers: [], n: 8 });
    expect(() => consensus([{ ...m1, outliers: [8] }, ...others])).toThrow(
      /Dataset m1: outliers\[0\] must be the zero-based index of one of its 8 points \(got 8\)/,
    );
    expect(() => consensus([{ ...m1, outliers: [1.5] }, ...others])).toThrow(AnalysisError);
  });

  /**
   * Without stored outliers, a dataset's own outlier test is skipped only when the summary's fits
   * show it cannot find one (every point inside the bound of both fits with a margin). Many
   * invented datasets — straight and curved, weighted, unweighted and partly weighted, some with a
   * planted gross point — are screened and analysed: whenever the screen passes, the analysis
   * finds no outlier; and it passes on most clean sets (otherwise it would save nothing).
   */
  it("skips a dataset's own outlier test only when that test would find nothing", () => {
    let passed = 0;
    let clean = 0;
    for (let seed = 1; seed <= 400; seed++) {
      const normal = makeNormal(mixSeed(seed));
      const n = [6, 7, 9, 15, 40, 200][seed % 6];
      const planted = seed % 4 === 0;
      const set = makeSet("s", normal, {
        n,
        T1: 200 + (seed % 7) * 30,
        T2: 400 + (seed % 5) * 300,
        sd: 0.05,
        sigma: seed % 3 === 0 ? 0.05 : undefined,
        truth: seed % 2 === 0 ? TRUE : { A: 3.0e-13, n: 2.5, Ea: 8000, T0: 298.15 },
      });
      if (seed % 3 === 1) set.points = set.points.map((p, i) => (i % 2 === 0 ? { ...p, sigmaLnK: 0.05 } : p));
      if (planted)
        set.points = set.points.map((p, i) =>
          i === seed % n ? { ...p, k: p.k * Math.exp((seed % 8 < 4 ? 1 : -1) * (0.15 + (seed % 5) * 0.1)) } : p,
        );
      const s = summariseDataset({ id: "s", points: set.points, window: { Tmin: 0, Tmax: Infinity }, skip: null, screen: true }, 298.15)!;
      const found = analyseOutliers({ points: set.points, order: 2 });
      if (s.outlierFree) {
        passed++;
        expect(found, `seed ${seed}`).toEqual([]);
      }
      if (!planted && found.length === 0) clean++;
    }
    expect(passed).toBeGreaterThan(0.7 * clean);
  });
});

describe("consensus: two datasets judge each other alike", () => {
  it("mirrors z, the slope test and the verdict of A against B in B against A", () => {
    const normal = makeNormal(71);
    // B's activation energy 1.5 kJ mol⁻¹ lower over an overlapping range: a borderline slope, as in the demo.
    const a = makeSet("a", normal, { n: 8, T1: 200, T2: 300, sd: 0.04, sigma: 0.04 });
    const b = makeSet("b", normal, {
      n: 7,
      T1: 220,
      T2: 320,
      sd: 0.05,
      sigma: 0.05,
      truth: { A: 2.0e-12 * Math.exp(-1500 / (GAS_CONSTANT * 260)), Ea: 10500 },
    });
    for (const sets of [
      [a, b],
      [b, a],
    ]) {
      const c = consensus(sets);
      const da = member(c, "a").disagreement!;
      const db = member(c, "b").disagreement!;
      expect(da.points.map((p) => p.T)).toEqual(db.points.map((p) => p.T));
      da.points.forEach((p, i) => {
        expect(p.z).toBeCloseTo(-db.points[i].z, 12);
        expect(p.log10Ratio).toBeCloseTo(-db.points[i].log10Ratio, 12);
        expect(p.agrees).toBe(db.points[i].agrees);
      });
      expect(da.slopeZ!).toBeCloseTo(-db.slopeZ!, 12);
      const mirror = { lower: "higher", higher: "lower", same: "same" } as const;
      expect(db.activationEnergy).toBe(mirror[da.activationEnergy!]);
      expect(da.factorChanges).toBe(db.factorChanges);
      expect(da.tau2).toBe(0);
      expect(db.tau2).toBe(0);
      // One other dataset: its own words.
      for (const m of c.members) expect(m.verdict).not.toMatch(/the others'/);
    }
  });

  it("says the curvature differs when a curved set meets a straight one with the same ends, never 'about the same factor'", () => {
    const normal = makeNormal(29);
    // ln ratio 0 at 220 and 420 K, −0.35 in the middle (in 1/T): the same activation energy between the ends.
    const bow = (T: number) => {
      const x = (1 / T - 1 / 420) / (1 / 220 - 1 / 420);
      return Math.exp(-1.4 * x * (1 - x));
    };
    const sets = [
      makeSet("a", normal, { sd: 0.02, sigma: 0.02 }),
      makeSet("b", normal, { n: 9, sd: 0.02, sigma: 0.02 }),
      makeSet("c", normal, { n: 8, sd: 0.02, sigma: 0.02 }),
      makeSet("bent", normal, { n: 14, sd: 0.01, sigma: 0.01, factor: bow }),
    ];
    const c = consensus(sets);
    const d = member(c, "bent").disagreement!;
    expect(d.off).toBe(true);
    expect(d.activationEnergy).toBe("same");
    expect(d.factorChanges).toBe(true);
    expect(d.factorChangeP!).toBeLessThan(0.05);
    expect(member(c, "bent").verdict).toMatch(
      /: its curvature differs from the others': lower in the middle of its range than at its ends\. Off the consensus — not used for the curve\.$/,
    );
    expect(member(c, "bent").verdict).not.toMatch(/same factor/);
  });
});

describe("consensus: wide ranges get more support values, and the consensus follows the data where they are", () => {
  /** Three measured sets 220–420 K from TRUE with noise, and a computed set 200–2000 K with n 0.5 more (2.7 % off TRUE at 220 and 420 K). */
  function sets(seed: number): ConsensusDataset[] {
    const normal = makeNormal(seed);
    return [
      makeSet("m1", normal, { n: 10, T1: 220, T2: 420, sd: 0.05, sigma: 0.05 }),
      makeSet("m2", normal, { n: 8, T1: 250, T2: 400, sd: 0.06 }),
      makeSet("m3", normal, { n: 9, T1: 230, T2: 380, sd: 0.05, sigma: 0.05 }),
      computedSet("calc", normal),
    ];
  }

  it("gives 3 support values to 220–420 K and 5 to 200–2000 K, with a positive semi-definite covariance of its own fit's rank", () => {
    const c = consensus(sets(3));
    expect(member(c, "m1").support.map((s) => s.T)).toHaveLength(3);
    const calc = member(c, "calc");
    expect(calc.support.map((s) => Math.round(s.T))).toEqual([200, 258, 364, 615, 2000]);
    const { values } = symmetricEigen(calc.supportCovariance.flat(), 5);
    const top = Math.max(...values);
    for (const v of values) expect(v).toBeGreaterThan(-1e-12 * top);
    expect(values.filter((v) => v > 1e-10 * top)).toHaveLength(3);
    // Each dataset contributes as many independent rows as its own fit has coefficients: 3 × 2 for
    // the straight measured sets and 3 for the curved computed set, on 3 coefficients.
    expect(c.curveFrom).toEqual(["m1", "m2", "m3", "calc"]);
    expect(["m1", "m2", "m3", "calc"].map((id) => member(c, id).model)).toEqual([
      "arrhenius",
      "arrhenius",
      "arrhenius",
      "modified_arrhenius",
    ]);
    expect(c.modifiedArrhenius!.dof).toBe(3 * 2 + 3 - 3);
    expect(c.supportValues).toBe(3 * 3 + 5);
  });
});
