/**
 * Consensus expression for one reaction from several datasets, with a between-dataset
 * (random-effects) variance component.
 *
 * Model: ln k_ij = f(T_ij; β) + u_j + ε_ij, with u_j ~ N(0, τ²) the offset of dataset j and
 * ε_ij ~ N(0, σ_ij²) the scatter within it; f is Arrhenius (ln A − Ea/RT) or modified Arrhenius
 * (ln A + n ln(T/T0) − Ea/RT).
 *
 * Method, in order:
 * 1. Within-dataset variances: σ_ij = sigmaLnK when every point of dataset j states one;
 *    otherwise one σ_j per dataset, the residual SD of the dataset's own Arrhenius fit (the SD
 *    about its mean when it has one temperature), pooled over such datasets when a dataset has no
 *    spare points, never below 0.01 (1 %) and 0.1 when nothing can be estimated.
 * 2. One pass over the points builds, per dataset, weighted means and the R factor of its centred
 *    rows by Givens rotations (Golub & Van Loan 2013, §5.1.8–5.1.9): O(1) memory per dataset,
 *    no n×p matrix is ever formed and the normal equations are never used.
 * 3. τ² by the DerSimonian–Laird moment estimator (DerSimonian & Laird 1986, Control. Clin.
 *    Trials 7:177) applied to the dataset offsets about the fixed-effect (τ² = 0) fit.
 * 4. The random-effects GLS fit, min (y − Xβ)ᵀV⁻¹(y − Xβ) with V = diag(σ²) + τ²·blocks of 11ᵀ,
 *    solved exactly by quasi-demeaning each dataset with θ_j = 1 − 1/√(1 + τ²S_j), S_j = Σ 1/σ_ij²
 *    (the random-effects transformation of Fuller & Battese 1974; Wooldridge 2010, §10.7).
 *    Covariance (XᵀV⁻¹X)⁻¹: variances are treated as known, as in DerSimonian–Laird.
 * 5. Offsets: d_j = weighted mean of ln k_ij − f(T_ij; β̂) in dataset j (reported in log10).
 *    z-score: the externally standardised offset of Viechtbauer & Cheung (2010, Res. Synth.
 *    Methods 1:112), z_j = (d_j − μ̂₋ⱼ)/√(v_j + τ̂²₋ⱼ + Var μ̂₋ⱼ), v_j = 1/S_j, from a DL
 *    meta-analysis of the other datasets' offsets (curve shape held at the consensus).
 *    |z_j| > 2 flags the dataset as off the consensus.
 * 6. unit_suspect: |d_j − μ̂₋ⱼ| in log10 within 0.15 of a unit-mistake factor for the order m:
 *    N_A^(m−1), 10^(3(m−1)), 10^(6(m−1)), (N_A/10³)^(m−1), (N_A/10⁶)^(m−1). Such datasets are
 *    left out of the consensus (and the fit repeated) as long as one dataset remains.
 * 7. Bands and uncertainty factors include τ²: ln k̂(T) ± 1.96·√(xᵀCx + τ²), f(T) = exp(1.96·√(…)),
 *    normal quantile as in DerSimonian–Laird.
 * The preferred expression is the modified one when its n differs from 0 by more than 1.96 se.
 */
import { AnalysisError } from "./analysis-error";
import { AVOGADRO, GAS_CONSTANT, REFERENCE_TEMPERATURE } from "./constants";
import { assertReactionOrder, checkPoints, describe } from "./validate-points";
import type { RatePoint, ReactionOrder, Severity } from "./types";

/** One dataset of a reaction, in canonical units. */
export interface ConsensusDataset {
  id: string;
  points: readonly RatePoint[];
  order: ReactionOrder;
}

export interface ConsensusOptions {
  /** Reference temperature of the modified Arrhenius term, K (default 298.15). */
  T0?: number;
}

export type ConsensusFlagCode = "off_consensus" | "unit_suspect" | "few_datasets";

export interface ConsensusFlag {
  code: ConsensusFlagCode;
  severity: Severity;
  message: string;
  datasetIds?: string[];
}

/** Uncertainty factor f: k̂/f … k̂·f covers 95 % (between-dataset variance included). */
export interface UncertaintyFactor {
  /** K */
  T: number;
  f: number;
  /** True when T lies outside the temperatures of the data. */
  extrapolated: boolean;
}

interface ConsensusFitCommon {
  covariance: number[][];
  /** Between-dataset variance of ln k (DerSimonian–Laird). */
  tau2: number;
  /** Cochran's Q of the offsets about the fixed-effect fit. */
  q: number;
  /** Higgins I² = max(0, (Q − df)/Q), share of offset variance due to between-dataset differences. */
  i2: number;
  /** 95 % band of ln k including τ², 50 temperatures evenly spaced in 1/T over the data. */
  band: { T: number[]; lnk: number[]; lower: number[]; upper: number[] };
  /** At 298.15 K and at both ends of the range. */
  uncertaintyFactor: UncertaintyFactor[];
}

export interface ConsensusArrhenius extends ConsensusFitCommon {
  params: { lnA: number; A: number | null; Ea: number };
  se: { lnA: number; Ea: number };
}

export interface ConsensusModifiedArrhenius extends ConsensusFitCommon {
  params: { lnA: number; A: number | null; n: number; Ea: number; T0: number };
  se: { lnA: number; n: number; Ea: number };
}

/** How one dataset sits against the consensus (preferred expression). */
export interface ConsensusMember {
  id: string;
  n: number;
  /** Whether the dataset's own sigmaLnK were used. */
  weighted: boolean;
  /** σ(ln k) assumed for unweighted datasets; null for weighted ones. */
  sigmaLnK: number | null;
  /** Whether it contributes to the consensus (unit-suspect datasets do not). */
  included: boolean;
  /** Mean log10 residual versus the consensus. */
  offsetLog10: number;
  /** Offset versus the consensus of the other datasets, log10; null with one dataset. */
  offsetFromOthersLog10: number | null;
  /** Externally standardised offset; null with fewer than 2 other datasets. */
  zScore: number | null;
}

export interface ConsensusResult {
  order: ReactionOrder;
  T0: number;
  datasets: number;
  points: number;
  range: { Tmin: number; Tmax: number };
  method: string;
  arrhenius: ConsensusArrhenius;
  modifiedArrhenius: ConsensusModifiedArrhenius | null;
  preferred: "arrhenius" | "modified_arrhenius";
  members: ConsensusMember[];
  flags: ConsensusFlag[];
}

/** |z| above which a dataset is flagged as off the consensus. */
export const OFF_CONSENSUS_Z = 2;
/** Window (log10 units) around a unit-mistake factor. */
export const UNIT_SUSPECT_WINDOW = 0.15;
/** Smallest σ(ln k) assumed for a dataset without stated uncertainties. */
export const MIN_DATASET_SIGMA = 0.01;
/** σ(ln k) assumed when no dataset has spare points to estimate its scatter. */
export const DEFAULT_DATASET_SIGMA = 0.1;
const Z95 = 1.959963984540054;
const BAND_POINTS = 50;
const LOO_EXACT_LIMIT = 5000;

interface DatasetSummary {
  id: string;
  n: number;
  weighted: boolean;
  sigma: number | null;
  S: number; // Σ w
  mE: number;
  mL: number;
  mY: number;
  Tmin: number;
  Tmax: number;
  // Within-dataset R over centred columns [xE, xL, y] (upper triangle), weights applied.
  r: Float64Array;
}

interface ModelFit {
  p: number;
  beta: Float64Array; // [lnA, Ea] or [lnA, Ea, n]
  cov: Float64Array;
  tau2: number;
  q: number;
  i2: number;
  offsets: Float64Array;
}

/**
 * Consensus Arrhenius and modified Arrhenius expressions over several datasets of one reaction,
 * with a DerSimonian–Laird between-dataset variance (see the module comment for the method).
 * Linear in the number of points; throws {@link AnalysisError} on invalid input.
 *
 * @param datasets datasets with points in canonical units (T in K) and a common reaction order
 * @example consensus([{ id: "a", order: 2, points }, { id: "b", order: 2, points: others }]).arrhenius.params.Ea
 */
export function consensus(datasets: readonly ConsensusDataset[], options: ConsensusOptions = {}): ConsensusResult {
  if (!Array.isArray(datasets) || datasets.length === 0) {
    throw new AnalysisError("invalid_input", "A consensus needs at least one dataset.");
  }
  const order = datasets[0].order;
  assertReactionOrder(order, datasets[0].id);
  const T0 = options.T0 ?? REFERENCE_TEMPERATURE;
  if (!Number.isFinite(T0) || T0 <= 0) {
    throw new AnalysisError("invalid_reference_temperature", `T0 must be a positive temperature in kelvin (got ${describe(T0)}).`);
  }

  const summaries: DatasetSummary[] = [];
  let totalPoints = 0;
  let Tmin = Infinity;
  let Tmax = -Infinity;
  for (const ds of datasets) {
    assertReactionOrder(ds.order, ds.id);
    if (ds.order !== order) {
      throw new AnalysisError(
        "mixed_orders",
        `Dataset ${ds.id} is order ${ds.order} but dataset ${datasets[0].id} is order ${order}; a consensus combines datasets of one reaction.`,
        { datasetId: ds.id },
      );
    }
    const { allSigma } = checkPoints(ds.points, ds.id);
    if (ds.points.length === 0) {
      throw new AnalysisError("too_few_points", `Dataset ${ds.id} has no points.`, { datasetId: ds.id });
    }
    const s = summariseDataset(ds, allSigma, T0);
    summaries.push(s);
    totalPoints += s.n;
    Tmin = Math.min(Tmin, s.Tmin);
    Tmax = Math.max(Tmax, s.Tmax);
  }
  if (!(Tmax > Tmin)) {
    throw new AnalysisError(
      "too_few_temperatures",
      `All points are at ${Tmin} K; a consensus k(T) needs at least two different temperatures.`,
    );
  }
  assignDatasetSigmas(summaries);

  const included = summaries.map(() => true);
  let arr = fitModel(summaries, included, 2);
  if (!arr)
    throw new AnalysisError("too_few_temperatures", "The temperatures are too close together to fit a consensus Arrhenius expression.");
  let mod = fitModel(summaries, included, 3);
  let preferModified = isModifiedPreferred(mod);
  let loo = leaveOneOut(summaries, included, preferModified ? mod!.offsets : arr.offsets);

  // Datasets whose offset matches a unit mistake are left out and the consensus refitted once.
  const suspects = summaries.map((s, j) => (loo.fromOthers[j] === null ? null : matchUnitMistake(loo.fromOthers[j]! / Math.LN10, order)));
  const nSuspect = suspects.filter((m) => m !== null).length;
  if (nSuspect > 0 && nSuspect < summaries.length) {
    suspects.forEach((m, j) => {
      if (m) included[j] = false;
    });
    arr = fitModel(summaries, included, 2) ?? arr;
    mod = fitModel(summaries, included, 3);
    preferModified = isModifiedPreferred(mod);
    loo = leaveOneOut(summaries, included, preferModified ? mod!.offsets : arr.offsets);
  }
  const chosen = preferModified ? mod! : arr;

  const members: ConsensusMember[] = summaries.map((s, j) => ({
    id: s.id,
    n: s.n,
    weighted: s.weighted,
    sigmaLnK: s.weighted ? null : s.sigma,
    included: included[j],
    offsetLog10: chosen.offsets[j] / Math.LN10,
    offsetFromOthersLog10: loo.fromOthers[j] === null ? null : loo.fromOthers[j]! / Math.LN10,
    zScore: loo.z[j],
  }));

  const flags: ConsensusFlag[] = [];
  const nIncluded = included.filter(Boolean).length;
  if (nIncluded < 3) {
    flags.push({
      code: "few_datasets",
      severity: "info",
      message: `Only ${nIncluded} dataset${nIncluded === 1 ? "" : "s"} in the consensus: the between-dataset variance and the off-consensus check need at least 3 to mean much.`,
    });
  }
  suspects.forEach((m, j) => {
    if (!m) return;
    flags.push({
      code: "unit_suspect",
      severity: "warn",
      message: `Dataset ${summaries[j].id} is ${describeFactor(loo.fromOthers[j]! / Math.LN10)} ${loo.fromOthers[j]! > 0 ? "above" : "below"} the other datasets, close to ${m}: a likely unit mistake. It was ${included[j] ? "kept in" : "left out of"} the consensus; check its units.`,
      datasetIds: [summaries[j].id],
    });
  });
  const off = members.filter((m) => m.zScore !== null && Math.abs(m.zScore) > OFF_CONSENSUS_Z && m.included);
  for (const m of off) {
    flags.push({
      code: "off_consensus",
      severity: "warn",
      message: `Dataset ${m.id} lies ${describeFactor(m.offsetFromOthersLog10 ?? m.offsetLog10)} ${(m.offsetFromOthersLog10 ?? m.offsetLog10) > 0 ? "above" : "below"} the other datasets (z = ${m.zScore!.toFixed(1)}, beyond ±${OFF_CONSENSUS_Z}).`,
      datasetIds: [m.id],
    });
  }

  const range = { Tmin, Tmax };
  return {
    order,
    T0,
    datasets: summaries.length,
    points: totalPoints,
    range,
    method:
      "Random-effects GLS (DerSimonian–Laird τ², quasi-demeaned Givens QR); covariance (XᵀV⁻¹X)⁻¹; bands and f(T) at 95 % including τ².",
    arrhenius: buildArrhenius(arr, range, T0),
    modifiedArrhenius: mod ? buildModified(mod, range, T0) : null,
    preferred: preferModified ? "modified_arrhenius" : "arrhenius",
    members,
    flags,
  };
}

/** One pass over a dataset: weighted means, then Givens QR of its centred, weighted rows. */
function summariseDataset(ds: ConsensusDataset, weighted: boolean, T0: number): DatasetSummary {
  const pts = ds.points;
  const n = pts.length;
  const invR = 1 / GAS_CONSTANT;
  let S = 0;
  let sE = 0;
  let sL = 0;
  let sY = 0;
  let Tmin = Infinity;
  let Tmax = -Infinity;
  const xE = new Float64Array(n);
  const xL = new Float64Array(n);
  const y = new Float64Array(n);
  const w = weighted ? new Float64Array(n) : null;
  for (let i = 0; i < n; i++) {
    const { T, k } = pts[i];
    const wi = w ? 1 / ((pts[i].sigmaLnK as number) * (pts[i].sigmaLnK as number)) : 1;
    if (w) w[i] = wi;
    xE[i] = -invR / T;
    xL[i] = Math.log(T / T0);
    y[i] = Math.log(k);
    S += wi;
    sE += wi * xE[i];
    sL += wi * xL[i];
    sY += wi * y[i];
    if (T < Tmin) Tmin = T;
    if (T > Tmax) Tmax = T;
  }
  const mE = sE / S;
  const mL = sL / S;
  const mY = sY / S;
  const oneT = Tmin === Tmax; // centred temperature columns are exactly zero, not rounding noise
  let r00 = 0;
  let r01 = 0;
  let r02 = 0;
  let r11 = 0;
  let r12 = 0;
  let r22 = 0;
  for (let i = 0; i < n; i++) {
    const sw = w ? Math.sqrt(w[i]) : 1;
    let a = oneT ? 0 : sw * (xE[i] - mE);
    let b = oneT ? 0 : sw * (xL[i] - mL);
    let c = sw * (y[i] - mY);
    // Givens rotation of the new row into R (Golub & Van Loan 2013, Alg. 5.1.3).
    if (a !== 0) {
      const rho = Math.sqrt(r00 * r00 + a * a);
      const cs = r00 / rho;
      const sn = a / rho;
      r00 = rho;
      let t = r01;
      r01 = cs * t + sn * b;
      b = cs * b - sn * t;
      t = r02;
      r02 = cs * t + sn * c;
      c = cs * c - sn * t;
      a = 0;
    }
    if (b !== 0) {
      const rho = Math.sqrt(r11 * r11 + b * b);
      const cs = r11 / rho;
      const sn = b / rho;
      r11 = rho;
      const t = r12;
      r12 = cs * t + sn * c;
      c = cs * c - sn * t;
    }
    r22 = Math.sqrt(r22 * r22 + c * c);
  }
  return {
    id: ds.id,
    n,
    weighted,
    sigma: null,
    S,
    mE,
    mL,
    mY,
    Tmin,
    Tmax,
    r: Float64Array.of(r00, r01, r02, r11, r12, r22),
  };
}

/** Step 1 of the method: σ_j for datasets without stated uncertainties; rescale their R and S. */
function assignDatasetSigmas(summaries: DatasetSummary[]): void {
  let pooledRss = 0;
  let pooledDof = 0;
  const own: (number | null)[] = summaries.map((s) => {
    if (s.weighted) return null;
    // Own Arrhenius fit: RSS = r12² + r22² (the xL column dropped); one temperature → SD about the mean.
    const dof = s.n - (s.Tmin === s.Tmax ? 1 : 2);
    if (dof <= 0) return null;
    const rss = s.r[4] * s.r[4] + s.r[5] * s.r[5];
    pooledRss += rss;
    pooledDof += dof;
    return rss / dof;
  });
  const pooled = pooledDof > 0 ? pooledRss / pooledDof : DEFAULT_DATASET_SIGMA ** 2;
  summaries.forEach((s, j) => {
    if (s.weighted) return;
    const variance = Math.max(own[j] ?? pooled, MIN_DATASET_SIGMA ** 2);
    s.sigma = Math.sqrt(variance);
    const f = 1 / s.sigma;
    for (let k = 0; k < 6; k++) s.r[k] *= f;
    s.S = s.n / variance;
  });
}

/** Upper-triangular accumulator of rows by Givens rotations, m columns (last = response). */
class GivensAccumulator {
  readonly r: Float64Array;
  readonly colNorm2: Float64Array;
  private readonly row: Float64Array;

  constructor(readonly m: number) {
    this.r = new Float64Array(m * m);
    this.colNorm2 = new Float64Array(m);
    this.row = new Float64Array(m);
  }

  add(values: ArrayLike<number>, scale: number): void {
    const { m, r, row, colNorm2 } = this;
    for (let j = 0; j < m; j++) {
      row[j] = values[j] * scale;
      colNorm2[j] += row[j] * row[j];
    }
    for (let k = 0; k < m; k++) {
      const v = row[k];
      if (v === 0) continue;
      const d = r[k * m + k];
      const rho = Math.sqrt(d * d + v * v);
      const cs = d / rho;
      const sn = v / rho;
      r[k * m + k] = rho;
      for (let j = k + 1; j < m; j++) {
        const t = r[k * m + j];
        r[k * m + j] = cs * t + sn * row[j];
        row[j] = cs * row[j] - sn * t;
      }
    }
  }
}

/**
 * Fit the consensus with p = 2 (Arrhenius) or 3 (modified) coefficients: fixed-effect fit,
 * DerSimonian–Laird τ², then the random-effects fit. Returns null if the design is degenerate.
 */
function fitModel(summaries: DatasetSummary[], included: boolean[], p: 2 | 3): ModelFit | null {
  const fixed = solveGls(summaries, included, p, 0);
  if (!fixed) return null;
  // DerSimonian–Laird moment estimator on the offsets about the fixed-effect fit.
  let sumU = 0;
  let sumU2 = 0;
  let sumUd = 0;
  let sumUd2 = 0;
  let J = 0;
  summaries.forEach((s, j) => {
    if (!included[j]) return;
    const d = fixed.offsets[j];
    sumU += s.S;
    sumU2 += s.S * s.S;
    sumUd += s.S * d;
    sumUd2 += s.S * d * d;
    J++;
  });
  const q = Math.max(0, sumUd2 - (sumUd * sumUd) / sumU);
  const denom = sumU - sumU2 / sumU;
  const tau2 = J > 1 && denom > 0 ? Math.max(0, (q - (J - 1)) / denom) : 0;
  const i2 = q > J - 1 && q > 0 ? (q - (J - 1)) / q : 0;
  const random = tau2 > 0 ? solveGls(summaries, included, p, tau2) : fixed;
  if (!random) return null;
  return { p, beta: random.beta, cov: random.cov, tau2, q, i2, offsets: random.offsets };
}

/** GLS fit for a given τ² by quasi-demeaning (step 4); offsets for every dataset, included or not. */
function solveGls(
  summaries: DatasetSummary[],
  included: boolean[],
  p: 2 | 3,
  tau2: number,
): { beta: Float64Array; cov: Float64Array; offsets: Float64Array } | null {
  // Global centring of the temperature columns keeps the intercept column well conditioned.
  let sumS = 0;
  let ME = 0;
  let ML = 0;
  summaries.forEach((s, j) => {
    if (!included[j]) return;
    sumS += s.S;
    ME += s.S * s.mE;
    ML += s.S * s.mL;
  });
  ME /= sumS;
  ML /= sumS;
  const m = p + 1;
  const acc = new GivensAccumulator(m);
  const row = new Float64Array(m);
  summaries.forEach((s, j) => {
    if (!included[j]) return;
    const r = s.r; // [r00 r01 r02; · r11 r12; · · r22] over [xE, xL, y]
    // Within rows (intercept column 0 after centring).
    if (p === 3) {
      acc.add([0, r[0], r[1], r[2]], 1);
      acc.add([0, 0, r[3], r[4]], 1);
      acc.add([0, 0, 0, r[5]], 1);
    } else {
      acc.add([0, r[0], r[2]], 1);
      acc.add([0, 0, r[4]], 1);
      acc.add([0, 0, r[5]], 1);
    }
    // Mean row, weight √S·(1 − θ) with θ = 1 − 1/√(1 + τ²S): √S/√(1 + τ²S).
    const scale = Math.sqrt(s.S / (1 + tau2 * s.S));
    row[0] = 1;
    row[1] = s.mE - ME;
    if (p === 3) row[2] = s.mL - ML;
    row[m - 1] = s.mY;
    acc.add(row, scale);
  });
  const R = acc.r;
  for (let k = 0; k < p; k++) {
    if (!(R[k * m + k] > 1e-12 * Math.sqrt(acc.colNorm2[k]))) return null;
  }
  const betaC = new Float64Array(p);
  for (let k = p - 1; k >= 0; k--) {
    let s = R[k * m + p];
    for (let j = k + 1; j < p; j++) s -= R[k * m + j] * betaC[j];
    betaC[k] = s / R[k * m + k];
  }
  // (RᵀR)⁻¹ = R⁻¹R⁻ᵀ in centred coordinates.
  const inv = new Float64Array(p * p);
  for (let j = 0; j < p; j++) {
    inv[j * p + j] = 1 / R[j * m + j];
    for (let i = j - 1; i >= 0; i--) {
      let s = 0;
      for (let k = i + 1; k <= j; k++) s += R[i * m + k] * inv[k * p + j];
      inv[i * p + j] = -s / R[i * m + i];
    }
  }
  const cc = new Float64Array(p * p);
  for (let i = 0; i < p; i++) {
    for (let j = 0; j < p; j++) {
      let s = 0;
      for (let k = Math.max(i, j); k < p; k++) s += inv[i * p + k] * inv[j * p + k];
      cc[i * p + j] = s;
    }
  }
  // Undo the centring: β0 = β0c − Σ M_k β_k; C = J·Cc·Jᵀ with J's first row [1, −M…].
  const M = p === 3 ? [ME, ML] : [ME];
  const beta = betaC.slice();
  for (let k = 1; k < p; k++) beta[0] -= M[k - 1] * betaC[k];
  const jrow = [1, ...M.map((v) => -v)];
  const cov = cc.slice();
  let c00 = 0;
  for (let a = 0; a < p; a++) for (let b = 0; b < p; b++) c00 += jrow[a] * cc[a * p + b] * jrow[b];
  cov[0] = c00;
  for (let k = 1; k < p; k++) {
    let s = 0;
    for (let a = 0; a < p; a++) s += jrow[a] * cc[a * p + k];
    cov[k] = s;
    cov[k * p] = s;
  }
  const offsets = new Float64Array(summaries.length);
  summaries.forEach((s, j) => {
    let fit = beta[0] + beta[1] * s.mE;
    if (p === 3) fit += beta[2] * s.mL;
    offsets[j] = s.mY - fit;
  });
  return { beta, cov, offsets };
}

function isModifiedPreferred(mod: ModelFit | null): boolean {
  if (!mod) return false;
  const se = Math.sqrt(mod.cov[2 * 3 + 2]);
  return se > 0 && Math.abs(mod.beta[2] / se) > Z95;
}

/**
 * Step 5: for each dataset, the DL random-effects mean of the other included datasets' offsets,
 * and the externally standardised offset. Exact O(J²) up to 5000 datasets; beyond that the
 * others' τ² is approximated by the overall one.
 */
function leaveOneOut(
  summaries: DatasetSummary[],
  included: boolean[],
  offsets: Float64Array,
): { fromOthers: (number | null)[]; z: (number | null)[] } {
  const J = summaries.length;
  const fromOthers: (number | null)[] = new Array(J).fill(null);
  const z: (number | null)[] = new Array(J).fill(null);
  const idx = summaries.map((_, j) => j).filter((j) => included[j]);
  const u = summaries.map((s) => s.S);
  let totU = 0;
  let totU2 = 0;
  let totUd = 0;
  let totUd2 = 0;
  for (const i of idx) {
    totU += u[i];
    totU2 += u[i] * u[i];
    totUd += u[i] * offsets[i];
    totUd2 += u[i] * offsets[i] * offsets[i];
  }
  const exact = idx.length <= LOO_EXACT_LIMIT;
  const tauAll = dlTau2(totU, totU2, totUd, totUd2, idx.length);
  for (let j = 0; j < J; j++) {
    const self = included[j] ? 1 : 0;
    const others = idx.length - self;
    if (others < 1) continue;
    const sU = totU - self * u[j];
    const sU2 = totU2 - self * u[j] * u[j];
    const sUd = totUd - self * u[j] * offsets[j];
    const sUd2 = totUd2 - self * u[j] * offsets[j] * offsets[j];
    const tau2 = exact ? dlTau2(sU, sU2, sUd, sUd2, others) : tauAll;
    let wSum = 0;
    let wd = 0;
    for (const i of idx) {
      if (i === j) continue;
      const wi = 1 / (1 / u[i] + tau2);
      wSum += wi;
      wd += wi * offsets[i];
    }
    const mu = wd / wSum;
    fromOthers[j] = offsets[j] - mu;
    if (others >= 2) z[j] = (offsets[j] - mu) / Math.sqrt(1 / u[j] + tau2 + 1 / wSum);
  }
  return { fromOthers, z };
}

function dlTau2(sU: number, sU2: number, sUd: number, sUd2: number, k: number): number {
  if (k < 2 || !(sU > 0)) return 0;
  const q = Math.max(0, sUd2 - (sUd * sUd) / sU);
  const denom = sU - sU2 / sU;
  return denom > 0 ? Math.max(0, (q - (k - 1)) / denom) : 0;
}

/** Step 6: the unit mistake whose factor (log10) lies within the window of |offset|, if any. */
export function matchUnitMistake(offsetLog10: number, order: ReactionOrder): string | null {
  const m = order - 1;
  if (m === 0) return null;
  const lgNA = Math.log10(AVOGADRO);
  const candidates: [number, string][] = [
    [m * lgNA, `a factor of N_A${m > 1 ? "²" : ""} (molecule ↔ mol)`],
    [3 * m, `a factor of 10^${3 * m} (L ↔ cm³)`],
    [6 * m, `a factor of 10^${6 * m} (m³ ↔ cm³)`],
    [m * (lgNA - 3), `a factor of (N_A/1000)${m > 1 ? "²" : ""} (L mol⁻¹ ↔ cm³ molecule⁻¹)`],
    [m * (lgNA - 6), `a factor of (N_A/10⁶)${m > 1 ? "²" : ""} (m³ mol⁻¹ ↔ cm³ molecule⁻¹)`],
  ];
  const a = Math.abs(offsetLog10);
  for (const [c, label] of candidates) if (Math.abs(a - c) <= UNIT_SUSPECT_WINDOW) return label;
  return null;
}

function describeFactor(log10: number): string {
  const a = Math.abs(log10);
  return a < 3 ? `a factor of ${(10 ** a).toPrecision(3)}` : `a factor of 10^${a.toFixed(2)}`;
}

function gridT(Tmin: number, Tmax: number): number[] {
  const T = new Array<number>(BAND_POINTS);
  for (let i = 0; i < BAND_POINTS; i++) {
    T[i] = i === 0 ? Tmin : i === BAND_POINTS - 1 ? Tmax : 1 / (1 / Tmin + ((1 / Tmax - 1 / Tmin) * i) / (BAND_POINTS - 1));
  }
  return T;
}

function designRow(T: number, p: number, T0: number): number[] {
  const x = [1, -1 / (GAS_CONSTANT * T)];
  if (p === 3) x.push(Math.log(T / T0));
  return x;
}

function predict(fit: ModelFit, T: number, T0: number): { lnk: number; half: number } {
  const x = designRow(T, fit.p, T0);
  let lnk = 0;
  let v = 0;
  for (let a = 0; a < fit.p; a++) {
    lnk += fit.beta[a] * x[a];
    for (let b = 0; b < fit.p; b++) v += x[a] * fit.cov[a * fit.p + b] * x[b];
  }
  return { lnk, half: Z95 * Math.sqrt(Math.max(0, v) + fit.tau2) };
}

function commonParts(fit: ModelFit, range: { Tmin: number; Tmax: number }, T0: number): ConsensusFitCommon {
  const p = fit.p;
  const T = gridT(range.Tmin, range.Tmax);
  const lnk: number[] = [];
  const lower: number[] = [];
  const upper: number[] = [];
  for (const t of T) {
    const { lnk: v, half } = predict(fit, t, T0);
    lnk.push(v);
    lower.push(v - half);
    upper.push(v + half);
  }
  const factorAt = (t: number): UncertaintyFactor => ({
    T: t,
    f: Math.exp(predict(fit, t, T0).half),
    extrapolated: t < range.Tmin || t > range.Tmax,
  });
  const covariance = Array.from({ length: p }, (_, a) => Array.from({ length: p }, (_, b) => fit.cov[a * p + b]));
  return {
    covariance,
    tau2: fit.tau2,
    q: fit.q,
    i2: fit.i2,
    band: { T, lnk, lower, upper },
    uncertaintyFactor: [factorAt(REFERENCE_TEMPERATURE), factorAt(range.Tmin), factorAt(range.Tmax)],
  };
}

function expOrNull(x: number): number | null {
  const v = Math.exp(x);
  return Number.isFinite(v) ? v : null;
}

function buildArrhenius(fit: ModelFit, range: { Tmin: number; Tmax: number }, T0: number): ConsensusArrhenius {
  return {
    params: { lnA: fit.beta[0], A: expOrNull(fit.beta[0]), Ea: fit.beta[1] },
    se: { lnA: Math.sqrt(fit.cov[0]), Ea: Math.sqrt(fit.cov[3]) },
    ...commonParts(fit, range, T0),
  };
}

function buildModified(fit: ModelFit, range: { Tmin: number; Tmax: number }, T0: number): ConsensusModifiedArrhenius {
  const parts = commonParts(fit, range, T0);
  // Internal order is [lnA, Ea, n]; published order is [lnA, n, Ea] as in the single-dataset fit.
  const perm = [0, 2, 1];
  parts.covariance = perm.map((a) => perm.map((b) => fit.cov[a * 3 + b]));
  return {
    params: { lnA: fit.beta[0], A: expOrNull(fit.beta[0]), n: fit.beta[2], Ea: fit.beta[1], T0 },
    se: { lnA: Math.sqrt(fit.cov[0]), n: Math.sqrt(fit.cov[8]), Ea: Math.sqrt(fit.cov[4]) },
    ...parts,
  };
}
