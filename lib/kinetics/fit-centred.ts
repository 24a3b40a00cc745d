/**
 * Small weighted least-squares fits with an intercept (the per-dataset hot path). Columns are
 * centred on their weighted means and scaled before Householder QR, so the intercept is
 * orthogonal to the slopes; parameters and covariance are mapped back exactly.
 *
 * Scratch buffers are module-level and reused: nothing here is re-entrant, and no result
 * references them.
 */
import {
  applyQTranspose,
  factorHouseholderInto,
  gramInverse,
  inverseFactor,
  solveTriangular,
  type HouseholderFactor,
} from "./least-squares";

/** Relative |R_jj| threshold; the kinetics columns are never legitimately this collinear. */
const RANK_TOLERANCE = 1e-12;
const MAX_P = 3;

const NO_SHIFT_1: readonly number[] = [0];
const NO_SHIFT_2: readonly number[] = [0, 0];

let capacity = 0;
const factor: HouseholderFactor = {
  n: 0,
  p: 0,
  qr: new Float64Array(0),
  rdiag: new Float64Array(MAX_P),
  vnorm2: new Float64Array(MAX_P),
  scale: new Float64Array(MAX_P),
};
let work = new Float64Array(0);
const gBuf = new Float64Array(MAX_P * MAX_P);
const ccBuf = new Float64Array(MAX_P * MAX_P);
const betaC = new Float64Array(MAX_P);
const delta = new Float64Array(MAX_P);

function ensureCapacity(n: number): void {
  if (n <= capacity) return;
  capacity = Math.max(n, 2 * capacity, 64);
  factor.qr = new Float64Array(capacity * MAX_P);
  work = new Float64Array(capacity);
}

/** Coefficients and residual sum of squares for one response. */
export interface ResponseFit {
  /** [intercept, slopes…] in the original units. */
  beta: number[];
  /** [value at the weighted column means, slopes…]: predictions from these never cancel. */
  betaCentred: number[];
  /** Σ wᵢ rᵢ². */
  rss: number;
  /** y − Xβ (not weighted); a plain array, as the analysis result takes it over unchanged. */
  resid: number[];
}

/** A fitted linear model y ≈ β0 + Σ βj xj. */
export interface CentredFit extends ResponseFit {
  /** Number of coefficients (intercept included). */
  p: number;
  n: number;
  /** (XᵀWX)⁻¹, row-major p×p, in the original parameterisation. */
  unscaledCov: number[];
  /** Weighted means of the slope columns as given (shifted, see {@link FitOptions.shift}). */
  means: number[];
  /** Shifts of the slope columns: original column = given column − shift. */
  shift: readonly number[];
  /** Smallest |R_jj| of the unit-norm centred slope columns: sin of the angle between them (1 for one slope). */
  minSine: number;
  /** Inverse factor G in centred coordinates, (XcᵀWXc)⁻¹ = G·Gᵀ, row-major p×p. */
  g: number[];
  /** Fits of the extra responses on the same design, in the order given. */
  extra: ResponseFit[];
}

/** Options of {@link fitCentred}. */
export interface FitOptions {
  /**
   * Per slope column, the constant c added to the original column x to give the column passed
   * in (x + c). Passing columns already shifted near their mean, each computed without
   * cancellation, keeps a narrow range of x exact; parameters are mapped back to x.
   */
  shift?: readonly number[];
}

/**
 * Fit y (and optionally more responses) on an intercept and one or two slope columns.
 * Returns null when the columns are numerically dependent.
 *
 * @param cols slope columns, each of length n
 * @param sw square roots of the weights, or null for an unweighted fit
 * @param extraResponses further responses solved on the same factorisation
 */
export function fitCentred(
  cols: readonly Float64Array[],
  y: Float64Array,
  sw: Float64Array | null,
  n: number,
  extraResponses: readonly Float64Array[] = [],
  options: FitOptions = {},
): CentredFit | null {
  const q = cols.length;
  const p = q + 1;
  const shift = options.shift ?? (q === 1 ? NO_SHIFT_1 : NO_SHIFT_2);
  ensureCapacity(n);
  let sumW = 0;
  const means = q === 1 ? [0] : [0, 0];
  for (let i = 0; i < n; i++) {
    const w = sw ? sw[i] * sw[i] : 1;
    sumW += w;
    for (let j = 0; j < q; j++) means[j] += w * cols[j][i];
  }
  for (let j = 0; j < q; j++) means[j] /= sumW;

  const a = factor.qr;
  for (let i = 0; i < n; i++) {
    const s = sw ? sw[i] : 1;
    a[i] = s;
    for (let j = 0; j < q; j++) a[(j + 1) * n + i] = s * (cols[j][i] - means[j]);
  }
  factor.n = n;
  factor.p = p;
  if (!factorHouseholderInto(factor, RANK_TOLERANCE)) return null;
  let minSine = 1;
  for (let j = 1; j < p; j++) minSine = Math.min(minSine, Math.abs(factor.rdiag[j]));
  inverseFactor(factor, gBuf);
  gramInverse(gBuf, p, ccBuf);

  // Means of the original columns, for the uncentred intercept.
  const m0 = q === 1 ? [means[0] - shift[0]] : [means[0] - shift[0], means[1] - shift[1]];
  // Back to the uncentred parameterisation: C = J·Cc·Jᵀ, J's first row [1, −m1, …].
  const cov = new Array<number>(p * p);
  for (let k = 0; k < p * p; k++) cov[k] = ccBuf[k];
  let c00 = 0;
  for (let r = 0; r < p; r++) {
    const jr = r === 0 ? 1 : -m0[r - 1];
    for (let c = 0; c < p; c++) c00 += jr * ccBuf[r * p + c] * (c === 0 ? 1 : -m0[c - 1]);
  }
  cov[0] = c00;
  for (let j = 1; j < p; j++) {
    let s = 0;
    for (let r = 0; r < p; r++) s += (r === 0 ? 1 : -m0[r - 1]) * ccBuf[r * p + j];
    cov[j] = s;
    cov[j * p] = s;
  }
  const g = new Array<number>(p * p);
  for (let k = 0; k < p * p; k++) g[k] = gBuf[k];

  const main = solveResponse(cols, y, sw, means, m0, p, n);
  const extra: ResponseFit[] = [];
  for (let r = 0; r < extraResponses.length; r++) extra.push(solveResponse(cols, extraResponses[r], sw, means, m0, p, n));
  return {
    p,
    n,
    beta: main.beta,
    betaCentred: main.betaCentred,
    rss: main.rss,
    resid: main.resid,
    unscaledCov: cov,
    means,
    shift,
    minSine,
    g,
    extra,
  };
}

/**
 * Least-squares coefficients for response y on the current factorisation, with one step of
 * iterative refinement (Golub & Wilkinson 1966), mapped back to the uncentred intercept.
 */
function solveResponse(
  cols: readonly Float64Array[],
  y: Float64Array,
  sw: Float64Array | null,
  means: number[],
  originalMeans: number[],
  p: number,
  n: number,
): ResponseFit {
  // A plain array: a Float64Array of more than 8 values is allocated outside V8's heap, several times slower.
  const resid = new Array<number>(n);
  const x1 = cols[0];
  const x2 = p === 3 ? cols[1] : x1;
  const m1 = means[0];
  const m2 = p === 3 ? means[1] : 0;
  if (sw) for (let i = 0; i < n; i++) work[i] = sw[i] * y[i];
  else for (let i = 0; i < n; i++) work[i] = y[i];
  applyQTranspose(factor, work);
  solveTriangular(factor, work, betaC);
  let rss = 0;
  for (let pass = 0; pass < 2; pass++) {
    rss = 0;
    const b0 = betaC[0];
    const b1 = betaC[1];
    // One loop per shape (the hot path of every fit): r = y − b₀ − b₁(x₁ − m₁) [− b₂(x₂ − m₂)].
    if (p === 3) {
      const b2 = betaC[2];
      for (let i = 0; i < n; i++) {
        const r = y[i] - b0 - b1 * (x1[i] - m1) - b2 * (x2[i] - m2);
        resid[i] = r;
        const e = sw ? sw[i] * r : r;
        work[i] = e;
        rss += e * e;
      }
    } else {
      for (let i = 0; i < n; i++) {
        const r = y[i] - b0 - b1 * (x1[i] - m1);
        resid[i] = r;
        const e = sw ? sw[i] * r : r;
        work[i] = e;
        rss += e * e;
      }
    }
    if (pass === 1) break;
    applyQTranspose(factor, work);
    solveTriangular(factor, work, delta);
    for (let j = 0; j < p; j++) betaC[j] += delta[j];
  }
  const beta = new Array<number>(p);
  const betaCentred = new Array<number>(p);
  beta[0] = betaC[0];
  betaCentred[0] = betaC[0];
  for (let j = 1; j < p; j++) {
    beta[j] = betaC[j];
    betaCentred[j] = betaC[j];
    beta[0] -= originalMeans[j - 1] * betaC[j];
  }
  return { beta, betaCentred, rss, resid };
}

/** Diagonal of the hat matrix, hᵢ = ‖Gᵀaᵢ‖² with aᵢ the whitened centred row i. */
export function computeLeverage(fit: CentredFit, cols: readonly Float64Array[], sw: Float64Array | null, out: number[]): void {
  const { n, p, g, means } = fit;
  for (let i = 0; i < n; i++) {
    const s = sw ? sw[i] : 1;
    let h = 0;
    for (let k = 0; k < p; k++) {
      // (Gᵀa)_k = Σ_{j ≤ k} G[j][k]·a_j, with a_0 = s and a_j = s·(x_j − m_j).
      let t = g[k] * s;
      for (let j = 1; j <= k; j++) t += g[j * p + k] * s * (cols[j - 1][i] - means[j - 1]);
      h += t * t;
    }
    out[i] = h;
  }
}

/**
 * Prediction and unscaled variance at a point given in the fit's shifted coordinates (x + shift,
 * as the columns were passed): ŷ = b₀ + Σ bⱼ(xⱼ − mⱼ) and xᵀ(XᵀWX)⁻¹x = ‖Gᵀ[1, x − m]‖², both
 * from the centred factor, so neither cancels however narrow the data (Björck 1996, §2.8).
 */
export function predictCentred(
  fit: CentredFit,
  xShifted: readonly number[],
  out: { value: number; variance: number } = { value: 0, variance: 0 },
): { value: number; variance: number } {
  const { p, g, means } = fit;
  const b = fit.betaCentred;
  let value = b[0];
  for (let j = 1; j < p; j++) value += b[j] * (xShifted[j - 1] - means[j - 1]);
  let variance = 0;
  for (let k = 0; k < p; k++) {
    let t = g[k];
    for (let j = 1; j <= k; j++) t += g[j * p + k] * (xShifted[j - 1] - means[j - 1]);
    variance += t * t;
  }
  out.value = value;
  out.variance = variance;
  return out;
}

/** xᵀ·C·x for a row-major p×p matrix C. */
export function quadraticForm(c: ArrayLike<number>, x: ArrayLike<number>, p: number): number {
  let s = 0;
  for (let r = 0; r < p; r++) {
    let t = 0;
    for (let k = 0; k < p; k++) t += c[r * p + k] * x[k];
    s += x[r] * t;
  }
  return s;
}
