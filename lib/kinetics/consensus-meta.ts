/**
 * Stage 2 of the consensus: random-effects meta-regression on independent rows.
 *
 * Each row r is a value y_r = f_rᵀβ + u_r + e_r with known within variance v_r (e_r) and the
 * between variance τ² (u_r), so its weight is w_r = 1/(v_r + τ²). The consensus rotates each
 * dataset's support values by the eigenvectors of their covariance V_j (consensus-support.ts),
 * which makes its rows independent without changing the model: V_j + τ²·I = U(Λ + τ²·I)Uᵀ.
 *
 * - Fits are weighted least squares by Givens rotations of the whitened rows [√w·f, √w·y] into a
 *   small upper-triangular R (Golub & Van Loan 2013, §5.1.8–5.1.9): the normal equations are never
 *   solved, and two accumulated R factors merge exactly (leave-one-out from prefix and suffix R).
 * - τ² by the DerSimonian–Laird moment estimator for meta-regression (DerSimonian & Laird 1986,
 *   Control. Clin. Trials 7:177; the regression form as in Viechtbauer 2010, J. Stat. Softw. 36(3),
 *   method "DL"): τ² = max(0, (Q − (N − q)) / (Σw − tr((FᵀWF)⁻¹FᵀW²F))), Q = Σw(y − f ᵀβ̂_FE)²
 *   about the fixed-effect (τ² = 0) fit, N rows, q coefficients. With q = 1 (a common mean) this is
 *   the classic DL estimator (checked against statsmodels in the tests).
 * - Covariance of β̂ is (FᵀWF)⁻¹ = R⁻¹R⁻ᵀ: variances are treated as known, as in DerSimonian–Laird.
 */

/** Relative |R_kk| below which a coefficient is not determined by the rows. */
const RANK_TOLERANCE = 1e-10;

/**
 * Running weighted least-squares state over rows with q coefficients: R of [√w·f, √w·y]
 * ((q+1)×(q+1), row-major upper triangle), the squared column norms of the whitened rows, the
 * sums Σw and Σw²·f fᵀ (for the DL trace) and the number of rows.
 */
export class GlsState {
  readonly m: number;
  /** Every number of the state in one array: R (m²), column norms (m), B (q²), Σw, rows. */
  readonly data: Float64Array;
  readonly r: Float64Array;
  readonly colNorm2: Float64Array;
  readonly b: Float64Array;
  private readonly row: Float64Array;
  private readonly iSumW: number;

  constructor(readonly q: number) {
    const m = q + 1;
    this.m = m;
    this.data = new Float64Array(GlsState.size(q));
    this.r = this.data.subarray(0, m * m);
    this.colNorm2 = this.data.subarray(m * m, m * m + m);
    this.b = this.data.subarray(m * m + m, m * m + m + q * q);
    this.iSumW = m * m + m + q * q;
    this.row = new Float64Array(m);
  }

  /** Length of a state saved with {@link save}. */
  static size(q: number): number {
    return (q + 1) * (q + 1) + (q + 1) + q * q + 2;
  }

  get sumW(): number {
    return this.data[this.iSumW];
  }

  get rows(): number {
    return this.data[this.iSumW + 1];
  }

  /** Add one row with design f (first q entries used), value y and weight w. */
  addRow(f: ArrayLike<number>, fOffset: number, y: number, w: number): void {
    const { q, b, row, colNorm2 } = this;
    const sw = Math.sqrt(w);
    for (let a = 0; a < q; a++) {
      const fa = f[fOffset + a];
      row[a] = sw * fa;
      for (let c = 0; c < q; c++) b[a * q + c] += w * w * fa * f[fOffset + c];
    }
    row[q] = sw * y;
    for (let a = 0; a <= q; a++) colNorm2[a] += row[a] * row[a];
    this.data[this.iSumW] += w;
    this.data[this.iSumW + 1] += 1;
    this.rotateIn(row);
  }

  /** Merge another state's rows (exact: its R rows are rotated in). */
  merge(other: GlsState): this {
    return this.mergeFrom(other.data, 0);
  }

  /** Merge a state saved at buf[offset …]. */
  mergeFrom(buf: Float64Array, offset: number): this {
    const { m, data } = this;
    for (let i = 0; i < m; i++) {
      let any = false;
      for (let c = 0; c < m; c++) {
        const v = c < i ? 0 : buf[offset + i * m + c];
        this.row[c] = v;
        if (v !== 0) any = true;
      }
      if (any) this.rotateIn(this.row);
    }
    for (let k = m * m; k < data.length; k++) data[k] += buf[offset + k];
    return this;
  }

  copyFrom(other: GlsState): this {
    this.data.set(other.data);
    return this;
  }

  /** Load a state saved at buf[offset …]. */
  load(buf: Float64Array, offset: number): this {
    this.data.set(buf.subarray(offset, offset + this.data.length));
    return this;
  }

  /** Save the state into buf[offset …]. */
  save(buf: Float64Array, offset: number): void {
    buf.set(this.data, offset);
  }

  reset(): this {
    this.data.fill(0);
    return this;
  }

  /** Givens rotation of one whitened row into R (Golub & Van Loan 2013, Alg. 5.1.3); row is overwritten. */
  private rotateIn(row: Float64Array): void {
    const { m, r } = this;
    for (let k = 0; k < m; k++) {
      const v = row[k];
      if (v === 0) continue;
      const d = r[k * m + k];
      // √(d² + v²) is much faster than Math.hypot; hypot only when the squares overflow.
      let rho = Math.sqrt(d * d + v * v);
      if (!(rho < Infinity)) rho = Math.hypot(d, v);
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

/** Weighted least-squares solution read from a {@link GlsState}. */
export interface GlsSolution {
  q: number;
  /** Coefficients in the coordinates of the rows' design. */
  beta: Float64Array;
  /** (FᵀWF)⁻¹, row-major q×q. */
  cov: Float64Array;
  /** Weighted residual sum of squares Σw(y − fᵀβ̂)². */
  rss: number;
  /** Σw − tr((FᵀWF)⁻¹FᵀW²F), the denominator of the DL estimator. */
  traceP: number;
  rows: number;
  sumW: number;
}

// R⁻¹ of solveGls, reused (the computation is synchronous and not re-entered).
const invScratch2 = new Float64Array(4);
const invScratch3 = new Float64Array(9);

/**
 * Solve the state's least-squares problem; null when a coefficient is not determined. With into,
 * beta and cov are written there (q and q² entries) instead of new arrays.
 */
export function solveGls(s: GlsState, into?: { beta: Float64Array; cov: Float64Array }): GlsSolution | null {
  const { q, m, r } = s;
  if (s.rows < q) return null;
  for (let k = 0; k < q; k++) {
    if (!(Math.abs(r[k * m + k]) > RANK_TOLERANCE * Math.sqrt(s.colNorm2[k]))) return null;
  }
  const beta = into ? into.beta : new Float64Array(q);
  for (let k = q - 1; k >= 0; k--) {
    let v = r[k * m + q];
    for (let j = k + 1; j < q; j++) v -= r[k * m + j] * beta[j];
    beta[k] = v / r[k * m + k];
  }
  // R⁻¹ (upper triangular), then (RᵀR)⁻¹ = R⁻¹R⁻ᵀ. Every entry read below is written first.
  const inv = q === 2 ? invScratch2 : q === 3 ? invScratch3 : new Float64Array(q * q);
  for (let j = 0; j < q; j++) {
    inv[j * q + j] = 1 / r[j * m + j];
    for (let i = j - 1; i >= 0; i--) {
      let v = 0;
      for (let k = i + 1; k <= j; k++) v += r[i * m + k] * inv[k * q + j];
      inv[i * q + j] = -v / r[i * m + i];
    }
  }
  const cov = into ? into.cov : new Float64Array(q * q);
  for (let i = 0; i < q; i++) {
    for (let j = i; j < q; j++) {
      let v = 0;
      for (let k = j; k < q; k++) v += inv[i * q + k] * inv[j * q + k];
      cov[i * q + j] = v;
      cov[j * q + i] = v;
    }
  }
  // tr(C·B) with C = (FᵀWF)⁻¹ and B = Σw²ffᵀ.
  let trCB = 0;
  for (let i = 0; i < q; i++) for (let j = 0; j < q; j++) trCB += cov[i * q + j] * s.b[j * q + i];
  const rssRoot = r[q * m + q];
  return { q, beta, cov, rss: rssRoot * rssRoot, traceP: s.sumW - trCB, rows: s.rows, sumW: s.sumW };
}

/** DerSimonian–Laird τ² from the fixed-effect (τ² = 0) solution; 0 when N ≤ q. */
export function tau2DerSimonianLaird(fixed: GlsSolution): number {
  const df = fixed.rows - fixed.q;
  if (df <= 0 || !(fixed.traceP > 0)) return 0;
  return Math.max(0, (fixed.rss - df) / fixed.traceP);
}

/** Higgins & Thompson's I² = max(0, (Q − df)/Q) from the fixed-effect solution. */
export function higginsI2(fixed: GlsSolution): number {
  const df = fixed.rows - fixed.q;
  return fixed.rss > df && fixed.rss > 0 ? (fixed.rss - df) / fixed.rss : 0;
}

/** Result of {@link combineEffectsDL}, named as in statsmodels' combine_effects. */
export interface CombinedEffects {
  /** DerSimonian–Laird between-study variance. */
  tau2: number;
  /** Random-effects mean Σwy/Σw, w = 1/(v + τ²), and its standard error 1/√Σw. */
  meanRandom: number;
  seRandom: number;
  /** Fixed-effect (inverse-variance) mean and its standard error. */
  meanFixed: number;
  seFixed: number;
  /** Cochran's Q about the fixed-effect mean. */
  q: number;
  i2: number;
}

/**
 * One-parameter random-effects meta-analysis with the DerSimonian–Laird τ²: the q = 1 case of
 * the consensus' stage 2, exposed so it can be checked against a reference library.
 *
 * @param effects estimates y_i
 * @param variances their within-study variances v_i (> 0)
 * @example combineEffectsDL([0.1, 0.3, 0.5], [0.02, 0.01, 0.04]).tau2
 */
export function combineEffectsDL(effects: readonly number[], variances: readonly number[]): CombinedEffects {
  if (effects.length === 0 || effects.length !== variances.length) {
    throw new RangeError("combineEffectsDL needs as many variances as effects, at least one.");
  }
  const one = [1];
  const build = (tau2: number) => {
    const s = new GlsState(1);
    effects.forEach((y, i) => {
      if (!(variances[i] > 0) || !Number.isFinite(variances[i]) || !Number.isFinite(y)) {
        throw new RangeError(`Effect ${i + 1} needs a finite value and a positive finite variance.`);
      }
      s.addRow(one, 0, y, 1 / (variances[i] + tau2));
    });
    return solveGls(s)!;
  };
  const fixed = build(0);
  const tau2 = tau2DerSimonianLaird(fixed);
  const random = tau2 > 0 ? build(tau2) : fixed;
  return {
    tau2,
    meanRandom: random.beta[0],
    seRandom: Math.sqrt(random.cov[0]),
    meanFixed: fixed.beta[0],
    seFixed: Math.sqrt(fixed.cov[0]),
    q: fixed.rss,
    i2: higginsI2(fixed),
  };
}
