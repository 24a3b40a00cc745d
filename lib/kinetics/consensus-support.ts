/**
 * Stage 1 of the consensus: each dataset summarised by its own fit as fitted ln k at a few
 * support temperatures inside its own range, with the covariance of those values.
 *
 * - One pass gathers weighted means; a second reduces the centred, whitened rows
 *   [xE − m̄E, xL − m̄L, y − ȳ] (xE = −1/(RT), xL = ln(T/T0), y = ln k) to a 3×3 R by Givens
 *   rotations (Golub & Van Loan 2013, §5.1.8). Both the Arrhenius fit (columns xE, y) and the
 *   modified fit (all three) are read from that one R, exactly as a QR of the data would give
 *   them; memory per dataset is O(1) beyond a reused scratch buffer.
 * - The model is the one the dataset's own analysis prefers (analyse-dataset.ts): modified
 *   Arrhenius when its curvature F-test gives p < ALPHA (n ≥ 4 points, ≥ 3 temperatures),
 *   otherwise Arrhenius; a dataset at one temperature is summarised by its weighted mean ln k.
 * - Support temperatures: evenly spaced in 1/T from Tmin to Tmax, 1 + ⌈log₂(Tmax/Tmin)⌉ of them
 *   (3 to 7; both ends with two temperatures, the temperature itself with one). V_j has rank ≤ 3
 *   whatever their number; stage 2 uses its pseudo-inverse (consensus-fit.ts). Values come from the preferred fit; their covariance from the
 *   modified fit whenever it is determined (≥ 3 temperatures over at least 1 % in T), the Arrhenius fit
 *   otherwise (and then at both ends only). The
 *   modified fit nests the Arrhenius one, so a dataset whose curvature was too small to detect
 *   does not forbid curvature in the consensus (with the Arrhenius covariance, three values on a
 *   line have a singular V_j that pins the consensus' curvature to zero over its range), and V_j
 *   is the full-rank image of a fit with as many coefficients as support values.
 * - V_j[s,t] = c_j·(1/Σw + d_sᵀ G d_t), d = centred (xE, xL) at the support temperature and
 *   G = (X_cᵀWX_c)⁻¹ of the slope columns: in centred coordinates the mean is uncorrelated with
 *   the slopes. c_j is the variance scale of the preferred fit:
 *   stated uncertainties: c_j = max(1, χ²/dof) (stated σ are a floor; Birge-ratio scaling as the
 *   Particle Data Group's scale factor, Review of Particle Physics, Introduction §5.2.2);
 *   no stated uncertainties: c_j = max(s², 0.01²)·(t_{0.975,dof}/z_{0.975})², s² = RSS/dof — the
 *   residual variance (never below 1 % per point), widened so the support values carry the
 *   dataset's own Student-t 95 % band; with no spare points (dof = 0) the pooled residual
 *   variance of the other such datasets (its dof in the t factor), or 10 % per point if none.
 */
import { ALPHA, MIN_DOF_FOR_OUTLIER_TEST, MIN_POINTS_FOR_DIAGNOSTICS } from "./analyse-dataset";
import { GAS_CONSTANT } from "./constants";
import { bonferroniStudentT, survivalF, t95 } from "./distributions";
import { checkPoints } from "./validate-points";

export type OwnModel = "arrhenius" | "modified_arrhenius" | "single_temperature";

/** Smallest σ(ln k) per point assumed for a dataset without stated uncertainties. */
export const MIN_POINT_SIGMA = 0.01;
/** σ(ln k) per point assumed when no dataset without stated uncertainties has spare points. */
export const DEFAULT_POINT_SIGMA = 0.1;
/** Two-sided 95 % standard normal quantile z_{0.975}. */
export const Z95 = 1.959963984540054;
/** Same rounding-level floor of the residual sum of squares as the single-dataset analysis. */
const NOISE_FLOOR = 1e-13;
/** Smallest Tmax/Tmin for which a dataset's modified fit is used (its covariance, or as its model). */
export const MIN_MODIFIED_SPAN = 1.01;
/** Relative |R_11| below which ln T and 1/T are too collinear for a modified fit. */
const MODIFIED_RANK_TOLERANCE = 1e-9;

/** A dataset's own fit in centred form: ln k(T) = ȳ + bE(xE − m̄E) + bL(xL − m̄L). */
export interface OwnFit {
  model: OwnModel;
  T0: number;
  /** Σw with weights relative to the largest (n when unweighted). */
  sumW: number;
  mE: number;
  mL: number;
  mY: number;
  bE: number;
  bL: number;
  /**
   * (X_cᵀWX_c)⁻¹ of the slope columns [xE, xL] of the modified fit (g00, g01, g11), or of the
   * Arrhenius fit when the modified one is not determined (g01 = g11 = 0, and xL plays no part).
   */
  g: [number, number, number];
  /** Whether g is the modified fit's. */
  gModified: boolean;
  /** Variance scale c_j per relative weight (c_j/max w). */
  scale: number;
}

export type ScaleSource = "stated" | "residuals" | "pooled" | "assumed";

/** What stage 1 keeps of one dataset. */
export interface DatasetSupport {
  id: string;
  /** Points used (inside the temperature window). */
  n: number;
  weighted: boolean;
  Tmin: number;
  Tmax: number;
  fit: OwnFit;
  /**
   * The fit by which the dataset is judged against the others: the same curve (fit's values), with
   * the modified fit's covariance whenever that is determined, so a line whose curvature was too
   * small to detect is not held to be exactly straight. The same object as fit otherwise.
   */
  judge: OwnFit;
  /** Support temperatures, ascending, K. */
  temps: number[];
  /** Fitted ln k at the support temperatures. */
  lnk: number[];
  /** Covariance of lnk, row-major K×K. */
  cov: number[];
  scaleSource: ScaleSource;
  /** σ(ln k) per point behind the scale when no uncertainties are stated; null when they are. */
  sigmaLnK: number | null;
  /** max(1, χ²/dof) applied to stated uncertainties; null when none are stated. */
  statedScale: number | null;
  /** Residual degrees of freedom of the own fit (or of the pooled estimate it borrowed). */
  dof: number;
  /** RSS of the own fit (unweighted fits, for pooling). */
  rss: number;
  /**
   * Its own analysis cannot find an outlier among these points (see {@link SupportInput.screen}):
   * true only when that is certain; false when not asked or not certain.
   */
  outlierFree: boolean;
}

// Scratch per point, reused across datasets (the computation is synchronous and not re-entered).
let scratchSize = 0;
let sxE = new Float64Array(0);
let sxL = new Float64Array(0);
let sy = new Float64Array(0);
let ssw = new Float64Array(0);

function ensureScratch(n: number): void {
  if (n <= scratchSize) return;
  scratchSize = Math.max(n, 2 * scratchSize, 256);
  sxE = new Float64Array(scratchSize);
  sxL = new Float64Array(scratchSize);
  sy = new Float64Array(scratchSize);
  ssw = new Float64Array(scratchSize);
}

export interface SupportInput {
  id: string;
  points: readonly { T: number; k: number; sigmaLnK?: number | null }[];
  window: { Tmin: number; Tmax: number };
  /** Indices of points left out of the summary (outliers of the dataset's own fit); still checked. */
  skip?: ReadonlySet<number> | null;
  /**
   * Whether to tell, from the fits the summary has at hand, that the dataset's own outlier test
   * (analyseOutliers on the same points) would find nothing, so it need not run: see outlierFree.
   */
  screen?: boolean;
}

/**
 * Stage 1 for one dataset. The points are checked in the same pass (an invalid one is reported by
 * checkPoints, with its index); the fit is weighted when every point states sigmaLnK, as in the
 * dataset's own analysis. Returns null when no point lies inside the window. Datasets without
 * stated uncertainties and no spare points get their scale later, from {@link assignPooledScales}.
 */
export function summariseDataset(input: SupportInput, T0: number): DatasetSupport | null {
  const pts = input.points;
  const { Tmin: wMin, Tmax: wMax } = input.window;
  const skip = input.skip ?? null;
  ensureScratch(pts.length);
  const lnT0 = Math.log(T0);
  const invR = 1 / GAS_CONSTANT; // a local: the hot loop should not re-read a module binding
  if (!Array.isArray(pts)) checkPoints(pts, input.id);
  // Locals, not module bindings, in the hot loops.
  const xEs = sxE;
  const xLs = sxL;
  const ys = sy;
  const sws = ssw;
  let bad = false;
  let withSigma = 0;
  let n = 0;
  let Tmin = Infinity;
  let Tmax = -Infinity;
  let maxSw = 0;
  let third = false;
  let firstT = NaN;
  let secondT = NaN;
  // The weighted sums of the second pass, gathered in this one while the weights may be known
  // already: without uncertainty on the first point the fit is unweighted (every relative weight
  // 1); with one, every point in the window may state the same (relative weight sw0·(1/sw0)).
  // The sums are the second pass' exactly, in the same order; when the guess fails, that pass runs.
  const first = pts.length > 0 ? pts[0] : null;
  const sigma0 = first !== null && typeof first === "object" ? first.sigmaLnK : NaN;
  const unitWeights = sigma0 === undefined || sigma0 === null;
  const sw0 = unitWeights ? 1 : 1 / (sigma0 as number);
  const inv0 = 1 / sw0;
  let early = unitWeights || (typeof sigma0 === "number" && sigma0 > 0 && sigma0 < Infinity);
  let S = 0;
  let sE = 0;
  let sL = 0;
  let sY = 0;
  let rssFloor = 0;
  for (let i = 0; i < pts.length; i++) {
    const p = pts[i];
    if (p === null || typeof p !== "object") {
      bad = true;
      break;
    }
    const T = p.T;
    const k = p.k;
    const sigma = p.sigmaLnK;
    // NaN fails every comparison, so these also refuse NaN.
    if (!(typeof T === "number" && T > 0 && T < Infinity && typeof k === "number" && k > 0 && k < Infinity)) {
      bad = true;
      break;
    }
    let sw = NaN;
    if (sigma !== undefined && sigma !== null) {
      if (!(typeof sigma === "number" && sigma > 0 && sigma < Infinity)) {
        bad = true;
        break;
      }
      withSigma++;
      sw = 1 / sigma;
    }
    if (T < wMin || T > wMax || (skip !== null && skip.has(i))) continue;
    const xE = -invR / T;
    const xL = Math.log(T) - lnT0;
    const y = Math.log(k);
    xEs[n] = xE;
    xLs[n] = xL;
    ys[n] = y;
    sws[n] = sw;
    if (early) {
      if (unitWeights || sw === sw0) {
        const rel = unitWeights ? 1 : sw * inv0;
        const w = rel * rel;
        S += w;
        sE += w * xE;
        sL += w * xL;
        sY += w * y;
        const noise = NOISE_FLOOR * (1 + Math.abs(y));
        rssFloor += w * noise * noise;
      } else early = false;
    }
    if (sw > maxSw) maxSw = sw;
    n++;
    if (T < Tmin) Tmin = T;
    if (T > Tmax) Tmax = T;
    if (!third) {
      if (Number.isNaN(firstT)) firstT = T;
      else if (T !== firstT) {
        if (Number.isNaN(secondT)) secondT = T;
        else if (T !== secondT) third = true;
      }
    }
  }
  // The first invalid point is reported with its index and a message for people.
  if (bad) checkPoints(pts, input.id);
  const weighted = pts.length > 0 && withSigma === pts.length;
  if (n === 0) return null;
  if (!weighted) {
    sws.fill(1, 0, n);
    maxSw = 1;
  }
  // Weights relative to the largest, so that Σw and the rotations cannot overflow whatever the
  // stated σ; the variance scale below is expressed per relative weight.
  const invMaxSw = 1 / maxSw;
  // The early sums hold when the fit is unweighted as guessed, or weighted with one σ throughout
  // (then the largest weight is sw0 and every relative weight sw0·(1/sw0)).
  if (early && (unitWeights ? !weighted : weighted)) {
    if (!unitWeights) sws.fill(sw0 * inv0, 0, n);
  } else {
    S = 0;
    sE = 0;
    sL = 0;
    sY = 0;
    rssFloor = 0;
    for (let i = 0; i < n; i++) {
      const sw = sws[i] * invMaxSw;
      sws[i] = sw;
      const w = sw * sw;
      S += w;
      sE += w * xEs[i];
      sL += w * xLs[i];
      sY += w * ys[i];
      const noise = NOISE_FLOOR * (1 + Math.abs(ys[i]));
      rssFloor += w * noise * noise;
    }
  }
  const distinctT = third ? 3 : Number.isNaN(secondT) ? 1 : 2;
  const mE = sE / S;
  const mL = sL / S;
  const mY = sY / S;
  // One temperature, or several within rounding of each other: the centred temperature columns
  // are set to exactly zero rather than left as rounding noise.
  const oneT = distinctT === 1 || Tmax - Tmin <= 1e-9 * Tmax;
  let r00 = 0;
  let r01 = 0;
  let r02 = 0;
  let r11 = 0;
  let r12 = 0;
  let r22 = 0;
  let nL = 0;
  for (let i = 0; i < n; i++) {
    const sw = sws[i];
    let a = oneT ? 0 : sw * (xEs[i] - mE);
    let b = oneT ? 0 : sw * (xLs[i] - mL);
    let c = sw * (ys[i] - mY);
    nL += b * b;
    // Givens rotations (Golub & Van Loan 2013, Alg. 5.1.3); entries are O(1) here, so √(x² + y²)
    // is safe and much faster than Math.hypot.
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

  let model: OwnModel;
  let bE = 0;
  let bL = 0;
  let g: [number, number, number] = [0, 0, 0];
  let gModified = false;
  let determined = false;
  let judgeG: [number, number, number] = [0, 0, 0];
  let rss: number;
  let p: number;
  if (oneT) {
    model = "single_temperature";
    rss = r22 * r22;
    p = 1;
  } else {
    const rssA = r12 * r12 + r22 * r22;
    let modified = false;
    // Over less than 1 % in T, ln T is a straight line in 1/T to ~1e-5 and the modified covariance is
    // rounding noise: such a dataset is summarised by its Arrhenius fit at both ends.
    gModified = distinctT >= 3 && Tmax >= MIN_MODIFIED_SPAN * Tmin && r11 > MODIFIED_RANK_TOLERANCE * Math.sqrt(nL);
    determined = gModified;
    if (gModified) {
      // (R₂ᵀR₂)⁻¹ = R₂⁻¹R₂⁻ᵀ with R₂ = [[r00, r01], [0, r11]].
      const i00 = 1 / r00;
      const i01 = -r01 / (r00 * r11);
      const i11 = 1 / r11;
      g = [i00 * i00 + i01 * i01, i01 * i11, i11 * i11];
    } else {
      g = [1 / (r00 * r00), 0, 0];
    }
    if (gModified && n >= MIN_POINTS_FOR_DIAGNOSTICS) {
      // The single-dataset analysis' curvature test (extra-sum-of-squares F, Draper & Smith 1998, §6.1).
      const rss1 = Math.max(rssA, rssFloor);
      const rss2 = Math.max(r22 * r22, rssFloor);
      const F = Math.max(0, rss1 - rss2) / (rss2 / (n - 3));
      modified = survivalF(F, 1, n - 3) < ALPHA;
    }
    judgeG = g;
    if (!modified && gModified) {
      // The covariance is the preferred fit's: a dataset whose own analysis prefers a straight line
      // is summarised by that line and its Arrhenius covariance (rank 2 over its support values).
      g = [1 / (r00 * r00), 0, 0];
      gModified = false;
    }
    if (modified) {
      model = "modified_arrhenius";
      bL = r12 / r11;
      bE = (r02 - r01 * bL) / r00;
      rss = r22 * r22;
      p = 3;
    } else {
      model = "arrhenius";
      bE = r02 / r00;
      rss = rssA;
      p = 2;
    }
  }
  const dof = n - p;
  const fit: OwnFit = { model, T0, sumW: S, mE, mL, mY, bE, bL, g, gModified, scale: 1 };
  let scaleSource: ScaleSource;
  let sigmaLnK: number | null = null;
  let statedScale: number | null = null;
  if (weighted) {
    scaleSource = "stated";
    // c = max(1, χ²/dof) with χ² = RSS'·maxSw²; per relative weight that is max(1/maxSw², RSS'/dof).
    const unit = invMaxSw * invMaxSw;
    fit.scale = dof > 0 ? Math.max(unit, Math.max(rss, rssFloor) / dof) : unit;
    statedScale = Math.min(Number.MAX_VALUE, fit.scale / unit);
  } else if (dof > 0) {
    scaleSource = "residuals";
    sigmaLnK = Math.sqrt(Math.max(rss / dof, MIN_POINT_SIGMA ** 2));
    fit.scale = sigmaLnK * sigmaLnK * tInflation(dof);
  } else {
    scaleSource = "assumed"; // replaced by assignPooledScales when others have spare points
    sigmaLnK = DEFAULT_POINT_SIGMA;
    fit.scale = DEFAULT_POINT_SIGMA ** 2;
  }
  // Judged by the fit that does not assume its curve is straight: the modified fit's curve and
  // covariance when determined. The straight line's values with the modified covariance would mix two
  // fits: where the truth bends, the line is off it at both ends and the middle by more than its own
  // variance says, and a precise curved consensus would call a correct straight set off.
  let judge = fit;
  if (determined && !gModified) {
    const jL = r12 / r11;
    judge = { ...fit, g: judgeG, gModified: true, bL: jL, bE: (r02 - r01 * jL) / r00 };
  }
  const temps =
    model === "single_temperature"
      ? [distinctT === 1 ? Tmin : -1 / (GAS_CONSTANT * mE)]
      : determined
        ? supportTemperatures(Tmin, Tmax)
        : [Tmin, Tmax];
  const support: DatasetSupport = {
    id: input.id,
    n,
    weighted,
    Tmin,
    Tmax,
    fit,
    judge,
    temps,
    lnk: [],
    cov: [],
    scaleSource,
    sigmaLnK,
    statedScale,
    dof,
    rss,
    outlierFree:
      input.screen === true &&
      skip === null &&
      distinctT >= 3 &&
      !oneT &&
      (weighted || withSigma === 0) &&
      r11 > MODIFIED_RANK_TOLERANCE * Math.sqrt(nL) &&
      noOutlierPossible(n, { mE, mL, mY, S, rssFloor, r00, r01, r02, r11, r12, r22 }),
  };
  fillSupportValues(support);
  return support;
}

/** Margin by which every point must stay inside the outlier bound for the screen to pass. */
const SCREEN_MARGIN = 1e-6;
const screenBounds = new Map<number, number>();

/** The outlier test's bound t_{1−α/(2n), dof−1}, squared (the test of analyse-dataset.ts). */
function outlierBound2(n: number, dof: number): number {
  const key = n * 8 + (n - dof);
  let b = screenBounds.get(key);
  if (b === undefined) {
    b = bonferroniStudentT(ALPHA, n, dof - 1) ** 2;
    if (screenBounds.size > 4096) screenBounds.clear();
    screenBounds.set(key, b);
  }
  return b;
}

/**
 * Whether no point of the dataset (in the scratch buffers, as summarised) can be an outlier of its
 * own analysis, whichever of its two fits that analysis judges on. The analysis flags point i when
 * its externally studentized residual exceeds the Bonferroni bound b (with n − p − 1 ≥ 3 residual
 * dof left): t² = (dof − 1)·u/(RSS − u) > b² with u = eᵢ²/(1 − hᵢ), that is u > b²·RSS/(dof − 1 + b²);
 * u comes from the whitened residual and leverage of the same least-squares fit read from R, with no
 * cancellation. Certain only with a margin of 1e-6 on u, residuals far above rounding (RSS > 1e6 ×
 * the rounding floor) and leverages below 0.99; anything else says "not certain", and the analysis runs.
 */
function noOutlierPossible(
  n: number,
  r: {
    mE: number;
    mL: number;
    mY: number;
    S: number;
    rssFloor: number;
    r00: number;
    r01: number;
    r02: number;
    r11: number;
    r12: number;
    r22: number;
  },
): boolean {
  const { mE, mL, mY, S, r00, r01, r02, r11, r12, r22 } = r;
  const testA = n >= 2 + 1 + MIN_DOF_FOR_OUTLIER_TEST;
  const testM = n >= 3 + 1 + MIN_DOF_FOR_OUTLIER_TEST;
  if (!testA) return true;
  const rssA = r12 * r12 + r22 * r22;
  const rssM = r22 * r22;
  const floor = 1e6 * r.rssFloor;
  if (!(rssA > floor) || (testM && !(rssM > floor))) return false;
  const bA2 = outlierBound2(n, n - 2);
  const limA = (1 - SCREEN_MARGIN) * ((bA2 * rssA) / (n - 3 + bA2));
  const bM2 = testM ? outlierBound2(n, n - 3) : 0;
  const limM = testM ? (1 - SCREEN_MARGIN) * ((bM2 * rssM) / (n - 4 + bM2)) : Infinity;
  // Arrhenius: ln k = ȳ + aE·dE; modified: ȳ + cE·dE + cL·dL (centred columns; the mean is uncorrelated with them).
  const aE = r02 / r00;
  const gA = 1 / (r00 * r00);
  const cL = r12 / r11;
  const cE = (r02 - r01 * cL) / r00;
  const i00 = 1 / r00;
  const i01 = -r01 / (r00 * r11);
  const i11 = 1 / r11;
  const g00 = i00 * i00 + i01 * i01;
  const g01 = i01 * i11;
  const g11 = i11 * i11;
  const invS = 1 / S;
  const xEs = sxE;
  const xLs = sxL;
  const ys = sy;
  const sws = ssw;
  for (let i = 0; i < n; i++) {
    const sw = sws[i];
    const w = sw * sw;
    const dE = xEs[i] - mE;
    const dL = xLs[i] - mL;
    const dy = ys[i] - mY;
    const hA = w * (invS + dE * dE * gA);
    const eA = sw * (dy - aE * dE);
    const hM = w * (invS + dE * dE * g00 + 2 * dE * dL * g01 + dL * dL * g11);
    const eM = sw * (dy - cE * dE - cL * dL);
    if (!(hA < 0.99 && hM < 0.99)) return false;
    if (!(eA * eA < limA * (1 - hA))) return false;
    if (testM && !(eM * eM < limM * (1 - hM))) return false;
  }
  return true;
}

/** One more support value for every factor SUPPORT_STEP in Tmax/Tmin, between MIN_SUPPORT and MAX_SUPPORT. */
export const SUPPORT_STEP = 2;
export const MIN_SUPPORT = 3;
export const MAX_SUPPORT = 7;

/**
 * Support temperatures of a dataset whose modified fit is determined: evenly spaced in 1/T from
 * Tmin to Tmax, 1 + ⌈log₂(Tmax/Tmin)⌉ of them, at least 3 and at most 7 (220–420 K: 3;
 * 200–1000 K: 4; 200–2000 K: 5; a factor 32 or more: 7).
 */
export function supportTemperatures(Tmin: number, Tmax: number): number[] {
  const K = Math.min(MAX_SUPPORT, Math.max(MIN_SUPPORT, 1 + Math.ceil(Math.log(Tmax / Tmin) / Math.log(SUPPORT_STEP) - 1e-9)));
  return Array.from({ length: K }, (_, i) =>
    i === 0 ? Tmin : i === K - 1 ? Tmax : 1 / (1 / Tmin + ((1 / Tmax - 1 / Tmin) * i) / (K - 1)),
  );
}

/** (t_{0.975,dof}/z_{0.975})²: residual-based variances carry the dataset's own Student-t band. */
function tInflation(dof: number): number {
  const r = t95(dof) / Z95;
  return r * r;
}

/** ln k of the own fit at T and its variance. */
export function evaluateOwnFit(fit: OwnFit, T: number): { lnk: number; variance: number } {
  if (fit.model === "single_temperature") return { lnk: fit.mY, variance: fit.scale / fit.sumW };
  const dE = -1 / (GAS_CONSTANT * T) - fit.mE;
  const dL = fit.gModified ? Math.log(T / fit.T0) - fit.mL : 0;
  const [g00, g01, g11] = fit.g;
  const quad = dE * dE * g00 + 2 * dE * dL * g01 + dL * dL * g11;
  // bL is 0 unless the preferred fit is the modified one.
  return { lnk: fit.mY + fit.bE * dE + fit.bL * dL, variance: fit.scale * (1 / fit.sumW + quad) };
}

/** Covariance of the own fit's ln k at two temperatures. */
export function ownCovariance(fit: OwnFit, T1: number, T2: number): number {
  if (fit.model === "single_temperature") return fit.scale / fit.sumW;
  const mod = fit.gModified;
  const d1E = -1 / (GAS_CONSTANT * T1) - fit.mE;
  const d2E = -1 / (GAS_CONSTANT * T2) - fit.mE;
  const d1L = mod ? Math.log(T1 / fit.T0) - fit.mL : 0;
  const d2L = mod ? Math.log(T2 / fit.T0) - fit.mL : 0;
  const [g00, g01, g11] = fit.g;
  const quad = d1E * d2E * g00 + (d1E * d2L + d1L * d2E) * g01 + d1L * d2L * g11;
  return fit.scale * (1 / fit.sumW + quad);
}

/** Variance of the own fit's ln k(T1) − ln k(T2) (the mean level cancels). */
export function ownDifferenceVariance(fit: OwnFit, T1: number, T2: number): number {
  if (fit.model === "single_temperature") return 0;
  const mod = fit.gModified;
  const dE = -1 / (GAS_CONSTANT * T1) + 1 / (GAS_CONSTANT * T2);
  const dL = mod ? Math.log(T1 / T2) : 0;
  const [g00, g01, g11] = fit.g;
  return fit.scale * (dE * dE * g00 + 2 * dE * dL * g01 + dL * dL * g11);
}

function fillSupportValues(s: DatasetSupport): void {
  const K = s.temps.length;
  s.lnk = s.temps.map((T) => evaluateOwnFit(s.fit, T).lnk);
  s.cov = new Array<number>(K * K);
  for (let a = 0; a < K; a++) {
    for (let b = a; b < K; b++) {
      const v = ownCovariance(s.fit, s.temps[a], s.temps[b]);
      s.cov[a * K + b] = v;
      s.cov[b * K + a] = v;
    }
  }
}

/**
 * Datasets without stated uncertainties and without spare points borrow the pooled residual
 * variance of the datasets that have both (Σ RSS / Σ dof), or keep 10 % per point.
 */
export function assignPooledScales(supports: DatasetSupport[]): void {
  let rss = 0;
  let dof = 0;
  for (const s of supports) {
    if (s.scaleSource === "residuals") {
      rss += s.rss;
      dof += s.dof;
    }
  }
  if (dof === 0) return;
  const sigma = Math.sqrt(Math.max(rss / dof, MIN_POINT_SIGMA ** 2));
  for (const s of supports) {
    if (s.scaleSource !== "assumed") continue;
    s.scaleSource = "pooled";
    s.sigmaLnK = sigma;
    s.dof = dof;
    s.fit.scale = sigma * sigma * tInflation(dof);
    s.judge.scale = s.fit.scale;
    fillSupportValues(s);
  }
}
