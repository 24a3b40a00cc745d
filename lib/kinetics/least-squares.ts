/**
 * Weighted linear least squares by Householder QR on scaled columns.
 *
 * Method: Golub & Van Loan, "Matrix Computations" (4th ed.), §5.1.3 (Householder vectors) and
 * §5.3.3 (QR solution of the least-squares problem); covariance from R⁻¹ as in Björck,
 * "Numerical Methods for Least Squares Problems" (1996), §2.8. The normal equations are never
 * formed, so accuracy depends on cond(X), not cond(X)².
 */

/** Raised when the design matrix has no unique least-squares solution or the input is malformed. */
export class LeastSquaresError extends Error {
  constructor(message: string) {
    super(message);
    this.name = "LeastSquaresError";
  }
}

/** Default relative threshold on |R_jj| below which a column is treated as dependent. */
const DEFAULT_RANK_TOLERANCE = 1e-14;

/**
 * A Householder QR factorisation of a column-scaled n×p matrix, kept so that Qᵀ can be applied
 * to further right-hand sides (used for iterative refinement).
 */
export interface HouseholderFactor {
  n: number;
  p: number;
  /** Column-major n×p: Householder vectors below and on the diagonal, R above it. */
  qr: Float64Array;
  /** Diagonal of R. */
  rdiag: Float64Array;
  /** Squared norm of each Householder vector (0 means the reflection was skipped). */
  vnorm2: Float64Array;
  /** Column scale d_j (2-norm of column j before scaling). */
  scale: Float64Array;
}

/**
 * Factorise a column-major n×p matrix in place: columns are scaled to unit 2-norm, then reduced
 * by Householder reflections. Returns null when a column is zero or numerically dependent
 * (|R_jj| ≤ tolerance·max|R_ii|).
 *
 * @param a column-major n×p values (overwritten)
 * @example factorHouseholder(new Float64Array([1, 1, 1, 0, 1, 2]), 3, 2)
 */
export function factorHouseholder(a: Float64Array, n: number, p: number, rankTolerance = DEFAULT_RANK_TOLERANCE): HouseholderFactor | null {
  const f: HouseholderFactor = { n, p, qr: a, rdiag: new Float64Array(p), vnorm2: new Float64Array(p), scale: new Float64Array(p) };
  return factorHouseholderInto(f, rankTolerance) ? f : null;
}

/**
 * Allocation-free form of {@link factorHouseholder}: factorises f.qr (n×p, column-major) in place
 * into the caller's rdiag, vnorm2 and scale arrays. Returns false when the columns are dependent.
 */
export function factorHouseholderInto(f: HouseholderFactor, rankTolerance = DEFAULT_RANK_TOLERANCE): boolean {
  const { n, p, qr: a, rdiag, vnorm2, scale } = f;
  for (let j = 0; j < p; j++) {
    const off = j * n;
    // Scale by the largest entry first so the sum of squares cannot overflow.
    let big = 0;
    for (let i = 0; i < n; i++) big = Math.max(big, Math.abs(a[off + i]));
    if (!(big > 0) || !Number.isFinite(big)) return false;
    let ss = 0;
    for (let i = 0; i < n; i++) {
      const v = a[off + i] / big;
      ss += v * v;
    }
    const d = big * Math.sqrt(ss);
    scale[j] = d;
    for (let i = 0; i < n; i++) a[off + i] /= d;
  }
  let maxDiag = 0;
  for (let k = 0; k < p; k++) {
    const ok = k * n;
    let norm2 = 0;
    for (let i = k; i < n; i++) norm2 += a[ok + i] * a[ok + i];
    const norm = Math.sqrt(norm2);
    const akk = a[ok + k];
    // Sign choice avoids cancellation in v_0 = a_kk − alpha (Golub & Van Loan, Alg. 5.1.1).
    const alpha = akk > 0 ? -norm : norm;
    rdiag[k] = alpha;
    maxDiag = Math.max(maxDiag, Math.abs(alpha));
    if (norm === 0 || Math.abs(alpha) <= rankTolerance * maxDiag) return false;
    a[ok + k] = akk - alpha;
    const vtv = 2 * (norm2 - alpha * akk);
    vnorm2[k] = vtv;
    for (let j = k + 1; j < p; j++) {
      const oj = j * n;
      let s = 0;
      for (let i = k; i < n; i++) s += a[ok + i] * a[oj + i];
      const g = (2 * s) / vtv;
      for (let i = k; i < n; i++) a[oj + i] -= g * a[ok + i];
    }
  }
  return true;
}

/** Overwrite b (length n) with Qᵀb. */
export function applyQTranspose(f: HouseholderFactor, b: Float64Array): void {
  const { n, p, qr, vnorm2 } = f;
  for (let k = 0; k < p; k++) {
    const ok = k * n;
    let s = 0;
    for (let i = k; i < n; i++) s += qr[ok + i] * b[i];
    const g = (2 * s) / vnorm2[k];
    for (let i = k; i < n; i++) b[i] -= g * qr[ok + i];
  }
}

/**
 * Solve R·z = (Qᵀb)[0..p) by back substitution and undo the column scaling, giving the
 * least-squares coefficients in the original column units. qtb must already hold Qᵀb.
 */
export function solveTriangular(f: HouseholderFactor, qtb: Float64Array, out: Float64Array): void {
  const { n, p, qr, rdiag, scale } = f;
  for (let k = p - 1; k >= 0; k--) {
    let s = qtb[k];
    for (let j = k + 1; j < p; j++) s -= qr[j * n + k] * out[j];
    out[k] = s / rdiag[k];
  }
  for (let k = 0; k < p; k++) out[k] /= scale[k];
}

/**
 * Upper-triangular G (p×p, row-major) with (XᵀX)⁻¹ = G·Gᵀ in the original column units:
 * G = D⁻¹R⁻¹ where X = Q·R·D (Björck 1996, §2.8.3).
 */
export function inverseFactor(f: HouseholderFactor, g: Float64Array = new Float64Array(f.p * f.p)): Float64Array {
  const { n, p, qr, rdiag, scale } = f;
  g.fill(0, 0, p * p);
  // Column by column of R⁻¹: solve R·g_j = e_j.
  for (let j = 0; j < p; j++) {
    g[j * p + j] = 1 / rdiag[j];
    for (let i = j - 1; i >= 0; i--) {
      let s = 0;
      for (let k = i + 1; k <= j; k++) s += qr[k * n + i] * g[k * p + j];
      g[i * p + j] = -s / rdiag[i];
    }
  }
  for (let i = 0; i < p; i++) for (let j = i; j < p; j++) g[i * p + j] /= scale[i];
  return g;
}

/** (XᵀX)⁻¹ = G·Gᵀ as a row-major p×p array. */
export function gramInverse(g: Float64Array, p: number, c: Float64Array = new Float64Array(p * p)): Float64Array {
  for (let i = 0; i < p; i++) {
    for (let j = i; j < p; j++) {
      let s = 0;
      // G is upper triangular: row i has entries from column i on.
      for (let k = j; k < p; k++) s += g[i * p + k] * g[j * p + k];
      c[i * p + j] = s;
      c[j * p + i] = s;
    }
  }
  return c;
}

/** Result of {@link solveLeastSquares}. Variances use s² = RSS_w / dof. */
export interface LeastSquaresResult {
  /** Coefficients β, one per column of X. */
  params: number[];
  /** Standard errors √diag(s²(XᵀWX)⁻¹); null when dof = 0. */
  se: number[] | null;
  /** s²(XᵀWX)⁻¹; null when dof = 0. */
  covariance: number[][] | null;
  /** (XᵀWX)⁻¹, independent of the residual scatter. */
  unscaledCovariance: number[][];
  /** y − Xβ in the units of y (not weighted). */
  residuals: number[];
  /** Σ wᵢ rᵢ². */
  rss: number;
  /** n − p. */
  dof: number;
  /** √(RSS_w / dof); null when dof = 0. */
  residualSD: number | null;
  /** Weighted R²: about the weighted mean when X has a constant column, otherwise uncentred (about 0). Null when the total sum of squares is 0. */
  r2: number | null;
  /** Diagonal of the hat matrix W^½X(XᵀWX)⁻¹XᵀW^½. */
  leverage: number[];
  /** Whether a constant column was found (decides the R² convention). */
  hasIntercept: boolean;
}

/** Options of {@link solveLeastSquares}. */
export interface LeastSquaresOptions {
  /** Relative threshold on |R_jj| for declaring the columns dependent (default 1e-14). */
  rankTolerance?: number;
  /** Steps of iterative refinement of the augmented system through the same factorisation (default 2). */
  refinementSteps?: number;
}

/**
 * Weighted linear least squares, min Σ wᵢ (yᵢ − xᵢᵀβ)², for any number of columns.
 *
 * Householder QR of W^½X with each column scaled to unit norm, followed by iterative refinement of
 * the augmented system with residuals accumulated in double-double arithmetic (Björck 1967;
 * Björck 1996 §2.9.4), which recovers accuracy lost to large residuals. Throws {@link LeastSquaresError} on a
 * rank-deficient design, non-finite values or mismatched lengths.
 *
 * @param x rows of the design matrix (n rows × p columns; include a column of ones for an intercept)
 * @param y observations (n)
 * @param weights optional positive weights (n), e.g. 1/σᵢ²
 * @example solveLeastSquares([[1, 0], [1, 1], [1, 2]], [1, 3, 5]).params // ≈ [1, 2]
 */
export function solveLeastSquares(
  x: ArrayLike<ArrayLike<number>>,
  y: ArrayLike<number>,
  weights?: ArrayLike<number>,
  options: LeastSquaresOptions = {},
): LeastSquaresResult {
  const n = x.length;
  if (n === 0) throw new LeastSquaresError("The design matrix has no rows.");
  const p = x[0].length;
  if (p === 0) throw new LeastSquaresError("The design matrix has no columns.");
  if (y.length !== n) throw new LeastSquaresError(`y has ${y.length} values but X has ${n} rows.`);
  if (weights && weights.length !== n) {
    throw new LeastSquaresError(`weights has ${weights.length} values but X has ${n} rows.`);
  }
  if (n < p) throw new LeastSquaresError(`${n} observations cannot determine ${p} coefficients.`);

  const sw = new Float64Array(n);
  const a = new Float64Array(n * p);
  const b = new Float64Array(n);
  let hasIntercept = false;
  for (let i = 0; i < n; i++) {
    const w = weights ? weights[i] : 1;
    if (!(w > 0) || !Number.isFinite(w)) throw new LeastSquaresError(`Weight ${i} must be positive and finite (got ${w}).`);
    sw[i] = Math.sqrt(w);
    if (!Number.isFinite(y[i])) throw new LeastSquaresError(`y[${i}] is not a finite number.`);
    b[i] = sw[i] * y[i];
    const row = x[i];
    if (row.length !== p) throw new LeastSquaresError(`Row ${i} has ${row.length} columns, expected ${p}.`);
    for (let j = 0; j < p; j++) {
      if (!Number.isFinite(row[j])) throw new LeastSquaresError(`X[${i}][${j}] is not a finite number.`);
      a[j * n + i] = sw[i] * row[j];
    }
  }
  for (let j = 0; j < p && !hasIntercept; j++) {
    const c0 = x[0][j];
    let constant = c0 !== 0;
    for (let i = 1; i < n && constant; i++) constant = x[i][j] === c0;
    hasIntercept = constant;
  }

  const factor = factorHouseholder(a, n, p, options.rankTolerance ?? DEFAULT_RANK_TOLERANCE);
  if (!factor) throw new LeastSquaresError("The columns of the design matrix are linearly dependent (rank deficient).");

  const beta = new Float64Array(p);
  const work = b.slice();
  applyQTranspose(factor, work);
  solveTriangular(factor, work, beta);
  refineAugmented(factor, sw, x, b, beta, options.refinementSteps ?? 2);

  const resid = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    let fit = 0;
    const row = x[i];
    for (let j = 0; j < p; j++) fit += row[j] * beta[j];
    resid[i] = y[i] - fit;
  }

  let rss = 0;
  let sumW = 0;
  let sumWy = 0;
  for (let i = 0; i < n; i++) {
    const w = sw[i] * sw[i];
    rss += w * resid[i] * resid[i];
    sumW += w;
    sumWy += w * y[i];
  }
  const mean = hasIntercept ? sumWy / sumW : 0;
  let tss = 0;
  for (let i = 0; i < n; i++) tss += sw[i] * sw[i] * (y[i] - mean) ** 2;

  const g = inverseFactor(factor);
  const unscaled = gramInverse(g, p);
  const dof = n - p;
  const s2 = dof > 0 ? rss / dof : null;

  const leverage: number[] = new Array(n);
  const u = new Float64Array(p);
  for (let i = 0; i < n; i++) {
    // h_i = ‖Gᵀ·W^½xᵢ‖² since (XᵀWX)⁻¹ = G·Gᵀ.
    let h = 0;
    for (let k = 0; k < p; k++) {
      let s = 0;
      for (let j = 0; j <= k; j++) s += g[j * p + k] * sw[i] * x[i][j];
      u[k] = s;
      h += s * s;
    }
    leverage[i] = h;
  }

  const toRows = (m: Float64Array, f: number) => Array.from({ length: p }, (_, i) => Array.from({ length: p }, (_, j) => m[i * p + j] * f));
  return {
    params: Array.from(beta),
    se: s2 === null ? null : Array.from({ length: p }, (_, j) => Math.sqrt(s2 * unscaled[j * p + j])),
    covariance: s2 === null ? null : toRows(unscaled, s2),
    unscaledCovariance: toRows(unscaled, 1),
    residuals: Array.from(resid),
    rss,
    dof,
    residualSD: s2 === null ? null : Math.sqrt(s2),
    r2: tss > 0 ? 1 - rss / tss : null,
    leverage,
    hasIntercept,
  };
}

/** Overwrite b (length n) with Q·b (reflections applied in reverse order). */
export function applyQ(f: HouseholderFactor, b: Float64Array): void {
  const { n, p, qr, vnorm2 } = f;
  for (let k = p - 1; k >= 0; k--) {
    const ok = k * n;
    let s = 0;
    for (let i = k; i < n; i++) s += qr[ok + i] * b[i];
    const g = (2 * s) / vnorm2[k];
    for (let i = k; i < n; i++) b[i] -= g * qr[ok + i];
  }
}

// Error-free transformations: Knuth TwoSum and Dekker TwoProduct; Dot2 of Ogita, Rump & Oishi,
// "Accurate sum and dot product", SIAM J. Sci. Comput. 26 (2005).
const SPLITTER = 134217729; // 2^27 + 1
let ddHi = 0;
let ddLo = 0;
function ddReset(): void {
  ddHi = 0;
  ddLo = 0;
}
function ddAddProduct(a: number, b: number): void {
  const prod = a * b;
  const ca = SPLITTER * a;
  const ah = ca - (ca - a);
  const al = a - ah;
  const cb = SPLITTER * b;
  const bh = cb - (cb - b);
  const bl = b - bh;
  const prodErr = ah * bh - prod + ah * bl + al * bh + al * bl;
  const s = ddHi + prod;
  const bb = s - ddHi;
  const sumErr = ddHi - (s - bb) + (prod - bb);
  ddHi = s;
  ddLo += prodErr + sumErr;
}

/**
 * Iterative refinement of [I A; Aᵀ 0][r; x] = [b; 0] with A = W^½X = Q·R·D (Björck 1967,
 * "Iterative refinement of linear least squares solutions I", BIT 7). Residuals of both block
 * equations are accumulated in double-double, so large-residual problems keep full accuracy.
 */
function refineAugmented(
  f: HouseholderFactor,
  sw: Float64Array,
  x: ArrayLike<ArrayLike<number>>,
  b: Float64Array,
  beta: Float64Array,
  steps: number,
): void {
  const { n, p, qr, rdiag, scale } = f;
  const r = new Float64Array(n);
  const fr = new Float64Array(n);
  const g = new Float64Array(p);
  const u = new Float64Array(p);
  const dx = new Float64Array(p);
  const residual = () => {
    for (let i = 0; i < n; i++) {
      ddReset();
      ddAddProduct(b[i], 1);
      for (let j = 0; j < p; j++) ddAddProduct(-sw[i] * x[i][j], beta[j]);
      r[i] = ddHi + ddLo;
    }
  };
  residual();
  for (let step = 0; step < steps; step++) {
    for (let i = 0; i < n; i++) {
      ddReset();
      ddAddProduct(b[i], 1);
      ddAddProduct(r[i], -1);
      for (let j = 0; j < p; j++) ddAddProduct(-sw[i] * x[i][j], beta[j]);
      fr[i] = ddHi + ddLo;
    }
    for (let j = 0; j < p; j++) {
      ddReset();
      for (let i = 0; i < n; i++) ddAddProduct(-sw[i] * x[i][j], r[i]);
      g[j] = ddHi + ddLo;
    }
    // u1 = R⁻ᵀD⁻¹g (forward substitution on Rᵀ).
    for (let k = 0; k < p; k++) {
      let s = g[k] / scale[k];
      for (let j = 0; j < k; j++) s -= qr[k * n + j] * u[j];
      u[k] = s / rdiag[k];
    }
    applyQTranspose(f, fr);
    for (let k = 0; k < p; k++) fr[k] -= u[k];
    solveTriangular(f, fr, dx);
    for (let j = 0; j < p; j++) beta[j] += dx[j];
    // δr = Q·[u1; d2]: fr now holds d1 − u1 on top; rebuild [u1; d2].
    for (let k = 0; k < p; k++) fr[k] = u[k];
    applyQ(f, fr);
    for (let i = 0; i < n; i++) r[i] += fr[i];
  }
}
