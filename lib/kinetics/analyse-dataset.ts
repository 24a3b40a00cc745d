/**
 * One-dataset analysis: Arrhenius, modified Arrhenius and Eyring fits, influence diagnostics,
 * curvature test, confidence band and flags. Conventions are listed in index.ts.
 */
import { AnalysisError } from "./analysis-error";
import { AVOGADRO, GAS_CONSTANT, LN_BOLTZMANN_OVER_PLANCK, REFERENCE_TEMPERATURE } from "./constants";
import { bonferroniStudentT, quantileStudentT, survivalChiSquare, survivalF, t95 } from "./distributions";
import { computeLeverage, fitCentred, predictCentred, type CentredFit } from "./fit-centred";
import { extrapolationOf, K298_INTERVAL_MAX_WIDTHS } from "./extrapolation";
import { formatFlagMessage, type FlagDraft, type FlagQuantities } from "./flag-text";
import { cooksDistanceBound } from "./influence-bound";
import { assertReactionOrder, checkPoints, describe } from "./validate-points";
import type {
  AnalysisInput,
  AnalysisResult,
  ArrheniusFit,
  ConfidenceBand,
  CurvatureTest,
  Diagnostics,
  EyringFit,
  FitResiduals,
  Flag,
  FlagQuantity,
  ModifiedArrheniusFit,
  RateAtTemperature,
  ReactionOrder,
} from "./types";

/** Significance level of the outlier (Bonferroni), curvature and reported-fit checks. */
export const ALPHA = 0.05;
/** p-value below which scatter exceeds the stated uncertainties. */
export const EXCESS_SCATTER_P = 0.01;
/** Temperature ratio Tmax/Tmin below which the range is called narrow. */
export const NARROW_RANGE_RATIO = 1.05;
/** Relative standard error of Ea above which Ea is poorly constrained… */
export const NARROW_RANGE_RELATIVE_SE = 0.5;
/** …provided that standard error also exceeds this many J mol⁻¹ (spares near-zero Ea). */
export const NARROW_RANGE_MIN_SE = 1000;
/** Ea below this (J mol⁻¹) raises negative_activation_energy; rounding-level values stay silent. */
export const NEGATIVE_EA_THRESHOLD = -1;
/** Allowance for rounding of reported parameters, in ln k (≈ 1 %). */
export const REPORTED_FIT_TOLERANCE = Math.log(1.01);
/** Number of temperatures in the confidence band. */
export const BAND_POINTS = 50;
/** Points needed for diagnostics and the curvature test. */
export const MIN_POINTS_FOR_DIAGNOSTICS = 4;
/**
 * Residual degrees of freedom the outlier test needs once the tested point is set aside
 * (n − p − 1). With fewer, t_{1−α/(2n)} runs to ±50 and beyond: no point could ever be flagged.
 */
export const MIN_DOF_FOR_OUTLIER_TEST = 3;
/**
 * Two-sided level of the residual test a point of large Cook's distance must also fail to be
 * reported as influential (externally studentized residual beyond t_{1−α/2, n−p−1}).
 */
export const INFLUENCE_RESIDUAL_ALPHA = 0.05;
/**
 * Largest standard error of the temperature exponent n for which the modified Arrhenius fit is
 * reported. Beyond it the 95 % interval of n is wider than about ±10, more than the whole range of
 * exponents met in gas-phase kinetics (|n| ≲ 5): the data do not determine n, and n, Ea and ln A
 * would be the rounding and scatter of a near-collinear fit (a 300–300.5 K set gives n ≈ −2e4).
 */
export const MODIFIED_MAX_SE_N = 5;
/**
 * Relative size of ln k below which residuals count as rounding noise: an RSS under
 * Σ wᵢ(1e-13·(1 + |ln kᵢ|))² is treated as that floor, so noise-free data neither divide by zero
 * nor produce outliers or curvature from rounding.
 */
const NOISE_FLOOR = 1e-13;

/**
 * Whether the modified fit reproduces ln k to within rounding while the Arrhenius fit does not
 * (beyond 100 times the floor, so that two rounding-level sums are never called a curvature).
 */
export function curvatureIsExact(rssArrhenius: number, rssModified: number, rssFloor: number): boolean {
  return rssModified <= rssFloor && rssArrhenius > 100 * rssFloor;
}

/** The curvature test says curved: exact within the arithmetic, or p < ALPHA. */
export function curvatureSignificant(c: { exact?: boolean; p: number | null }): boolean {
  return c.exact === true || (c.p !== null && c.p < ALPHA);
}
/**
 * Below this sine of the angle between the centred ln T and 1/T columns (a window of ~20 mK at
 * 300 K) rounding of the data alone moves n and Ea by more than ~1e-6 relative (error ∝ ε/sin²θ):
 * the modified Arrhenius fit is reported as not determinable.
 */
export const MODIFIED_MIN_SINE = 1e-5;
/** √w beyond 2^±450 (w beyond ~1e±271) is rescaled by a power of two before fitting. */
const WEIGHT_RESCALE_LIMIT = 2 ** 450;
/** Relative weights w_min/w_max below this cannot be represented together. */
const MIN_RELATIVE_WEIGHT = 1e-280;

const LN_LITRE_PER_MOLECULE_CM3 = Math.log(AVOGADRO * 1e-3);

// Per-point scratch arrays, reused across calls (the analysis is synchronous and never
// re-entered; results copy what they keep). Avoids ~7 typed-array allocations per analysis.
let workspaceSize = 0;
let wsT = new Float64Array(0);
let wsY = new Float64Array(0);
let wsSw = new Float64Array(0);
let wsYe = new Float64Array(0);
let wsXEc = new Float64Array(0);
let wsLnTc = new Float64Array(0);

function ensureWorkspace(n: number): void {
  if (n <= workspaceSize) return;
  workspaceSize = Math.max(n, 2 * workspaceSize, 64);
  wsT = new Float64Array(workspaceSize);
  wsY = new Float64Array(workspaceSize);
  wsSw = new Float64Array(workspaceSize);
  wsYe = new Float64Array(workspaceSize);
  wsXEc = new Float64Array(workspaceSize);
  wsLnTc = new Float64Array(workspaceSize);
}

interface Prepared {
  n: number;
  order: ReactionOrder;
  T0: number;
  T: Float64Array;
  y: Float64Array;
  /** Tref = (Tmin + Tmax)/2: the fitted columns are differences from it, formed without cancellation. */
  Tref: number;
  xEc: Float64Array; // −1/(RT) + 1/(R·Tref) = (T − Tref)/(R·T·Tref)
  lnTc: Float64Array; // ln(T/Tref)
  shiftE: number; // xEc − xE
  shiftLnT: number; // lnTc − lnT
  /** √wᵢ divided by weightScale (a power of two, 1 unless 1/σ² would overflow or underflow). */
  sw: Float64Array | null;
  weightScale: number;
  /** Σ ln wᵢ with the stated (unscaled) weights. */
  sumLogW: number;
  weighted: boolean;
  someSigma: boolean;
  distinctT: number;
  Tmin: number;
  Tmax: number;
  rssFloor: number;
}

interface FitSummary {
  dof: number;
  /** Σ wᵢrᵢ² with the stated weights. */
  rss: number;
  /**
   * The variance factor of the covariance with the scaled weights (pairs with the fit's unscaled
   * covariance): s² = RSS/dof unweighted; weighted, max(1, χ²/dof) in those units (see parameterVariance).
   */
  s2: number | null;
  cov: number[][] | null;
  se: (number | null)[];
  r2: number | null;
  residualSD: number | null;
  aicc: number | null;
  chi2Reduced: number | null;
}

/**
 * Analyse one dataset of rate constants k(T): weighted fits of ln k, diagnostics and flags.
 * Throws {@link AnalysisError} for input that cannot be fitted.
 *
 * @param input points (T in K, k in canonical units of the order, optional σ(ln k)), order, T0 in K
 * @returns fits in SI units (J mol⁻¹, J mol⁻¹ K⁻¹), diagnostics, band and flags; no NaN anywhere
 * @example analyseDataset({ order: 2, points: [{ T: 250, k: 2.0e-15 }, { T: 298, k: 6.3e-15 }] }).arrhenius.params.Ea
 */
export function analyseDataset(input: AnalysisInput): AnalysisResult {
  const d = prepareInput(input);
  const { n } = d;
  const f = fitModels(d, true);
  const { arrFit, arrSum, modFit, modSum, modSine, nUndetermined, exactlyDetermined, curvature, chosen } = f;
  const tArr = arrSum.dof > 0 ? t95(arrSum.dof) : 0;
  const arrhenius = buildArrhenius(arrFit, arrSum, tArr, d);
  const modifiedArrhenius = modFit && modSum ? buildModified(modFit, modSum, d) : null;
  const eyring = buildEyring(arrFit, d);
  const band = computeBand(chosen.fit, chosen.sum, d, chosen.model);
  const diagnostics = judgedDiagnostics(d, f);

  const flags = collectFlags(d, { arrFit, arrSum, arrhenius, modifiedArrhenius, diagnostics, curvature, band, chosen }, input);
  if (modSine !== null) {
    flags.push(
      toFlag({
        code: "modified_fit_undetermined",
        severity: "info",
        quantities: { Tmin: temperature(d.Tmin), Tmax: temperature(d.Tmax), sine: statistic(modSine) },
      }),
    );
  } else if (exactlyDetermined) {
    flags.push(
      toFlag({
        code: "modified_fit_undetermined",
        severity: "info",
        quantities: { Tmin: temperature(d.Tmin), Tmax: temperature(d.Tmax), points: count(n) },
      }),
    );
  } else if (nUndetermined) {
    flags.push(
      toFlag({
        code: "modified_fit_undetermined",
        severity: "info",
        quantities: {
          Tmin: temperature(d.Tmin),
          Tmax: temperature(d.Tmax),
          n: statistic(nUndetermined.n),
          seN: statistic(nUndetermined.seN),
          seNLimit: statistic(MODIFIED_MAX_SE_N),
        },
      }),
    );
  }
  return { n, weighted: d.weighted, arrhenius, modifiedArrhenius, eyring, diagnostics, curvature, band, flags };
}

/** Points are judged against the model the analysis prefers: the ends of a curved dataset stand off the straight line by its curvature, not by error. */
function judgedDiagnostics(d: Prepared, f: Fits): Diagnostics | null {
  return d.n >= MIN_POINTS_FOR_DIAGNOSTICS ? computeDiagnostics(f.chosen.fit, f.curved ? f.colsM : f.colsA, d, f.chosen.model) : null;
}

/**
 * The points {@link analyseDataset} flags as outliers (zero-based), from the same fits and the
 * same test, without the rest of the analysis (parameters, Eyring, band, other flags); throws
 * where it throws.
 */
export function analyseOutliers(input: AnalysisInput): number[] {
  const d = prepareInput(input);
  const f = fitModels(d, false);
  const diagnostics = judgedDiagnostics(d, f);
  if (!diagnostics) return [];
  return outlierPoints(d, f.chosen, diagnostics, input)?.outliers ?? [];
}

/** The outlier test on the judged fit: the points and the bound, or null when there are too few points for it. */
function outlierPoints(
  d: Prepared,
  judged: { fit: CentredFit; sum: FitSummary },
  diagnostics: Diagnostics,
  input: AnalysisInput,
): { outliers: number[]; bound: number } | null {
  const { n } = d;
  if (n < judged.fit.p + 1 + MIN_DOF_FOR_OUTLIER_TEST) return null;
  const dof = judged.sum.dof;
  const external = diagnostics.externallyStudentized;
  const resid = judged.fit.resid;
  const bound = bonferroniStudentT(ALPHA, n, dof - 1);
  const outliers: number[] = [];
  for (let i = 0; i < n; i++) {
    if (Math.abs(external[i]) > bound && !withinStatedUncertainty(input, resid, i)) outliers.push(i);
  }
  return { outliers, bound };
}

interface Fits {
  arrFit: CentredFit;
  arrSum: FitSummary;
  modFit: CentredFit | null;
  modSum: FitSummary | null;
  modSine: number | null;
  nUndetermined: { n: number; seN: number } | null;
  exactlyDetermined: boolean | null;
  curvature: CurvatureTest | null;
  curved: boolean;
  chosen: { fit: CentredFit; sum: FitSummary; model: "arrhenius" | "modified_arrhenius" };
  colsA: Float64Array[];
  colsM: Float64Array[];
}

/**
 * The Arrhenius and modified fits, the curvature test and the model the analysis prefers. With
 * eyring, the Eyring response is solved on the Arrhenius factorisation too (its own response:
 * the Arrhenius solution does not depend on it).
 */
function fitModels(d: Prepared, eyring: boolean): Fits {
  const { n, y, sw } = d;
  const colsA = [d.xEc];
  const arrFit = fitCentred(colsA, y, sw, n, eyring ? [eyringResponse(d)] : [], { shift: [d.shiftE] });
  if (!arrFit) {
    throw new AnalysisError("too_few_temperatures", "The temperatures are too close together to fit an Arrhenius expression.");
  }
  const arrSum = summariseFit(arrFit, d, y);

  const colsM = [d.lnTc, d.xEc];
  let modFit = d.distinctT >= 3 ? fitCentred(colsM, y, sw, n, [], { shift: [d.shiftLnT, d.shiftE] }) : null;
  // ln T and 1/T are nearly proportional over a very narrow window: n and Ea would be rounding noise.
  const modSine = modFit && modFit.minSine < MODIFIED_MIN_SINE ? modFit.minSine : null;
  if (modSine !== null) modFit = null;
  let modSum = modFit ? summariseFit(modFit, d, y) : null;
  // n not determined by the data: its standard error spans more than every exponent met in practice.
  const seN = modSum?.se[1] ?? null;
  const nUndetermined = modFit && seN !== null && seN > MODIFIED_MAX_SE_N ? { n: modFit.beta[1], seN } : null;
  // As many points as coefficients: the curve passes through every point whatever the noise, and
  // nothing tells n from scatter (three points with 1 % scatter over 250–350 K give |n| in the thousands).
  const exactlyDetermined = modFit && modSum && modSum.dof === 0;
  if (nUndetermined || exactlyDetermined) {
    modFit = null;
    modSum = null;
  }
  let curvature: CurvatureTest | null = null;
  if (modFit && n >= MIN_POINTS_FOR_DIAGNOSTICS) {
    const rss1 = Math.max(arrFit.rss, d.rssFloor);
    const rss2 = Math.max(modFit.rss, d.rssFloor);
    // Extra-sum-of-squares F test for one added coefficient (Draper & Smith 1998, §6.1). When the
    // modified fit leaves only rounding (its RSS at the floor) and the Arrhenius fit does not, the
    // ratio would divide by rounding noise: the curvature is exact, and no F or p is given.
    const exact = curvatureIsExact(arrFit.rss, modFit.rss, d.rssFloor);
    const F = exact ? null : Math.max(0, rss1 - rss2) / (rss2 / (n - 3));
    const deltaAICc = modSum!.aicc !== null && arrSum.aicc !== null ? modSum!.aicc - arrSum.aicc : null;
    curvature = {
      F,
      dfNum: 1,
      dfDenom: n - 3,
      p: F === null ? null : survivalF(F, 1, n - 3),
      exact,
      deltaAICc,
      direction: modFit.beta[1] >= 0 ? "up" : "down",
    };
  }
  const curved = curvature !== null && curvatureSignificant(curvature);
  const chosen = curved
    ? { fit: modFit!, sum: modSum!, model: "modified_arrhenius" as const }
    : { fit: arrFit, sum: arrSum, model: "arrhenius" as const };
  return { arrFit, arrSum, modFit, modSum, modSine, nUndetermined, exactlyDetermined, curvature, curved, chosen, colsA, colsM };
}

function prepareInput(input: AnalysisInput): Prepared {
  if (input === null || typeof input !== "object") {
    throw new AnalysisError("invalid_input", "The analysis input must be an object with points and order.");
  }
  assertReactionOrder(input.order);
  const { allSigma, someSigma } = checkPoints(input.points);
  const points = input.points;
  const n = points.length;
  if (n < 2) {
    throw new AnalysisError("too_few_points", `At least two points at two different temperatures are needed (got ${n}).`);
  }
  const T0 = input.T0 ?? REFERENCE_TEMPERATURE;
  if (typeof T0 !== "number" || !Number.isFinite(T0) || T0 <= 0) {
    throw new AnalysisError("invalid_reference_temperature", `T0 must be a positive temperature in kelvin (got ${describe(T0)}).`);
  }
  ensureWorkspace(n);
  const T = wsT;
  const y = wsY;
  const xEc = wsXEc;
  const lnTc = wsLnTc;
  const lnT0 = Math.log(T0);
  let Tmin = points[0].T;
  let Tmax = Tmin;
  let iMin = 0;
  for (let i = 0; i < n; i++) {
    const pt = points[i];
    const Ti = pt.T;
    T[i] = Ti;
    y[i] = Math.log(pt.k);
    if (Ti < Tmin) {
      Tmin = Ti;
      iMin = i;
    }
    if (Ti > Tmax) Tmax = Ti;
  }
  if (Tmin === Tmax) {
    throw new AnalysisError(
      "too_few_temperatures",
      `All ${n} points are at the same temperature (${Tmin} K); at least two different temperatures are needed to fit k(T).`,
    );
  }
  // Columns as differences from a temperature inside the data: T − Tref is exact for nearby T,
  // so a window of microkelvin keeps full relative precision in 1/T − 1/Tref.
  const Tref = Tmin / 2 + Tmax / 2;
  if (!Number.isFinite(Tmax / Tref / (GAS_CONSTANT * Tmin))) {
    throw new AnalysisError(
      "invalid_point",
      `Point ${iMin + 1} (points[${iMin}]) has temperature T = ${Tmin} K, too small to fit: 1/T exceeds the largest representable number. Check the value and its unit.`,
      { pointIndex: iMin },
    );
  }
  const shiftE = 1 / (GAS_CONSTANT * Tref);
  const lnTref = Math.log(Tref);
  const shiftLnT = lnT0 - lnTref;
  // ln T − ln Tref is exact enough unless the window is narrow; then log1p of the exact difference.
  const narrow = Tmax < 2 * Tmin;
  for (let i = 0; i < n; i++) {
    const Ti = T[i];
    // (T − Tref)/(R·T·Tref): T − Tref is exact for T near Tref.
    const xc = ((Ti - Tref) * shiftE) / Ti;
    xEc[i] = xc;
    lnTc[i] = narrow ? Math.log1p((Ti - Tref) / Tref) : Math.log(Ti) - lnTref;
  }
  const sw = allSigma ? wsSw : null;
  let sumLogW = 0;
  let weightScale = 1;
  if (sw) weightScale = prepareWeights(points, sw, n);
  let rssFloor = 0;
  for (let i = 0; i < n; i++) {
    let w = 1;
    if (sw) {
      w = sw[i] * sw[i];
      sumLogW -= 2 * Math.log(points[i].sigmaLnK as number);
    }
    const noise = NOISE_FLOOR * (1 + Math.abs(y[i]));
    rssFloor += w * noise * noise;
  }
  const distinctT = countDistinctUpTo3(T, n, Tmin, Tmax);
  if (input.reportedFit !== undefined && input.reportedFit !== null) checkReportedFit(input.reportedFit);
  return {
    n,
    order: input.order,
    T0,
    T,
    y,
    Tref,
    xEc,
    lnTc,
    shiftE,
    shiftLnT,
    sw,
    weightScale,
    sumLogW,
    weighted: allSigma,
    someSigma,
    distinctT,
    Tmin,
    Tmax,
    rssFloor,
  };
}

/** Number of distinct temperatures, capped at 3 (all the analysis needs to know). */
function countDistinctUpTo3(T: Float64Array, n: number, Tmin: number, Tmax: number): number {
  for (let i = 0; i < n; i++) if (T[i] !== Tmin && T[i] !== Tmax) return 3;
  return 2;
}

/**
 * Fill sw with √wᵢ = 1/σᵢ divided by a power of two chosen so that wᵢ neither overflows nor
 * underflows (exact: only the exponent changes); returns that power of two. Refuses σ whose
 * weight cannot be represented at all, or a spread of σ no double can hold together.
 */
function prepareWeights(points: AnalysisInput["points"], sw: Float64Array, n: number): number {
  let maxSw = 0;
  let minSw = Infinity;
  let iMax = 0;
  let iMin = 0;
  for (let i = 0; i < n; i++) {
    const sigma = points[i].sigmaLnK as number;
    const s = 1 / sigma;
    if (!Number.isFinite(s)) {
      throw new AnalysisError(
        "weights_out_of_range",
        `Point ${i + 1} (points[${i}]) has uncertainty sigmaLnK = ${sigma}, too small to use as a weight (1/σ overflows). sigmaLnK is the relative standard uncertainty of k (0.05 for 5 %).`,
        { pointIndex: i },
      );
    }
    sw[i] = s;
    if (s > maxSw) {
      maxSw = s;
      iMax = i;
    }
    if (s < minSw) {
      minSw = s;
      iMin = i;
    }
  }
  const scale = maxSw > WEIGHT_RESCALE_LIMIT || maxSw < 1 / WEIGHT_RESCALE_LIMIT ? 2 ** Math.round(Math.log2(maxSw)) : 1;
  if ((minSw / maxSw) ** 2 < MIN_RELATIVE_WEIGHT) {
    throw new AnalysisError(
      "weights_out_of_range",
      `The stated uncertainties span too wide a range to weight one fit: sigmaLnK = ${points[iMax].sigmaLnK} at point ${iMax + 1} and ${points[iMin].sigmaLnK} at point ${iMin + 1}, so the weights 1/σ² differ by more than a factor of 1e280.`,
      { pointIndex: iMin },
    );
  }
  if (scale !== 1) for (let i = 0; i < n; i++) sw[i] /= scale;
  return scale;
}

function checkReportedFit(r: NonNullable<AnalysisInput["reportedFit"]>): void {
  const bad = (what: string, v: unknown) =>
    new AnalysisError(
      "invalid_reported_fit",
      `The reported expression has ${what} = ${describe(v)}; ${what === "A" ? "A must be a positive finite number" : what === "T0" ? "T0 must be a positive temperature in kelvin" : `${what} must be a finite number`}.`,
    );
  if (typeof r.A !== "number" || !Number.isFinite(r.A) || r.A <= 0) throw bad("A", r.A);
  if (typeof r.Ea !== "number" || !Number.isFinite(r.Ea)) throw bad("Ea", r.Ea);
  if (r.n !== undefined && (typeof r.n !== "number" || !Number.isFinite(r.n))) throw bad("n", r.n);
  if (r.T0 !== undefined && (typeof r.T0 !== "number" || !Number.isFinite(r.T0) || r.T0 <= 0)) throw bad("T0", r.T0);
  for (const [what, v] of [
    ["Tmin", r.Tmin],
    ["Tmax", r.Tmax],
  ] as const) {
    if (v !== undefined && (typeof v !== "number" || !Number.isFinite(v) || v <= 0)) {
      throw new AnalysisError(
        "invalid_reported_fit",
        `The reported expression has ${what} = ${describe(v)}; ${what} must be a positive temperature in kelvin.`,
      );
    }
  }
  if (r.Tmin !== undefined && r.Tmax !== undefined && !(r.Tmin < r.Tmax)) {
    throw new AnalysisError(
      "invalid_reported_fit",
      `The reported expression's range is ${r.Tmin}–${r.Tmax} K; its highest temperature must be above its lowest.`,
    );
  }
}

/**
 * The factor s² of the covariance s²(XᵀWX)⁻¹, in the units of the scaled weights, from a fit's
 * Σwᵢrᵢ² (scaled weights) and its dof; null when dof = 0. Unweighted: RSS/dof. Weighted: the
 * stated uncertainties are taken as a floor, never as smaller than stated — s² = max(1, χ²/dof),
 * so standard errors are those of the stated σ (scipy curve_fit's absolute_sigma=True), enlarged
 * by S = √(χ²/dof) only when the points scatter more than the σ allow. This is the scale factor of
 * the Particle Data Group's averaging rule (Review of Particle Physics, Introduction, "Averages
 * and fits" — from memory), which the consensus applies to its stage-1 summaries too.
 */
function parameterVariance(rss: number, dof: number, d: Prepared): number | null {
  if (dof <= 0) return null;
  const s2 = rss / dof;
  if (!d.weighted) return s2;
  // χ²/dof = 1 is RSS/dof = 1/weightScale² in scaled units (a power of two: exact).
  const unit = 1 / (d.weightScale * d.weightScale);
  return s2 >= unit ? s2 : unit;
}

function summariseFit(fit: CentredFit, d: Prepared, y: Float64Array): FitSummary {
  const { n, p, rss, unscaledCov } = fit;
  const dof = n - p;
  const residualS2 = dof > 0 ? rss / dof : null;
  const s2 = parameterVariance(rss, dof, d);
  const sw = d.sw;
  let sumW = 0;
  let sumWy = 0;
  for (let i = 0; i < n; i++) {
    const w = sw ? sw[i] * sw[i] : 1;
    sumW += w;
    sumWy += w * y[i];
  }
  const mean = sumWy / sumW;
  let tss = 0;
  for (let i = 0; i < n; i++) {
    const w = sw ? sw[i] * sw[i] : 1;
    const dy = y[i] - mean;
    tss += w * (dy * dy);
  }
  const cov = s2 === null ? null : toRows(unscaledCov, p, s2);
  const se = new Array<number | null>(p);
  for (let j = 0; j < p; j++) se[j] = s2 === null ? null : Math.sqrt(s2 * unscaledCov[j * p + j]);
  // The fit ran on weights divided by weightScale²: the sum of squares with the stated weights.
  const scale = d.weightScale;
  const rssStated = rss * scale * scale;
  if (!Number.isFinite(rssStated)) {
    throw new AnalysisError(
      "weights_out_of_range",
      "The stated uncertainties are too small for these data: with weights 1/sigmaLnK² the weighted sum of squared residuals exceeds the largest representable number. sigmaLnK is the relative standard uncertainty of k (0.05 for 5 %).",
    );
  }
  // Gaussian log-likelihood at the ML variance, weights as relative precisions (as statsmodels WLS.loglike).
  const rssF = Math.max(rss, d.rssFloor);
  const lnL = -0.5 * n * (Math.log((2 * Math.PI * rssF) / n) + 2 * Math.log(scale) + 1) + 0.5 * d.sumLogW;
  // AICc (Hurvich & Tsai 1989); k counts regression coefficients only.
  const aicc = n - p - 1 > 0 ? -2 * lnL + 2 * p + (2 * p * (p + 1)) / (n - p - 1) : null;
  return {
    dof,
    rss: rssStated,
    s2,
    cov,
    se,
    r2: tss > 0 ? 1 - rss / tss : null,
    residualSD: residualS2 === null ? null : Math.sqrt(residualS2) * scale,
    aicc,
    chi2Reduced: d.weighted && residualS2 !== null ? rssStated / dof : null,
  };
}

function buildArrhenius(fit: CentredFit, s: FitSummary, t: number, d: Prepared): ArrheniusFit {
  const [lnA, Ea] = fit.beta;
  // Prediction and its variance from the centred factor: exact however narrow the window.
  const at298 = predictCentred(fit, [shiftedInverseT(d, REFERENCE_TEMPERATURE)]);
  const lnk298 = at298.value;
  const where = extrapolationOf(REFERENCE_TEMPERATURE, d.Tmin, d.Tmax);
  const intervalOmitted = where.extrapolation !== null && where.extrapolation.inverseTWidths > K298_INTERVAL_MAX_WIDTHS;
  let lower: number | null = null;
  let upper: number | null = null;
  if (s.s2 !== null && !intervalOmitted) {
    const half = t * Math.sqrt(s.s2 * at298.variance);
    lower = expOrNull(lnk298 - half);
    upper = expOrNull(lnk298 + half);
  }
  const out: ArrheniusFit = {
    params: { lnA, A: expOrNull(lnA), Ea },
    se: { lnA: s.se[0], Ea: s.se[1] },
    covariance: s.cov,
    r2: s.r2,
    residualSD: s.residualSD,
    dof: s.dof,
    rss: s.rss,
    aicc: s.aicc,
    ...residualFields(fit, s, d),
    k298: { value: expOrNull(lnk298), lower, upper, intervalOmitted, ...where },
    kMid: arrheniusAt(fit, s, t, 2 / (1 / d.Tmin + 1 / d.Tmax), d),
  };
  if (d.weighted) out.chi2Reduced = s.chi2Reduced;
  return out;
}

/** Residual spread and per-point residuals and fitted values of one fit. */
function residualFields(fit: CentredFit, s: FitSummary, d: Prepared): FitResiduals {
  const { n, resid } = fit;
  // The fit's own residuals array (nothing changes it after the fit).
  const residuals = resid;
  const fitted = new Array<number>(n);
  const y = d.y;
  let ss = 0;
  for (let i = 0; i < n; i++) {
    const r = resid[i];
    fitted[i] = y[i] - r;
    ss += r * r;
  }
  return {
    scaleFactor: d.weighted ? s.residualSD : null,
    residualSDLnK: s.dof > 0 ? Math.sqrt(ss / s.dof) : null,
    residuals,
    fitted,
  };
}

/**
 * Arrhenius k at temperature T with its 95 % interval. The variance of ln k̂ is taken from the
 * centred factor, ‖Gᵀ(1, x − x̄)‖² with x = −1/(RT), which keeps full precision near the data.
 */
function arrheniusAt(fit: CentredFit, s: FitSummary, t: number, T: number, d: Prepared): RateAtTemperature {
  const at = predictCentred(fit, [shiftedInverseT(d, T)]);
  let lower: number | null = null;
  let upper: number | null = null;
  if (s.s2 !== null) {
    const half = t * Math.sqrt(s.s2 * at.variance);
    lower = expOrNull(at.value - half);
    upper = expOrNull(at.value + half);
  }
  return { T, value: expOrNull(at.value), lower, upper };
}

function buildModified(fit: CentredFit, s: FitSummary, d: Prepared): ModifiedArrheniusFit {
  const [lnA, nT, Ea] = fit.beta;
  const out: ModifiedArrheniusFit = {
    params: { lnA, A: expOrNull(lnA), n: nT, Ea, T0: d.T0 },
    se: { lnA: s.se[0], n: s.se[1], Ea: s.se[2] },
    covariance: s.cov,
    r2: s.r2,
    residualSD: s.residualSD,
    dof: s.dof,
    rss: s.rss,
    aicc: s.aicc,
    ...residualFields(fit, s, d),
  };
  if (d.weighted) out.chi2Reduced = s.chi2Reduced;
  return out;
}

/**
 * ln(T/Tref) per point, fitted on the Arrhenius design: by linearity of least squares the Eyring
 * fit of ln k − ln(T/Tref) is the Arrhenius fit minus this one. Subtracting coefficients instead of
 * responses keeps a microkelvin window exact, where ln k − ln(T/Tref) would round to ulp(ln k)
 * against a signal of 1e-8.
 */
function eyringResponse(d: Prepared): Float64Array {
  const ye = wsYe;
  for (let i = 0; i < d.n; i++) ye[i] = d.lnTc[i];
  return ye;
}

/** ln(k_B/h), ln Tref and the standard-state term, left out of the Eyring fit and added back to its intercept. */
function eyringOffset(d: Prepared): number {
  // Eyring–Evans–Polanyi: k_c = κ (k_B T/h) (c°)^(1−m) exp(ΔS‡/R) exp(−ΔH‡/RT), κ = 1, c° = 1 mol dm⁻³.
  return (d.order - 1) * LN_LITRE_PER_MOLECULE_CM3 - LN_BOLTZMANN_OVER_PLANCK - Math.log(d.Tref);
}

function buildEyring(arrFit: CentredFit, d: Prepared): EyringFit {
  const { n, order } = d;
  const lnTFit = arrFit.extra[0];
  const bc0 = arrFit.betaCentred[0] - lnTFit.betaCentred[0];
  const slope = arrFit.betaCentred[1] - lnTFit.betaCentred[1];
  const intercept = bc0 - (arrFit.means[0] - arrFit.shift[0]) * slope;
  let rss = 0;
  for (let i = 0; i < n; i++) {
    const e = (d.sw ? d.sw[i] : 1) * (arrFit.resid[i] - lnTFit.resid[i]);
    rss += e * e;
  }
  const dof = n - 2;
  const s2 = parameterVariance(rss, dof, d);
  const c = arrFit.unscaledCov;
  const convention =
    order === 1
      ? "κ = 1; first-order rate constant, so no standard-state term."
      : `κ = 1; standard state c° = 1 mol dm⁻³ (k converted to ${order === 2 ? "dm³ mol⁻¹ s⁻¹" : "dm⁶ mol⁻² s⁻¹"} before fitting ln(k/T) on 1/T).`;
  return {
    params: { dH: slope, dS: GAS_CONSTANT * (intercept + eyringOffset(d)) },
    se: {
      dH: s2 === null ? null : Math.sqrt(s2 * c[3]),
      dS: s2 === null ? null : GAS_CONSTANT * Math.sqrt(s2 * c[0]),
    },
    convention,
  };
}

function computeDiagnostics(fit: CentredFit, cols: Float64Array[], d: Prepared, model: Diagnostics["model"]): Diagnostics {
  const { n, p, resid, rss } = fit;
  const dof = n - p;
  const h = new Array<number>(n);
  computeLeverage(fit, cols, d.sw, h);
  const studentized = new Array<number>(n).fill(0);
  const external = new Array<number>(n).fill(0);
  const cook = new Array<number>(n).fill(0);
  // Residuals at rounding level carry no information: leave studentized residuals at 0.
  // With no residual dof left after deleting a point, externally studentized residuals are undefined (0).
  const deletable = dof - 1 > 0;
  if (rss > d.rssFloor) {
    const s = Math.sqrt(rss / dof);
    const floorDeleted = d.rssFloor / (dof - 1);
    for (let i = 0; i < n; i++) {
      const oneMinusH = 1 - h[i];
      // hᵢ = 1: the point alone fixes a coefficient, its residual is 0 and these measures are undefined.
      if (oneMinusH <= 1e-10) continue;
      const e = (d.sw ? d.sw[i] : 1) * resid[i];
      // Internally studentized residual and Cook's distance (Cook & Weisberg 1982, §2.2 and §3.2).
      const r = e / (s * Math.sqrt(oneMinusH));
      studentized[i] = r;
      cook[i] = (r * r * h[i]) / (p * oneMinusH);
      // Externally studentized: variance re-estimated without point i, RSS₍ᵢ₎ = RSS − eᵢ²/(1 − hᵢ);
      // when point i holds most of the RSS that difference cancels, so refit without it instead.
      if (!deletable) continue;
      let rssDeleted = rss - (e * e) / oneMinusH;
      if (rssDeleted < rss / 16) rssDeleted = rssWithout(i, d, cols, fit.shift);
      const s2i = Math.max(rssDeleted / (dof - 1), floorDeleted);
      external[i] = e / Math.sqrt(s2i * oneMinusH);
    }
  }
  return { model, leverage: h, studentized, externallyStudentized: external, cooksDistance: cook };
}

/** RSS of the same model refitted without point i (scaled weights, as the fit's own RSS). */
function rssWithout(i: number, d: Prepared, cols: Float64Array[], shift: readonly number[]): number {
  const m = d.n - 1;
  const xs = cols.map(() => new Float64Array(m));
  const y = new Float64Array(m);
  const sw = d.sw ? new Float64Array(m) : null;
  for (let j = 0, k = 0; j < d.n; j++) {
    if (j === i) continue;
    for (let c = 0; c < cols.length; c++) xs[c][k] = cols[c][j];
    y[k] = d.y[j];
    if (sw) sw[k] = (d.sw as Float64Array)[j];
    k++;
  }
  const fit = fitCentred(xs, y, sw, m, [], { shift });
  return fit ? fit.rss : 0;
}

/** −1/(RT) + 1/(R·Tref), the fitted 1/T column, at any temperature. */
function shiftedInverseT(d: Prepared, T: number): number {
  return ((T - d.Tref) * d.shiftE) / T;
}

function computeBand(fit: CentredFit, s: FitSummary, d: Prepared, model: ConfidenceBand["model"]): ConfidenceBand {
  const p = fit.p;
  // Allocated at full length: every entry is written below (faster than filling first).
  const T = new Array<number>(BAND_POINTS);
  const lnk = new Array<number>(BAND_POINTS);
  const lower = s.s2 === null ? null : new Array<number>(BAND_POINTS);
  const upper = s.s2 === null ? null : new Array<number>(BAND_POINTS);
  const t = s.s2 === null ? 0 : t95(s.dof);
  const invMin = 1 / d.Tmin;
  const invMax = 1 / d.Tmax;
  const s2 = s.s2 ?? 0;
  // predictCentred written out for one or two slopes (the same operations in the same order, so
  // the same numbers): this loop runs 50 times in every analysis. The point in the fit's shifted
  // coordinates is [ln(T/Tref), 1/(R·Tref) − 1/(RT)] or the latter alone.
  const { g, means, betaCentred: b } = fit;
  const m0 = means[0];
  const m1 = p === 3 ? means[1] : 0;
  for (let i = 0; i < BAND_POINTS; i++) {
    const Ti = i === 0 ? d.Tmin : i === BAND_POINTS - 1 ? d.Tmax : 1 / (invMin + ((invMax - invMin) * i) / (BAND_POINTS - 1));
    T[i] = Ti;
    let v: number;
    let variance: number;
    if (p === 3) {
      const u0 = Math.log1p((Ti - d.Tref) / d.Tref) - m0;
      const u1 = shiftedInverseT(d, Ti) - m1;
      v = b[0] + b[1] * u0 + b[2] * u1;
      const t0 = g[0];
      const t1 = g[1] + g[4] * u0;
      let t2 = g[2] + g[5] * u0;
      t2 += g[8] * u1;
      variance = t0 * t0 + t1 * t1 + t2 * t2;
    } else {
      const u0 = shiftedInverseT(d, Ti) - m0;
      v = b[0] + b[1] * u0;
      const t0 = g[0];
      const t1 = g[1] + g[3] * u0;
      variance = t0 * t0 + t1 * t1;
    }
    lnk[i] = v;
    if (lower && upper) {
      // Pointwise confidence band of the mean: ŷ ± t·s·√(xᵀ(XᵀWX)⁻¹x) (Draper & Smith 1998, §3.4).
      const half = t * Math.sqrt(s2 * variance);
      lower[i] = v - half;
      upper[i] = v + half;
    }
  }
  return { model, T, lnk, lower, upper };
}

interface FlagContext {
  arrFit: CentredFit;
  arrSum: FitSummary;
  arrhenius: ArrheniusFit;
  modifiedArrhenius: ModifiedArrheniusFit | null;
  diagnostics: Diagnostics | null;
  curvature: CurvatureTest | null;
  band: ConfidenceBand;
  /** The model the band is drawn for, with its fit. */
  chosen: { fit: CentredFit; sum: FitSummary; model: ConfidenceBand["model"] };
}

// The numbers behind a flag, by kind (flag-text.ts writes them in the reader's units).
const count = (value: number): FlagQuantity => ({ kind: "count", value });
const statistic = (value: number): FlagQuantity => ({ kind: "statistic", value });
const probability = (value: number): FlagQuantity => ({ kind: "probability", value });
const energy = (value: number): FlagQuantity => ({ kind: "energy", value });
const temperature = (value: number): FlagQuantity => ({ kind: "temperature", value });
const ratio = (value: number): FlagQuantity => ({ kind: "ratio", value });
const percent = (value: number): FlagQuantity => ({ kind: "percent", value });

/** A flag with its message, written by the same function a page uses to show it in other units. */
function toFlag(draft: FlagDraft): Flag {
  const flag: Flag = { code: draft.code, severity: draft.severity, message: "" };
  if (draft.points) flag.points = draft.points;
  flag.quantities = draft.quantities;
  flag.message = formatFlagMessage(flag);
  return flag;
}

/** A point nearer the fit than its own stated uncertainty is within what its authors claim. */
function withinStatedUncertainty(input: AnalysisInput, resid: readonly number[], i: number): boolean {
  const sigma = input.points[i].sigmaLnK;
  return typeof sigma === "number" && Math.abs(resid[i]) < sigma;
}

function collectFlags(d: Prepared, c: FlagContext, input: AnalysisInput): Flag[] {
  const flags: Flag[] = [];
  // No closure for pushing: every analysis runs this, and creating one per call costs more than its use.
  const { n } = d;
  const Ea = c.arrhenius.params.Ea;

  if (!d.weighted && d.someSigma) {
    const stated = input.points.filter((pt) => pt.sigmaLnK !== undefined && pt.sigmaLnK !== null).length;
    flags.push(
      toFlag({
        code: "uncertainties_ignored",
        severity: "info",
        quantities: { stated: count(stated), n: count(n) },
      }),
    );
  }

  // Points are judged on the preferred fit (the diagnostics' model), with its p coefficients; the
  // outlier test deletes one point from it, so n − p − 1 residual dof remain.
  const judged = c.chosen;
  const pJudged = judged.fit.p;
  const modelQ = count(pJudged);
  const outlierMinPoints = pJudged + 1 + MIN_DOF_FOR_OUTLIER_TEST;
  const testOutliers = c.diagnostics !== null && n >= outlierMinPoints;
  if (!testOutliers || n < MIN_POINTS_FOR_DIAGNOSTICS || d.distinctT < 3) {
    const q: FlagQuantities = { n: count(n), distinctT: count(d.distinctT) };
    if (!testOutliers) q.outlierMinPoints = count(outlierMinPoints);
    if (n < MIN_POINTS_FOR_DIAGNOSTICS) q.diagnosticsMinPoints = count(MIN_POINTS_FOR_DIAGNOSTICS);
    if (d.distinctT < 3) q.modifiedMinTemperatures = count(3);
    flags.push(toFlag({ code: "too_few_points", severity: "info", quantities: q }));
  }

  const resid = judged.fit.resid;
  if (c.diagnostics) {
    const dof = judged.sum.dof;
    const external = c.diagnostics.externallyStudentized;
    const test = testOutliers ? outlierPoints(d, judged, c.diagnostics, input) : null;
    if (test) {
      const { outliers, bound } = test;
      if (outliers.length > 0) {
        flags.push(
          toFlag({
            code: "outlier",
            severity: "warn",
            points: outliers,
            quantities: { bound: statistic(bound), alpha: probability(ALPHA), dof: count(dof - 1), coefficients: modelQ },
          }),
        );
      }
    }
    const cookBound = cooksDistanceBound(pJudged, n);
    // No residual dof after deleting a point: the residual half of the influence test cannot be made.
    const tPoint = dof - 1 > 0 ? quantileStudentT(1 - INFLUENCE_RESIDUAL_ALPHA / 2, dof - 1) : Infinity;
    const influential: number[] = [];
    let largest = 0;
    const cook = c.diagnostics.cooksDistance;
    for (let i = 0; i < n; i++) {
      // Heavy enough to move the parameters and off the line the other points imply: the ends of
      // a design carry weight by intent, and an ordinary residual there is no finding.
      if (cook[i] > cookBound && Math.abs(external[i]) > tPoint && !withinStatedUncertainty(input, resid, i)) {
        influential.push(i);
        largest = Math.max(largest, cook[i]);
      }
    }
    if (influential.length > 0) {
      flags.push(
        toFlag({
          code: "influential_point",
          severity: "info",
          points: influential,
          quantities: {
            largest: statistic(largest),
            bound: statistic(cookBound),
            dfNum: count(pJudged),
            dfDenom: count(n - pJudged),
            residualBound: statistic(tPoint),
            dof: count(dof - 1),
            coefficients: modelQ,
          },
        }),
      );
    }
  }

  if (c.curvature && curvatureSignificant(c.curvature) && c.modifiedArrhenius) {
    const m = c.modifiedArrhenius.params;
    // Ea(T) = Ea + nRT at the ends of the range.
    const test = c.curvature;
    // Keys in the order the flag has always had them (the F-test's, or exact; then the ends).
    const q: FlagQuantities =
      test.F !== null && test.p !== null
        ? { F: statistic(test.F), dfNum: count(test.dfNum), dfDenom: count(test.dfDenom), p: probability(test.p) }
        : { exact: count(1) };
    q.eaLow = energy(m.Ea + m.n * GAS_CONSTANT * d.Tmin);
    q.tLow = temperature(d.Tmin);
    q.eaHigh = energy(m.Ea + m.n * GAS_CONSTANT * d.Tmax);
    q.tHigh = temperature(d.Tmax);
    flags.push(toFlag({ code: "curvature", severity: "warn", quantities: q }));
  }

  const tRatio = d.Tmax / d.Tmin;
  const seEa = c.arrhenius.se.Ea;
  const relSe = seEa !== null && Ea !== 0 ? seEa / Math.abs(Ea) : null;
  const narrowT = tRatio < NARROW_RANGE_RATIO;
  const looseEa = relSe !== null && seEa !== null && relSe > NARROW_RANGE_RELATIVE_SE && seEa > NARROW_RANGE_MIN_SE;
  if (narrowT || looseEa) {
    const q: FlagQuantities = {};
    if (narrowT) {
      q.tMin = temperature(d.Tmin);
      q.tMax = temperature(d.Tmax);
      q.ratio = ratio(tRatio);
      q.ratioLimit = ratio(NARROW_RANGE_RATIO);
    }
    if (looseEa) {
      q.relativeSE = percent(relSe! * 100);
      q.seEa = energy(seEa!);
    }
    flags.push(toFlag({ code: "narrow_range", severity: "warn", quantities: q }));
  }

  // Only an Ea whose 95 % interval lies wholly below zero: one that cannot be told from 0 is no finding.
  if (seEa !== null && Ea < NEGATIVE_EA_THRESHOLD) {
    const half = t95(c.arrSum.dof) * seEa;
    if (Ea + half < 0) {
      flags.push(
        toFlag({
          code: "negative_activation_energy",
          severity: "info",
          quantities: { Ea: energy(Ea), lower: energy(Ea - half), upper: energy(Ea + half) },
        }),
      );
    }
  }

  // Judged on the fit the analysis prefers: a curved set's straight line leaves scatter that is only its curvature.
  const preferred = c.chosen.sum;
  // χ² at or below its dof has P(χ² > ν) ≥ P(χ²₁ > 1) = 0.317 for every ν ≥ 1 (the tail at the mean
  // rises from there towards ½; checked with survivalChiSquare for ν ≤ 2·10⁵): no tail to compute.
  if (d.weighted && preferred.dof > 0 && preferred.rss > preferred.dof) {
    const p = survivalChiSquare(preferred.rss, preferred.dof);
    if (p < EXCESS_SCATTER_P) {
      const chi2 = preferred.rss / preferred.dof;
      flags.push(
        toFlag({
          code: "excess_scatter",
          severity: "warn",
          quantities: {
            chi2Reduced: statistic(chi2),
            scaleFactor: statistic(Math.sqrt(chi2)),
            dof: count(preferred.dof),
            p: probability(p),
          },
        }),
      );
    }
  }

  const reported = input.reportedFit;
  if (reported) {
    const flag = compareReportedFit(reported, d, c);
    if (flag) flags.push(toFlag(flag));
  }
  return flags;
}

/**
 * The reported expression against the refit's confidence band, over the temperatures where both
 * the data and the reported validity range lie. No overlap at all is a finding of its own.
 */
function compareReportedFit(r: NonNullable<AnalysisInput["reportedFit"]>, d: Prepared, c: FlagContext): FlagDraft | null {
  const from = Math.max(d.Tmin, r.Tmin ?? d.Tmin);
  const to = Math.min(d.Tmax, r.Tmax ?? d.Tmax);
  // The range as the authors state it (either end may be missing).
  const stated = (q: FlagQuantities): FlagQuantities => {
    if (r.Tmin !== undefined) q.reportedMin = temperature(r.Tmin);
    if (r.Tmax !== undefined) q.reportedMax = temperature(r.Tmax);
    return q;
  };
  if (from > to) {
    return {
      code: "reported_range_outside_data",
      severity: "warn",
      quantities: stated({ dataMin: temperature(d.Tmin), dataMax: temperature(d.Tmax) }),
    };
  }
  const restricted = from > d.Tmin || to < d.Tmax;
  const band = restricted ? computeBand(c.chosen.fit, c.chosen.sum, { ...d, Tmin: from, Tmax: to }, c.chosen.model) : c.band;
  const nExp = r.n ?? 0;
  const T0 = r.T0 ?? d.T0;
  const lnA = Math.log(r.A);
  let worst = 0;
  let worstT = 0;
  let worstDiff = 0;
  let outFrom = Infinity;
  let outTo = -Infinity;
  for (let i = 0; i < band.T.length; i++) {
    const T = band.T[i];
    const lnkRep = lnA + nExp * Math.log(T / T0) - r.Ea / (GAS_CONSTANT * T);
    const diff = lnkRep - band.lnk[i];
    const half = band.lower ? band.lnk[i] - band.lower[i] : 0;
    const excess = Math.abs(diff) - half - REPORTED_FIT_TOLERANCE;
    if (excess > 0) {
      outFrom = Math.min(outFrom, T);
      outTo = Math.max(outTo, T);
      if (excess > worst) {
        worst = excess;
        worstT = T;
        worstDiff = diff;
      }
    }
  }
  if (!(worst > 0)) return null;
  const q: FlagQuantities = {
    factor: ratio(Math.min(Math.max(Math.exp(worstDiff), 1e-300), 1e300)),
    at: temperature(worstT),
    outsideFrom: temperature(outFrom),
    outsideTo: temperature(outTo),
    tolerance: percent(100 * Math.expm1(REPORTED_FIT_TOLERANCE)),
  };
  if (band.lower) q.confidence = percent(95);
  if (restricted) {
    q.from = temperature(from);
    q.to = temperature(to);
    stated(q);
  }
  return { code: "reported_fit_disagrees", severity: "warn", quantities: q };
}

function expOrNull(x: number): number | null {
  const v = Math.exp(x);
  return Number.isFinite(v) ? v : null;
}

function toRows(m: ArrayLike<number>, p: number, f: number): number[][] {
  const rows: number[][] = [];
  for (let i = 0; i < p; i++) {
    const row = new Array<number>(p);
    for (let j = 0; j < p; j++) row[j] = m[i * p + j] * f;
    rows.push(row);
  }
  return rows;
}
