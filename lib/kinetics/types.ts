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
  | "uncertainties_ignored"
  | "modified_fit_undetermined";

/** One machine finding about a dataset. */
export interface Flag {
  code: FlagCode;
  severity: Severity;
  /** Plain-English explanation with the numbers behind it. */
  message: string;
  /** Zero-based indices into the input points, where the finding concerns specific points. */
  points?: number[];
}

/** A value with its two-sided 95 % confidence limits (limits null when dof = 0; any entry null if exp overflows a double). */
export interface ConfidenceInterval {
  value: number | null;
  lower: number | null;
  upper: number | null;
}

/** Two-parameter Arrhenius fit ln k = ln A − Ea/(RT). */
export interface ArrheniusFit {
  params: {
    lnA: number;
    /** exp(lnA) in canonical units; null if it overflows a double. */
    A: number | null;
    /** J mol⁻¹. */
    Ea: number;
  };
  /** Standard errors; null when dof = 0. */
  se: { lnA: number | null; Ea: number | null };
  /** s²(XᵀWX)⁻¹ over [lnA, Ea]; null when dof = 0. */
  covariance: number[][] | null;
  /** Weighted R² about the weighted mean of ln k; null when all ln k are equal. */
  r2: number | null;
  /** s = √(RSS_w/dof); null when dof = 0. */
  residualSD: number | null;
  dof: number;
  /** Weighted residual sum of squares of ln k. */
  rss: number;
  /** Small-sample AIC; null when n − k − 1 ≤ 0. */
  aicc: number | null;
  /** RSS_w/dof with absolute weights 1/σ²; only on weighted fits, null when dof = 0. */
  chi2Reduced?: number | null;
  /** k(298.15 K) in canonical units with its 95 % confidence interval. */
  k298: ConfidenceInterval;
}

/** Three-parameter fit ln k = ln A + n ln(T/T0) − Ea/(RT). */
export interface ModifiedArrheniusFit {
  params: { lnA: number; A: number | null; n: number; Ea: number; T0: number };
  se: { lnA: number | null; n: number | null; Ea: number | null };
  /** s²(XᵀWX)⁻¹ over [lnA, n, Ea]; null when dof = 0. */
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

/** Per-point influence measures of the Arrhenius fit, in input order. */
export interface Diagnostics {
  leverage: number[];
  studentized: number[];
  externallyStudentized: number[];
  cooksDistance: number[];
}

/** Test of the modified against the plain Arrhenius expression. */
export interface CurvatureTest {
  /** F statistic on (1, n − 3) degrees of freedom. */
  F: number;
  /** Upper-tail probability of F. */
  p: number;
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
