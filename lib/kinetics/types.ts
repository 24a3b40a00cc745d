/**
 * Types of the kinetics engine: input of one dataset analysis, its result, flags.
 * Units: T in K; k in the canonical unit of the reaction order (see units.ts); energies in
 * J mol⁻¹; entropies in J mol⁻¹ K⁻¹; ln values are natural logarithms of k in canonical units.
 */

/** Overall reaction order m; fixes the canonical unit of k. */
export type ReactionOrder = 1 | 2 | 3;

/** One measured or computed rate constant. */
export interface RatePoint {
  /** Temperature, K. */
  T: number;
  /** Rate constant in canonical units: s⁻¹, cm³ molecule⁻¹ s⁻¹ or cm⁶ molecule⁻² s⁻¹. */
  k: number;
  /** Standard uncertainty of ln k (dimensionless, ≈ relative uncertainty of k). */
  sigmaLnK?: number;
}

/** Expression stated by the depositor: k = A (T/T0)^n exp(−Ea/RT). */
export interface ReportedFit {
  /** Pre-exponential factor in canonical units. */
  A: number;
  /** Temperature exponent (default 0). */
  n?: number;
  /** Activation energy, J mol⁻¹. */
  Ea: number;
  /** Reference temperature of the (T/T0)^n term, K (default: the analysis T0). */
  T0?: number;
  /** Lowest temperature the authors state the expression for, K. */
  Tmin?: number;
  /** Highest temperature the authors state the expression for, K. */
  Tmax?: number;
}

/** Input of {@link analyseDataset}. */
export interface AnalysisInput {
  points: readonly RatePoint[];
  order: ReactionOrder;
  /** Reference temperature of the modified Arrhenius term, K (default 298.15). */
  T0?: number;
  reportedFit?: ReportedFit;
}

export type Severity = "info" | "warn" | "error";

/** Stable codes of the flags raised by the analysis and the consensus. */
export type FlagCode =
  | "outlier"
  | "influential_point"
  | "curvature"
  | "narrow_range"
  | "negative_activation_energy"
  | "excess_scatter"
  | "too_few_points"
  | "reported_fit_disagrees"
  | "reported_range_outside_data"
  | "uncertainties_ignored"
  | "modified_fit_undetermined";

/**
 * What a number behind a flag measures, so it can be written in the reader's units: energy in
 * J mol⁻¹, temperature in K; the other kinds have no unit (a ratio is a plain quotient, such as
 * Tmax/Tmin in kelvin or a factor between two rate constants).
 */
export type FlagQuantityKind = "energy" | "temperature" | "count" | "probability" | "statistic" | "ratio" | "percent";

/** One number behind a flag, in SI units (J mol⁻¹, K) when it has a unit. */
export interface FlagQuantity {
  kind: FlagQuantityKind;
  value: number;
}

/** One machine finding about a dataset. */
export interface Flag {
  code: FlagCode;
  severity: Severity;
  /** Plain-English explanation with the numbers behind it, energies in kJ mol⁻¹ and temperatures in K. */
  message: string;
  /** Zero-based indices into the input points, where the finding concerns specific points. */
  points?: number[];
  /**
   * The numbers of the message by name, each with its kind, so formatFlagMessage (flag-text.ts)
   * can write the message in other units. Absent from analyses stored by engines before kinetics-2.
   */
  quantities?: Record<string, FlagQuantity>;
}

/** A value with its two-sided 95 % confidence limits (limits null when dof = 0; any entry null if exp overflows a double). */
export interface ConfidenceInterval {
  value: number | null;
  lower: number | null;
  upper: number | null;
}

/** How far a temperature lies outside the measured range. */
export interface Extrapolation {
  /** "below": under the lowest measured temperature; "above": over the highest. */
  side: "below" | "above";
  /** Distance to the nearest end of the range, K. */
  kelvin: number;
  /** The same distance in 1/T, as a multiple of the width of the measured range in 1/T (1/Tmin − 1/Tmax). */
  inverseTWidths: number;
}

/**
 * k(298.15 K) with its interval, and whether 298.15 K lies outside the measured range. Beyond one
 * width of the measured range in 1/T the limits are null (a model-conditional interval that far out
 * misleads) and intervalOmitted says so.
 */
export interface RateAt298 extends ConfidenceInterval {
  /** True when lower and upper are null because 298.15 K lies too far outside the data (not because dof = 0). */
  intervalOmitted?: boolean;
  /** True when 298.15 K is outside [Tmin, Tmax]: the value is an extrapolation of the fit. */
  extrapolated: boolean;
  /** How far outside; null when not extrapolated. */
  extrapolation: Extrapolation | null;
}

/** k at a temperature inside the measured range, with its 95 % confidence interval. */
export interface RateAtTemperature extends ConfidenceInterval {
  /** Temperature, K. */
  T: number;
}

/** Residual spread and per-point values of a fit (ln k, in input order). */
export interface FitResiduals {
  /**
   * √(χ²/dof) = √(RSS_w/dof) with weights 1/σ²: the typical residual in units of the stated
   * uncertainties (1 when the points scatter as stated). Dimensionless; null on unweighted fits and when dof = 0.
   */
  scaleFactor: number | null;
  /** √(Σ rᵢ²/dof) of the unweighted ln k residuals rᵢ; null when dof = 0. */
  residualSDLnK: number | null;
  /** rᵢ = ln kᵢ − fitted ln kᵢ (not weighted), per point. */
  residuals: number[];
  /** Fitted ln k at each point's temperature. */
  fitted: number[];
}

/** Two-parameter Arrhenius fit ln k = ln A − Ea/(RT). */
export interface ArrheniusFit extends FitResiduals {
  params: {
    lnA: number;
    /** exp(lnA) in canonical units; null if it overflows a double. */
    A: number | null;
    /** J mol⁻¹. */
    Ea: number;
  };
  /** Standard errors; null when dof = 0. */
  se: { lnA: number | null; Ea: number | null };
  /** s²(XᵀWX)⁻¹ over [lnA, Ea], s² = RSS/dof unweighted, max(1, χ²/dof) weighted; null when dof = 0. */
  covariance: number[][] | null;
  /** Weighted R² about the weighted mean of ln k; null when all ln k are equal. */
  r2: number | null;
  /** s = √(RSS_w/dof): scaleFactor on weighted fits, residualSDLnK on unweighted ones; null when dof = 0. */
  residualSD: number | null;
  dof: number;
  /** Weighted residual sum of squares of ln k. */
  rss: number;
  /** Small-sample AIC; null when n − k − 1 ≤ 0. */
  aicc: number | null;
  /** RSS_w/dof with absolute weights 1/σ²; only on weighted fits, null when dof = 0. */
  chi2Reduced?: number | null;
  /** k(298.15 K) in canonical units with its 95 % confidence interval, marked when 298.15 K is outside the data. */
  k298: RateAt298;
  /** k at the middle of the measured range in 1/T, T = 2/(1/Tmin + 1/Tmax), with its 95 % confidence interval. */
  kMid: RateAtTemperature;
}

/** Three-parameter fit ln k = ln A + n ln(T/T0) − Ea/(RT). */
export interface ModifiedArrheniusFit extends FitResiduals {
  params: { lnA: number; A: number | null; n: number; Ea: number; T0: number };
  se: { lnA: number | null; n: number | null; Ea: number | null };
  /** s²(XᵀWX)⁻¹ over [lnA, n, Ea], s² as for the Arrhenius fit; null when dof = 0. */
  covariance: number[][] | null;
  r2: number | null;
  residualSD: number | null;
  dof: number;
  rss: number;
  aicc: number | null;
  chi2Reduced?: number | null;
}

/** Eyring fit ln(k_c h/(k_B T)) = ΔS‡/R − ΔH‡/(RT), κ = 1. */
export interface EyringFit {
  /** dH in J mol⁻¹, dS in J mol⁻¹ K⁻¹. */
  params: { dH: number; dS: number };
  se: { dH: number | null; dS: number | null };
  /** Transmission coefficient and standard state used, in words. */
  convention: string;
}

/**
 * Per-point influence measures, in input order, of the fit the analysis prefers: the modified
 * Arrhenius fit when the curvature test is significant (band.model), else the Arrhenius fit.
 */
export interface Diagnostics {
  /** The fit the measures are computed on. Absent from analyses stored by engines before kinetics-3 (Arrhenius). */
  model?: "arrhenius" | "modified_arrhenius";
  leverage: number[];
  studentized: number[];
  externallyStudentized: number[];
  cooksDistance: number[];
}

/** Test of the modified against the plain Arrhenius expression. */
export interface CurvatureTest {
  /**
   * F statistic on (dfNum, dfDenom) = (1, n − 3) degrees of freedom; null when exact (the modified
   * fit's residuals are the rounding of ln k, so any F would be a ratio of rounding errors).
   */
  F: number | null;
  /** Numerator degrees of freedom (one added coefficient). */
  dfNum: number;
  /** Denominator degrees of freedom, n − 3 (residual dof of the modified fit). */
  dfDenom: number;
  /** Upper-tail probability of F; null when exact (below any printable bound). */
  p: number | null;
  /**
   * The modified fit reproduces ln k to within its rounding (RSS at or below Σwᵢ(1e-13·(1 + |ln kᵢ|))²)
   * while the Arrhenius fit does not: the data lie on a curved modified Arrhenius expression exactly,
   * within the arithmetic. The curvature is then significant, with no F or p to print.
   */
  exact: boolean;
  /** AICc(modified) − AICc(Arrhenius); null when either AICc is null. */
  deltaAICc: number | null;
  /** "up": apparent Ea rises with T (n > 0); "down": it falls. */
  direction: "up" | "down";
}

/** 95 % confidence band of ln k for the chosen model. */
export interface ConfidenceBand {
  model: "arrhenius" | "modified_arrhenius";
  /** 50 temperatures from Tmin to Tmax, evenly spaced in 1/T, K. */
  T: number[];
  lnk: number[];
  /** Null when the chosen fit has dof = 0. */
  lower: number[] | null;
  upper: number[] | null;
}

/** Result of {@link analyseDataset}. */
export interface AnalysisResult {
  n: number;
  weighted: boolean;
  arrhenius: ArrheniusFit;
  modifiedArrhenius: ModifiedArrheniusFit | null;
  eyring: EyringFit | null;
  diagnostics: Diagnostics | null;
  curvature: CurvatureTest | null;
  band: ConfidenceBand;
  flags: Flag[];
}
