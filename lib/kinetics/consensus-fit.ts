/**
 * Stage 2 of the consensus on the datasets' support values: the rows of the random-effects
 * meta-regression, the Arrhenius (q = 2) and modified Arrhenius (q = 3) fits, predictions and
 * the leave-one-out fits (consensus-meta.ts has the estimator).
 *
 * Design in centred, scaled coordinates so the small QR stays well conditioned:
 * f(T) = [1, (xE − cE)/sE, (xL − cL)/sL], xE = −1/(RT), xL = ln(T/T0), centres and scales from
 * every support temperature; parameters and covariance are mapped back exactly (C = J·Cs·Jᵀ).
 * Each dataset's K support values are rotated by the eigenvectors of V_j (cyclic Jacobi, Golub &
 * Van Loan 2013, §8.5), giving K independent rows with variances λ_i + τ².
 */
import { GlsState, higginsI2, solveGls, tau2DerSimonianLaird, type GlsSolution } from "./consensus-meta";
import type { DatasetSupport } from "./consensus-support";
import { GAS_CONSTANT } from "./constants";

/** The stacked, rotated rows of every dataset with support values. */
export interface Rows {
  N: number;
  /** N×3 row-major design [1, x̃E, x̃L] after rotation. */
  f: Float64Array;
  y: Float64Array;
  /** Within variance λ of each rotated row. */
  v: Float64Array;
  /** (Uᵀ1) of each rotated row: how a shift of all its dataset's support values moves the row. */
  u1: Float64Array;
  /** Rows of dataset j are start[j] … start[j+1] − 1 (empty for datasets without support). */
  start: Int32Array;
  cE: number;
  sE: number;
  cL: number;
  sL: number;
  T0: number;
}

/** One consensus fit in the scaled coordinates of {@link Rows}. */
export interface ModelFit {
  q: 2 | 3;
  beta: Float64Array;
  cov: Float64Array;
  tau2: number;
  /** Generalised Cochran's Q about the fixed-effect fit, its dof N − q, and I². */
  Q: number;
  df: number;
  i2: number;
  rows: number;
  /** τ² in the weights of this fit (the others' own τ², or the full data's when merged). */
  weightTau2: number;
}

/** Eigenvalues at or below this fraction of a dataset's largest are its V_j's null directions. */
export const SUPPORT_RANK_TOLERANCE = 1e-10;

/**
 * Stack every dataset's rotated support rows. V_j has rank p_j (the coefficients of the own fit),
 * however many support values there are. Rows along eigenvectors with eigenvalue at or below
 * SUPPORT_RANK_TOLERANCE of the largest (combinations of the support values that vanish for every
 * curve of the own fit's form, e.g. the curvature of a straight set's values) get within variance
 * 0: the fixed-effect fit (τ² = 0) leaves them out, which is the pseudo-inverse of V_j, and with
 * τ² > 0 they enter with variance τ², as V_j + τ²·I says. Rows with design and value both zero
 * (the extra null directions of a modified fit's five support values) change nothing.
 */
export function buildRows(supports: readonly (DatasetSupport | null)[], T0: number): Rows {
  const J = supports.length;
  const start = new Int32Array(J + 1);
  const eig: ({ values: number[]; vectors: number[]; keep: number[] } | null)[] = new Array(J).fill(null);
  let N = 0;
  let values = 0;
  let sumE = 0;
  let sumL = 0;
  for (let j = 0; j < J; j++) {
    start[j] = N;
    const s = supports[j];
    if (!s) continue;
    for (const T of s.temps) {
      sumE += xE(T);
      sumL += Math.log(T / T0);
    }
    values += s.temps.length;
    const e = symmetricEigen(s.cov, s.temps.length);
    const keep = e.values.map((_, i) => i);
    eig[j] = { ...e, keep };
    N += keep.length;
  }
  start[J] = N;
  const cE = values ? sumE / values : 0;
  const cL = values ? sumL / values : 0;
  let ssE = 0;
  let ssL = 0;
  for (const s of supports) {
    if (!s) continue;
    for (const T of s.temps) {
      ssE += (xE(T) - cE) ** 2;
      ssL += (Math.log(T / T0) - cL) ** 2;
    }
  }
  const sE = ssE > 0 ? Math.sqrt(ssE / values) : Math.abs(cE) || 1;
  const sL = ssL > 0 ? Math.sqrt(ssL / values) : 1;
  const rows: Rows = {
    N,
    f: new Float64Array(3 * N),
    y: new Float64Array(N),
    v: new Float64Array(N),
    u1: new Float64Array(N),
    start,
    cE,
    sE,
    cL,
    sL,
    T0,
  };
  let design = new Float64Array(21);
  for (let j = 0; j < J; j++) {
    const s = supports[j];
    const e = eig[j];
    if (!s || !e) continue;
    const K = s.temps.length;
    if (design.length < 3 * K) design = new Float64Array(3 * K);
    for (let a = 0; a < K; a++) designRow(rows, s.temps[a], design, 3 * a);
    const { vectors } = e;
    const top = Math.max(...e.values);
    e.keep.forEach((i, n) => {
      const r = start[j] + n;
      let yi = 0;
      let f0 = 0;
      let f1 = 0;
      let f2 = 0;
      let u1 = 0;
      for (let a = 0; a < K; a++) {
        const u = vectors[a * K + i];
        u1 += u;
        yi += u * s.lnk[a];
        f0 += u * design[3 * a];
        f1 += u * design[3 * a + 1];
        f2 += u * design[3 * a + 2];
      }
      rows.y[r] = yi;
      rows.u1[r] = u1;
      rows.f[3 * r] = f0;
      rows.f[3 * r + 1] = f1;
      rows.f[3 * r + 2] = f2;
      // A null direction of V_j: no within variance, only τ² (left out of the τ² = 0 fit, the pseudo-inverse).
      rows.v[r] = e.values[i] > SUPPORT_RANK_TOLERANCE * top ? e.values[i] : 0;
    });
  }
  return rows;
}

function xE(T: number): number {
  return -1 / (GAS_CONSTANT * T);
}

/** Scaled design row at T into out[offset … offset + 2]. */
export function designRow(rows: Pick<Rows, "cE" | "sE" | "cL" | "sL" | "T0">, T: number, out: Float64Array | number[], offset = 0): void {
  out[offset] = 1;
  out[offset + 1] = (xE(T) - rows.cE) / rows.sE;
  out[offset + 2] = (Math.log(T / rows.T0) - rows.cL) / rows.sL;
}

/** Accumulate the rows of the given datasets at between variance tau2 into state. */
function addBlocks(state: GlsState, rows: Rows, blocks: readonly number[], tau2: number, skip = -1): void {
  for (const j of blocks) if (j !== skip) addBlock(state, rows, j, tau2);
}

/** Accumulate the rows of dataset j at between variance tau2 into state. */
function addBlock(state: GlsState, rows: Rows, j: number, tau2: number): void {
  for (let r = rows.start[j]; r < rows.start[j + 1]; r++) {
    const v = rows.v[r] + tau2;
    if (v > 0) state.addRow(rows.f, 3 * r, rows.y[r], 1 / v);
  }
}

function toModelFit(q: 2 | 3, fixed: GlsSolution, tau2: number, random: GlsSolution, weightTau2 = tau2): ModelFit {
  return {
    q,
    beta: random.beta,
    cov: random.cov,
    tau2,
    Q: fixed.rss,
    df: fixed.rows - q,
    i2: higginsI2(fixed),
    rows: fixed.rows,
    weightTau2,
  };
}

/** Fixed-effect fit, DerSimonian–Laird τ², random-effects fit; null when the design is degenerate. */
export function fitModel(rows: Rows, blocks: readonly number[], q: 2 | 3): ModelFit | null {
  const fixedState = new GlsState(q);
  addBlocks(fixedState, rows, blocks, 0);
  const fixed = solveGls(fixedState);
  if (!fixed) return null;
  const tau2 = tau2DerSimonianLaird(fixed);
  if (tau2 === 0) return toModelFit(q, fixed, 0, fixed);
  const randomState = new GlsState(q);
  addBlocks(randomState, rows, blocks, tau2);
  const random = solveGls(randomState);
  return random ? toModelFit(q, fixed, tau2, random) : null;
}

/**
 * The fit without each dataset of blocks, in the order of blocks. τ²₋ⱼ is always the others' own
 * DL estimate (fixed-effect fits from prefix and suffix R factors, merged exactly). The
 * random-effects fit is redone at τ²₋ⱼ when exact is true; otherwise it is merged from prefix
 * and suffix factors weighted with the full data's τ² (for many datasets, where one dataset
 * moves τ² by O(1/J)).
 */
export function leaveOneOutFits(
  rows: Rows,
  blocks: readonly number[],
  q: 2 | 3,
  full: ModelFit | null,
  exact: boolean,
): (ModelFit | null)[] {
  const J = blocks.length;
  const size = GlsState.size(q);
  const prefix = prefixStates(rows, blocks, q, 0, 0);
  const suffix = suffixStates(rows, blocks, q, 0, 1);
  const approxTau2 = full?.tau2 ?? 0;
  const merged = !exact && approxTau2 > 0;
  const prefixR = merged ? prefixStates(rows, blocks, q, approxTau2, 2) : prefix;
  const suffixR = merged ? suffixStates(rows, blocks, q, approxTau2, 3) : suffix;
  const out: (ModelFit | null)[] = new Array(J).fill(null);
  const work = new GlsState(q);
  // The fixed-effect coefficients are read only when they are also the random-effects ones (then copied).
  const scratch = { beta: new Float64Array(q), cov: new Float64Array(q * q) };
  for (let i = 0; i < J; i++) {
    const fixed = solveGls(work.load(prefix, i * size).mergeFrom(suffix, (i + 1) * size), scratch);
    if (!fixed) continue;
    const tau2 = tau2DerSimonianLaird(fixed);
    let random: GlsSolution | null;
    let weightTau2 = tau2;
    if (tau2 === 0 && !merged) random = { ...fixed, beta: fixed.beta.slice(), cov: fixed.cov.slice() };
    else if (exact) {
      work.reset();
      addBlocks(work, rows, blocks, tau2, blocks[i]);
      random = solveGls(work);
    } else {
      random = solveGls(work.load(prefixR, i * size).mergeFrom(suffixR, (i + 1) * size));
      weightTau2 = approxTau2;
    }
    if (random) out[i] = toModelFit(q, fixed, tau2, random, weightTau2);
  }
  return out;
}

/**
 * Buffers for the prefix and suffix states of {@link leaveOneOutFits}, reused from call to call
 * (the computation is synchronous and not re-entered; each call reads only what it wrote): a
 * consensus of many datasets would otherwise allocate megabytes of them per round.
 */
const stateBuffers: Float64Array[] = [new Float64Array(0), new Float64Array(0), new Float64Array(0), new Float64Array(0)];

function stateBuffer(slot: number, length: number): Float64Array {
  let buf = stateBuffers[slot];
  if (buf.length < length) {
    buf = new Float64Array(Math.max(length, 2 * buf.length));
    stateBuffers[slot] = buf;
  }
  return buf;
}

/** States of the first i datasets of blocks, i = 0 … J, saved one after another (in the buffer of slot). */
function prefixStates(rows: Rows, blocks: readonly number[], q: 2 | 3, tau2: number, slot: number): Float64Array {
  const size = GlsState.size(q);
  const out = stateBuffer(slot, (blocks.length + 1) * size);
  out.fill(0, 0, size);
  const s = new GlsState(q);
  for (let i = 0; i < blocks.length; i++) {
    addBlock(s, rows, blocks[i], tau2);
    s.save(out, (i + 1) * size);
  }
  return out;
}

/** States of the datasets of blocks from i on, i = 0 … J, saved one after another (in the buffer of slot). */
function suffixStates(rows: Rows, blocks: readonly number[], q: 2 | 3, tau2: number, slot: number): Float64Array {
  const size = GlsState.size(q);
  const out = stateBuffer(slot, (blocks.length + 1) * size);
  out.fill(0, blocks.length * size, (blocks.length + 1) * size);
  const s = new GlsState(q);
  for (let i = blocks.length - 1; i >= 0; i--) {
    addBlock(s, rows, blocks[i], tau2);
    s.save(out, i * size);
  }
  return out;
}

/** ln k of a consensus fit at T and the variance of that estimate (τ² not included). */
export function predict(rows: Rows, fit: ModelFit, T: number): { lnk: number; variance: number } {
  const x = [0, 0, 0];
  designRow(rows, T, x);
  const { q, beta, cov } = fit;
  let lnk = 0;
  let v = 0;
  for (let a = 0; a < q; a++) {
    lnk += beta[a] * x[a];
    for (let b = 0; b < q; b++) v += x[a] * cov[a * q + b] * x[b];
  }
  return { lnk, variance: Math.max(0, v) };
}

/**
 * Per dataset j, g_j = Σ_rows f_r·(Uᵀ1)_r/(λ_r + τ²) (q = 3 entries, row-major J×3): the share of
 * dataset j in a GLS prediction ln k̂(T) = x(T)ᵀβ̂ is x(T)ᵀC·g_j. The prediction is linear in the
 * support values and the shares add up to 1 (a common shift of every value moves it one for one).
 */
export function shareVectors(rows: Rows, blocks: readonly number[], tau2: number): Float64Array {
  const J = rows.start.length - 1;
  const g = new Float64Array(3 * J);
  for (const j of blocks) {
    for (let r = rows.start[j]; r < rows.start[j + 1]; r++) {
      const v = rows.v[r] + tau2;
      if (!(v > 0)) continue;
      const c = rows.u1[r] / v;
      g[3 * j] += c * rows.f[3 * r];
      g[3 * j + 1] += c * rows.f[3 * r + 1];
      g[3 * j + 2] += c * rows.f[3 * r + 2];
    }
  }
  return g;
}

/** C·x(T) of a fit (q entries, scaled coordinates): dotted with a share vector it gives that dataset's share. */
export function shareDirection(rows: Rows, fit: ModelFit, T: number): number[] {
  const x = [0, 0, 0];
  designRow(rows, T, x);
  const { q, cov } = fit;
  const a = [0, 0, 0];
  for (let i = 0; i < q; i++) for (let k = 0; k < q; k++) a[i] += cov[i * q + k] * x[k];
  return a;
}

/** Covariance of ln k̂(T1) and ln k̂(T2) for a consensus fit: x(T1)ᵀC x(T2) (τ² not included). */
export function predictCovariance(rows: Rows, fit: ModelFit, T1: number, T2: number): number {
  const x1 = [0, 0, 0];
  const x2 = [0, 0, 0];
  designRow(rows, T1, x1);
  designRow(rows, T2, x2);
  const { q, cov } = fit;
  let v = 0;
  for (let a = 0; a < q; a++) for (let b = 0; b < q; b++) v += x1[a] * cov[a * q + b] * x2[b];
  return v;
}

/** Variance of ln k̂(T1) − ln k̂(T2) for a consensus fit (the intercept cancels). */
export function predictDifferenceVariance(rows: Rows, fit: ModelFit, T1: number, T2: number): number {
  const x1 = [0, 0, 0];
  const x2 = [0, 0, 0];
  designRow(rows, T1, x1);
  designRow(rows, T2, x2);
  const { q, cov } = fit;
  let v = 0;
  for (let a = 1; a < q; a++) for (let b = 1; b < q; b++) v += (x1[a] - x2[a]) * cov[a * q + b] * (x1[b] - x2[b]);
  return Math.max(0, v);
}

/**
 * Parameters in the published order ([lnA, Ea] or [lnA, n, Ea]) and their covariance, mapped
 * back from the scaled coordinates: lnA = β0 − β1·cE/sE − β2·cL/sL, Ea = β1/sE, n = β2/sL.
 */
export function toPublished(rows: Rows, fit: ModelFit): { values: number[]; cov: number[][] } {
  const { q, beta, cov } = fit;
  // Rows of the Jacobian in the published order.
  const Jrows: number[][] =
    q === 2
      ? [
          [1, -rows.cE / rows.sE],
          [0, 1 / rows.sE],
        ]
      : [
          [1, -rows.cE / rows.sE, -rows.cL / rows.sL],
          [0, 0, 1 / rows.sL],
          [0, 1 / rows.sE, 0],
        ];
  const values = Jrows.map((jr) => jr.reduce((acc, c, k) => acc + c * beta[k], 0));
  const out = Jrows.map((ja) =>
    Jrows.map((jb) => {
      let v = 0;
      for (let a = 0; a < q; a++) for (let b = 0; b < q; b++) v += ja[a] * cov[a * q + b] * jb[b];
      return v;
    }),
  );
  return { values, cov: out };
}

/**
 * Eigen-decomposition of a small symmetric matrix by cyclic Jacobi rotations (Golub & Van Loan
 * 2013, Alg. 8.5.3). vectors is row-major K×K with eigenvector i in column i.
 */
export function symmetricEigen(a: readonly number[], K: number): { values: number[]; vectors: number[] } {
  const m = a.slice();
  const v = new Array<number>(K * K).fill(0);
  for (let i = 0; i < K; i++) v[i * K + i] = 1;
  for (let sweep = 0; sweep < 50; sweep++) {
    let off = 0;
    let diag = 0;
    for (let p = 0; p < K; p++) {
      diag += m[p * K + p] * m[p * K + p];
      for (let q = p + 1; q < K; q++) off += m[p * K + q] * m[p * K + q];
    }
    if (off <= 1e-32 * diag || off === 0) break;
    for (let p = 0; p < K - 1; p++) {
      for (let q = p + 1; q < K; q++) {
        const apq = m[p * K + q];
        if (apq === 0) continue;
        const app = m[p * K + p];
        const aqq = m[q * K + q];
        // Symmetric Schur decomposition of the 2×2 block (Golub & Van Loan, Alg. 8.5.1).
        const tau = (aqq - app) / (2 * apq);
        const t = (tau >= 0 ? 1 : -1) / (Math.abs(tau) + Math.sqrt(1 + tau * tau));
        const c = 1 / Math.sqrt(1 + t * t);
        const s = t * c;
        for (let k = 0; k < K; k++) {
          const mkp = m[k * K + p];
          const mkq = m[k * K + q];
          m[k * K + p] = c * mkp - s * mkq;
          m[k * K + q] = s * mkp + c * mkq;
        }
        for (let k = 0; k < K; k++) {
          const mpk = m[p * K + k];
          const mqk = m[q * K + k];
          m[p * K + k] = c * mpk - s * mqk;
          m[q * K + k] = s * mpk + c * mqk;
        }
        for (let k = 0; k < K; k++) {
          const vkp = v[k * K + p];
          const vkq = v[k * K + q];
          v[k * K + p] = c * vkp - s * vkq;
          v[k * K + q] = s * vkp + c * vkq;
        }
      }
    }
  }
  const values = Array.from({ length: K }, (_, i) => m[i * K + i]);
  return { values, vectors: v };
}
