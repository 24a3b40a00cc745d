/**
 * Consensus expression for one reaction from several datasets: a two-stage random-effects model.
 *
 * Stage 1 (consensus-support.ts). Each dataset is summarised by its own fit — the model its own
 * analysis prefers — as fitted ln k at support temperatures inside its own measured range (both
 * ends and the middle in 1/T; one more per doubling of Tmax/Tmin, up to 7), with their covariance
 * V_j from that fit (rank 2 for a straight set: it says nothing of curvature beyond τ², so a
 * modified consensus needs a curved set). It is judged against the others through its modified fit
 * (values and covariance) whenever that is determined, so an undetected curvature is not ruled out;
 * the only curved dataset is judged against the others' modified consensus of those fits. A dataset therefore weighs by its
 * information, not by its number of points, and never speaks outside its range. One
 * temperature: one support value (weighted mean ln k) with its variance; two temperatures: the
 * Arrhenius line through them (both ends). Without stated uncertainties and without spare
 * points, a dataset borrows the pooled residual variance of the others.
 *
 * Stage 2 (consensus-fit.ts, consensus-meta.ts). The consensus curve, Arrhenius
 * ln k = ln A − Ea/(RT) and, where the support temperatures span at least a factor 1.5 in T (3
 * distinct), modified Arrhenius ln k = ln A + n ln(T/T0) − Ea/(RT), by generalised
 * least squares on all support values with covariance V_j + τ²·I per dataset; τ² is the
 * between-dataset variance of ln k (any shape the expression cannot follow included), estimated
 * by the DerSimonian–Laird moment estimator for meta-regression (DerSimonian & Laird 1986;
 * Viechtbauer 2010, J. Stat. Softw. 36(3)); covariance of the parameters (FᵀWF)⁻¹, variances
 * treated as known. Modified Arrhenius is preferred when |n| > z_{0.975}·se(n) (1.959964).
 *
 * Disagreement is a curve. For each dataset j: the consensus of the other datasets, built by the
 * same rules (τ²₋ⱼ re-estimated), and at comparison temperatures spread over the part of j's
 * range the others cover (both ends and the middle in 1/T, two more when it spans more than a
 * factor 2) the ratio k_j(T)/k₋ⱼ(T) with z = (ln k_j − ln k₋ⱼ)/√(var_j + τ²₋ⱼ + var₋ⱼ), the
 * externally standardised residual of Viechtbauer & Cheung (2010, Res. Synth. Methods 1:112)
 * taken along the curve. Off the consensus: any |z| above the Bonferroni bound z_{1−0.05/(2m)}
 * over its m comparison temperatures (1.959964 for one, 2.393980 for three). Whether its activation
 * energy differs: the difference of the log ratios between the cold and the hot end against its
 * standard error (|z| > 1.959964); whether the factor changes at all: a χ² test of the log ratio's
 * contrasts. Against one other dataset, that dataset is read through its own fit, as the dataset
 * compared is (τ² = 0), so A against B mirrors B against A. A dataset that agrees everywhere is
 * never flagged, however precise.
 *
 * Largest consistent subset (Cox 2007, Metrologia 44:187). The decision to set aside is family-wise:
 * off at z_{1−α/(2M)}, M the comparison temperatures of all included datasets (the words keep each
 * dataset's own bound). Up to 20 included datasets, one search ({@link setAsideChoice}) over removal
 * sets of 1–3 among the 7 furthest off: the smallest size whose rest has none off, each removed
 * off the rest, never a majority removed (as many only when those removed disagree grossly among
 * themselves), nothing when two qualifying sets leave disjoint rests, else the rest with the smallest
 * excess Q − dof. Above 20, one at a time while one is off (family-wise), at most 3.
 *
 * unit_suspect: the mean log10 ratio within 0.15 of a unit-mistake factor for the order m
 * (N_A^(m−1), 10^(3(m−1)), 10^(6(m−1)), (N_A/10³)^(m−1), (N_A/10⁶)^(m−1)); such a dataset is
 * left out and the consensus refitted, the largest mistake first, as long as one dataset remains.
 *
 * Uncertainty factor f(T) = exp(1.959964·√(var ln k̂(T) + τ²)) over the temperatures the included
 * data cover; outside them it is not given (extrapolation).
 */
import { analyseOutliers, MIN_DOF_FOR_OUTLIER_TEST } from "./analyse-dataset";
import { AnalysisError } from "./analysis-error";
import {
  buildRows,
  fitModel,
  leaveOneOutFits,
  predict,
  predictCovariance,
  predictDifferenceVariance,
  shareDirection,
  symmetricEigen,
  shareVectors,
  toPublished,
  type ModelFit,
  type Rows,
} from "./consensus-fit";
import {
  assignPooledScales,
  evaluateOwnFit,
  ownCovariance,
  ownDifferenceVariance,
  summariseDataset,
  Z95,
  type SupportInput,
  type DatasetSupport,
  type OwnModel,
  type ScaleSource,
} from "./consensus-support";
import { describeVerdict, matchUnitMistake } from "./consensus-words";
import { REFERENCE_TEMPERATURE } from "./constants";
import { quantileNormal, survivalChiSquare } from "./distributions";
import { assertReactionOrder, checkPoints, describe } from "./validate-points";
import type { RatePoint, ReactionOrder, Severity } from "./types";

export { matchUnitMistake, UNIT_SUSPECT_WINDOW } from "./consensus-words";
export { combineEffectsDL, type CombinedEffects } from "./consensus-meta";

/** One dataset of a reaction, in canonical units. */
export interface ConsensusDataset {
  id: string;
  points: readonly RatePoint[];
  order: ReactionOrder;
  /** Set to leave the dataset out of the consensus (the reason is shown); it is still compared with it. */
  excludedReason?: string | null;
  /** How the words name it (default "Dataset <id>"). */
  label?: string;
  /** The number each point has where the reader sees it (default 1, 2, …), for the words about outliers. */
  pointNumbers?: readonly number[];
  /**
   * Zero-based indices (into points) of the outliers its own analysis flagged on exactly these
   * points, when that analysis is at hand (a stored one): the consensus then takes them instead of
   * analysing the dataset again. Left out (undefined), the consensus analyses the dataset itself.
   */
  outliers?: readonly number[] | null;
}

export interface ConsensusOptions {
  /** Reference temperature of the modified Arrhenius term, K (default 298.15). */
  T0?: number;
  /** Only points with Tmin ≤ T ≤ Tmax (K) enter; either end may be left open. */
  window?: { Tmin?: number | null; Tmax?: number | null } | null;
}

export type ConsensusFlagCode = "off_consensus" | "unit_suspect" | "few_datasets" | "datasets_disagree" | "not_compared";

export interface ConsensusFlag {
  code: ConsensusFlagCode;
  severity: Severity;
  message: string;
  datasetIds?: string[];
}

/** Uncertainty factor f: k̂/f … k̂·f covers 95 %, between-dataset variance included. */
export interface UncertaintyFactor {
  /** K */
  T: number;
  /** Null only if it overflows a double. */
  f: number | null;
  /** Included datasets whose range contains T. */
  datasets: number;
}

interface ConsensusFitCommon {
  covariance: number[][];
  /** Between-dataset variance of ln k (DerSimonian–Laird). */
  tau2: number;
  /** Generalised Cochran's Q of the support values about the fixed-effect fit, on dof = independent rows (Σ rank V_j) − coefficients. */
  q: number;
  dof: number;
  /** Higgins I² = max(0, (Q − dof)/Q). */
  i2: number;
  /** Support values the fit rests on. */
  supportValues: number;
  /** 95 % band of ln k including τ², 50 temperatures evenly spaced in 1/T over the covered range. */
  band: { T: number[]; lnk: number[]; lower: number[]; upper: number[] };
  /** f(T) at 7 temperatures evenly spaced in 1/T over the covered range (and 298.15 K when inside it). */
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

/** One fitted value of a dataset's own fit. */
export interface SupportValue {
  /** K */
  T: number;
  lnk: number;
  se: number;
}

/** The dataset against the consensus of the others at one temperature. */
export interface ComparisonPoint {
  /** K */
  T: number;
  /** k_j(T)/k₋ⱼ(T); null only if it overflows a double. */
  ratio: number | null;
  log10Ratio: number;
  z: number;
  agrees: boolean;
  /** Standard errors of ln k of the dataset's own fit and of the other side at T: with tau2, the denominator of z. */
  seOwn: number;
  seOthers: number;
}

/** How one dataset sits against the consensus of the others, along its range. */
export interface Disagreement {
  /** Other datasets in that consensus. */
  comparedWith: number;
  model: "arrhenius" | "modified_arrhenius";
  /** τ²₋ⱼ: the between-dataset variance of the others' consensus, without this dataset (0 when the other side is one dataset). */
  tau2: number;
  /** Part of the dataset's range the others cover; null when they cover none of it. */
  range: { Tmin: number; Tmax: number } | null;
  points: ComparisonPoint[];
  /** Bonferroni bound on |z| over the comparison temperatures (family level 0.05). */
  bound: number;
  off: boolean;
  /** Its activation energy against the others' ("same" when the difference is not significant); null with one temperature. */
  activationEnergy: "lower" | "higher" | "same" | null;
  /** z of the difference of log ratios between the cold and the hot end. */
  slopeZ: number | null;
  /** Whether the log ratio changes along the comparison temperatures (χ² test of its contrasts, p < 0.05); null with one temperature. */
  factorChanges: boolean | null;
  /** p of that test. */
  factorChangeP: number | null;
  /** Mean log10 ratio over the comparison temperatures (over its support temperatures when none). */
  meanOffsetLog10: number;
  /**
   * The other dataset with the largest share in the others' consensus at the comparison temperature
   * with the largest |z| (T), when that share is over 2/3; inRange says whether T lies inside that
   * dataset's own range (outside it, the others' curve there is an extrapolation of that dataset).
   */
  restsOn: { id: string; share: number; T: number; Tmin: number; Tmax: number; inRange: boolean } | null;
  /**
   * It agrees only because the others disagree with each other: at some comparison temperature its
   * difference exceeds the bound against its own uncertainty, and τ²₋ⱼ exceeds its own and the other
   * side's variance together. False when off, or with one other dataset.
   */
  agreesOnlyWithinSpread: boolean;
}

/** One dataset: what it brought (stage 1) and how it compares. */
export interface ConsensusMember {
  id: string;
  /** Points used (inside the window, outliers of its own fit left out). */
  n: number;
  /** Zero-based indices (into the points given) of the outliers of its own fit, left out of its summary. */
  outliers: number[];
  /** Points given. */
  pointsGiven: number;
  Tmin: number | null;
  Tmax: number | null;
  weighted: boolean;
  included: boolean;
  /** Why it is not in the consensus; null when it is. */
  leftOut: string | null;
  /** The own fit that summarises it. */
  model: OwnModel | null;
  /** σ(ln k) per point behind its variance when no uncertainties are stated. */
  sigmaLnK: number | null;
  scaleSource: ScaleSource | null;
  support: SupportValue[];
  supportCovariance: number[][];
  disagreement: Disagreement | null;
  /**
   * Its share in the consensus ln k̂ at shareT, the middle of its own range in 1/T; null when left
   * out. Each dataset's share is read at its own temperature, so these do not add up to 1 across
   * datasets: {@link ConsensusResult.shares} gives every dataset's share at common temperatures.
   */
  share: number | null;
  /** K: where share is read (the middle of its range in 1/T); null when left out. */
  shareT: number | null;
  unitSuspect: string | null;
  /**
   * Set aside by the largest-consistent-subset rule: off the consensus of the others, so left out
   * of the curve (leftOut says so); its disagreement is with the final consensus.
   */
  setAside: boolean;
  /** The comparison in one sentence. */
  verdict: string;
}

export interface ConsensusResult {
  order: ReactionOrder;
  T0: number;
  window: { Tmin: number | null; Tmax: number | null };
  /** Datasets given, datasets in the consensus, their points and support values. */
  datasets: number;
  included: number;
  points: number;
  supportValues: number;
  /** Ids of the datasets that shaped the curve (the included ones, in the order given). */
  curveFrom: string[];
  /** Temperatures covered by the included datasets. */
  range: { Tmin: number; Tmax: number };
  method: string;
  arrhenius: ConsensusArrhenius;
  modifiedArrhenius: ConsensusModifiedArrhenius | null;
  preferred: "arrhenius" | "modified_arrhenius";
  /**
   * Who carries the preferred consensus at each temperature of its uncertaintyFactor: the share of
   * every included dataset in ln k̂(T) (the GLS prediction is linear in the support values), in the
   * order of members. At each temperature the shares add up to 1; a share can be negative.
   */
  shares: ConsensusShares[];
  members: ConsensusMember[];
  flags: ConsensusFlag[];
}

/** Every included dataset's share in the consensus at one temperature (they add up to 1). */
export interface ConsensusShares {
  /** K */
  T: number;
  shares: { id: string; share: number }[];
}

/** The largest consistent subset stops setting datasets aside when this many remain. */
export const MIN_CONSISTENT_SUBSET = 2;
/**
 * At most this many datasets are set aside (each costs a refit): beyond a few, the data are not one
 * consensus with a few stray sets, and the remaining ones off it are flagged as they are.
 */
export const MAX_SET_ASIDE = 3;
/** leftOut of a dataset set aside by the largest-consistent-subset rule. */
export const SET_ASIDE_REASON = "off the consensus — not used for the curve";
/** Family-wise level of the off-consensus test. */
export const OFF_CONSENSUS_ALPHA = 0.05;
/** Smallest Tmax/Tmin of the support temperatures for a modified Arrhenius consensus. */
export const MODIFIED_MIN_SPAN = 1.5;
/** Up to this many included datasets every leave-one-out fit is redone at its own τ². */
export const EXACT_LEAVE_ONE_OUT_LIMIT = 400;
/** One-sided 95 % standard normal quantile z_{0.95}: the others' curvature in the same direction. */
const Z95_ONE_SIDED = 1.6448536269514722;
/** Share above which the others' consensus is said to rest on one dataset. */
const DOMINANT_SHARE = 2 / 3;
const BAND_POINTS = 50;
const FACTOR_POINTS = 7;

interface Fits {
  arr: ModelFit;
  mod: ModelFit | null;
  preferred: ModelFit;
}

interface Others {
  fit: ModelFit;
  /** The datasets in the consensus, one of which (skip) may be the dataset compared. */
  blocks: readonly number[];
  skip: number;
  count: number;
  Tmin: number;
  Tmax: number;
  /**
   * Excess Q − dof of the others' fixed-effect Arrhenius fit: every subset has one, so removals are
   * compared in one model with the same number of coefficients (null for a dataset not in the consensus);
   * the set-aside score unless the datasets' curvature is corroborated ({@link corroboratedExcess}).
   */
  restExcess: number | null;
  /**
   * Rows the fit was made on when they are not the consensus' own: the others' support values with
   * the covariance of the fits that judge them (the modified fit's when determined), used when the
   * dataset compared is curved and the others' consensus is straight (see {@link leaveOneOut}).
   */
  rows?: Rows;
}

/**
 * Two-stage random-effects consensus of several datasets of one reaction (see the module
 * comment). Throws {@link AnalysisError} on invalid input.
 *
 * @param datasets datasets with points in canonical units (T in K) and a common reaction order
 * @param options T0 of the modified term; a temperature window
 * @example consensus([{ id: "a", order: 2, points }, { id: "b", order: 2, points: others }]).members[1].verdict
 */
export function consensus(datasets: readonly ConsensusDataset[], options: ConsensusOptions = {}): ConsensusResult {
  if (!Array.isArray(datasets) || datasets.length === 0) {
    throw new AnalysisError("invalid_input", "A consensus needs at least one dataset.");
  }
  const order = datasets[0].order;
  assertReactionOrder(order, datasets[0].id);
  const T0 = options.T0 ?? REFERENCE_TEMPERATURE;
  if (typeof T0 !== "number" || !Number.isFinite(T0) || T0 <= 0) {
    throw new AnalysisError("invalid_reference_temperature", `T0 must be a positive temperature in kelvin (got ${describe(T0)}).`);
  }
  const window = checkWindow(options.window);

  const seen = new Set<string>();
  const supports: (DatasetSupport | null)[] = [];
  const outliers: number[][] = [];
  for (const ds of datasets) {
    assertReactionOrder(ds.order, ds.id);
    if (ds.order !== order) {
      throw new AnalysisError(
        "mixed_orders",
        `Dataset ${ds.id} is order ${ds.order} but dataset ${datasets[0].id} is order ${order}; a consensus combines datasets of one reaction.`,
        { datasetId: ds.id },
      );
    }
    if (seen.has(ds.id)) throw new AnalysisError("invalid_input", `Dataset ${ds.id} is given twice.`, { datasetId: ds.id });
    seen.add(ds.id);
    if (!Array.isArray(ds.points)) checkPoints(ds.points, ds.id);
    if (ds.points.length === 0) throw new AnalysisError("too_few_points", `Dataset ${ds.id} has no points.`, { datasetId: ds.id });
    // One shape for every input (skip always present): a second shape for the datasets with
    // outliers would send the summary's hot loop back to unoptimised code again and again.
    const input: SupportInput = {
      id: ds.id,
      points: ds.points,
      window: { Tmin: window.Tmin ?? 0, Tmax: window.Tmax ?? Infinity },
      skip: null,
      // Without stored outliers the dataset's own outlier test runs unless its fits show it cannot find one.
      screen: ds.outliers == null,
    };
    let support = summariseDataset(input, T0);
    // One pass: the outliers of the dataset's own fit are left out of its summary, and it is summarised again.
    // The dataset's own analysis judges outliers on the model it prefers, so a curved dataset's ends are not outliers.
    const own = !support
      ? []
      : ds.outliers != null
        ? givenOutliers(ds, window)
        : support.outlierFree
          ? []
          : ownOutliers(ds, input.window, T0);
    if (own.length > 0) {
      input.skip = new Set(own);
      support = summariseDataset(input, T0);
    }
    outliers.push(own);
    supports.push(support);
  }
  assignPooledScales(supports.filter((s): s is DatasetSupport => s !== null));

  const J = datasets.length;
  const leftOut: (string | null)[] = datasets.map((ds, j) =>
    !supports[j] ? "no points inside the temperature window" : ds.excludedReason ? ds.excludedReason : null,
  );
  if (supports.every((s) => !s)) {
    throw new AnalysisError("too_few_points", `No dataset has points between ${windowWords(window)}.`);
  }
  if (leftOut.every((r) => r !== null)) {
    throw new AnalysisError("invalid_input", "Every dataset is left out of the consensus; at least one must be in it.");
  }
  const rows = buildRows(supports, T0);
  // The support values and covariance of the fits that judge each dataset (modified when determined).
  let judged: Rows | null = null;
  // When every dataset is judged by the fit that summarises it, those rows are the consensus' own.
  const judgedRows = () => (judged ??= supports.every((s) => !s || s.judge === s.fit) ? rows : buildRows(supports.map(judgedSupport), T0));
  const unitSuspect: (string | null)[] = new Array(J).fill(null);
  const setAside: boolean[] = new Array(J).fill(false);

  let fits: Fits;
  let others: (Others | null)[];
  let searched = false;
  // Decided on the first pass: many datasets are set aside one at a time, up to 20 by one search.
  let greedy: boolean | undefined;
  for (;;) {
    const included = range(J).filter((j) => leftOut[j] === null);
    fits = fitAll(rows, supports, included);
    const kept: KeptFits = { mod: null };
    others = leaveOneOut(rows, supports, included, fits, judgedRows, kept);
    // While datasets may still leave, only where each one is off is needed: the slope and
    // changing-factor tests and who carries the others are read once, when the subset is settled.
    const readings = range(J).map((j) => quickReading(rows, supports, others[j], j));
    // The largest unit mistake among the included datasets leaves first; the rest are judged again.
    let worst = -1;
    for (const j of included) {
      const d = readings[j];
      if (!d || !matchUnitMistake(d.meanOffsetLog10, order)) continue;
      if (worst < 0 || Math.abs(d.meanOffsetLog10) > Math.abs(readings[worst]!.meanOffsetLog10)) worst = j;
    }
    if (worst >= 0 && included.length >= 2) {
      unitSuspect[worst] = matchUnitMistake(readings[worst]!.meanOffsetLog10, order);
      leftOut[worst] = `a likely unit mistake (${unitSuspect[worst]})`;
      continue;
    }
    // Largest consistent subset (Cox 2007, Metrologia 44:187), decided once on the included datasets
    // (see setAsideChoice); after a set-aside everything is fitted and judged again, and a unit
    // mistake found then still leaves first.
    if (searched || included.length <= MIN_CONSISTENT_SUBSET) break;
    const bound = familyBound(included, readings);
    greedy ??= included.length > EXHAUSTIVE_SET_ASIDE_LIMIT;
    if (greedy) {
      // Many datasets: one at a time, while one is off at the family-wise bound.
      const count = setAside.filter(Boolean).length;
      if (count >= MAX_SET_ASIDE || count + 1 > included.length - 1 || !included.some((j) => offFamily(readings[j], bound))) break;
      const far = leastConsistent(
        included,
        others,
        readings,
        corroboratedExcess(judgedRows, supports, included, judgedRows() === rows && fits.mod ? { full: fits.mod, loo: kept.mod } : null),
      );
      if (far < 0) break;
      setAside[far] = true;
      leftOut[far] = SET_ASIDE_REASON;
      continue;
    }
    searched = true;
    const chosen = setAsideChoice(rows, supports, included, fits, readings, bound, judgedRows, kept);
    if (!chosen) break;
    for (const j of chosen) {
      setAside[j] = true;
      leftOut[j] = SET_ASIDE_REASON;
    }
  }
  const shareCache = new ShareCache(rows);
  const settled = others;
  const comparisons = range(J).map((j) => compare(rows, supports, settled[j], j, datasets, shareCache));
  for (let j = 0; j < J; j++) {
    const d = comparisons[j];
    if (!unitSuspect[j] && d && leftOut[j] !== null) unitSuspect[j] = matchUnitMistake(d.meanOffsetLog10, order);
  }

  const included = range(J).filter((j) => leftOut[j] === null);
  const covered = {
    Tmin: Math.min(...included.map((j) => supports[j]!.Tmin)),
    Tmax: Math.max(...included.map((j) => supports[j]!.Tmax)),
  };
  const coverage = (T: number) =>
    included.filter((j) => supports[j]!.Tmin <= T * (1 + 1e-12) && T <= supports[j]!.Tmax * (1 + 1e-12)).length;

  const label = (j: number) => datasets[j].label ?? `Dataset ${datasets[j].id}`;
  const shareAt = new Map<number, { T: number; share: number }>();
  const g = shareVectors(rows, included, fits.preferred.weightTau2);
  const shareOf = (j: number, a: readonly number[]) => a[0] * g[3 * j] + a[1] * g[3 * j + 1] + a[2] * g[3 * j + 2];
  for (const j of included) {
    const s = supports[j]!;
    const T = 2 / (1 / s.Tmin + 1 / s.Tmax);
    shareAt.set(j, { T, share: shareOf(j, shareDirection(rows, fits.preferred, T)) });
  }
  const shares: ConsensusShares[] = gridT(covered.Tmin, covered.Tmax, FACTOR_POINTS).map((T) => {
    const a = shareDirection(rows, fits.preferred, T);
    return { T, shares: included.map((j) => ({ id: datasets[j].id, share: shareOf(j, a) })) };
  });
  const members: ConsensusMember[] = datasets.map((ds, j) => {
    const s = supports[j];
    const d = comparisons[j];
    return {
      id: ds.id,
      n: s?.n ?? 0,
      outliers: outliers[j],
      pointsGiven: ds.points.length,
      Tmin: s?.Tmin ?? null,
      Tmax: s?.Tmax ?? null,
      weighted: s?.weighted ?? false,
      included: leftOut[j] === null,
      leftOut: leftOut[j],
      model: s?.fit.model ?? null,
      sigmaLnK: s?.sigmaLnK ?? null,
      scaleSource: s?.scaleSource ?? null,
      support: s ? s.temps.map((T, a) => ({ T, lnk: s.lnk[a], se: Math.sqrt(s.cov[a * s.temps.length + a]) })) : [],
      supportCovariance: s ? s.temps.map((_, a) => s.temps.map((__, b) => s.cov[a * s.temps.length + b])) : [],
      disagreement: d,
      share: shareAt.get(j)?.share ?? null,
      shareT: shareAt.get(j)?.T ?? null,
      unitSuspect: unitSuspect[j],
      setAside: setAside[j],
      verdict:
        verdictOf(
          label,
          j,
          s,
          d,
          others[j],
          leftOut[j],
          unitSuspect[j],
          included.length - (leftOut[j] === null ? 1 : 0),
          datasets,
          // The others that are themselves off the consensus of the rest: the odd ones out.
          d?.agreesOnlyWithinSpread ? included.filter((k) => k !== j && comparisons[k]?.off).map(label) : [],
        ) + outlierWords(outliers[j], ds.pointNumbers),
    };
  });

  const flags = collectFlags(members, included.length);
  const points = included.reduce((acc, j) => acc + supports[j]!.n, 0);
  const values = included.reduce((acc, j) => acc + supports[j]!.temps.length, 0);
  return {
    order,
    T0,
    window,
    datasets: J,
    included: included.length,
    points,
    supportValues: values,
    curveFrom: included.map((j) => datasets[j].id),
    range: covered,
    method:
      "Two-stage random effects: each dataset's own (preferred) fit gives ln k at support temperatures inside its range with their covariance V_j; the consensus is the GLS fit to all support values with covariance V_j + τ²·I, τ² by DerSimonian–Laird; datasets are compared with the consensus of the others along their range; largest consistent subset (Cox 2007) with a family-wise bound over all comparisons: up to 20 datasets the smallest removal of 1–3 datasets whose rest has none off, each removed off the rest and never a majority (as many only when those removed disagree grossly), nothing when two such removals leave disjoint rests, else the rest with the smallest Q − dof; above 20 one at a time while one is off; bands and f(T) at 95 % including τ².",
    arrhenius: { ...buildArrhenius(rows, fits.arr, covered, coverage), supportValues: values },
    modifiedArrhenius: fits.mod ? { ...buildModified(rows, fits.mod, covered, coverage, T0), supportValues: values } : null,
    preferred: fits.preferred.q === 3 ? "modified_arrhenius" : "arrhenius",
    shares,
    members,
    flags,
  };
}

/**
 * Points the dataset's own analysis (analyseDataset, on its points inside the window) flags as
 * outliers, as zero-based indices into its points; none when it has too few points to test, when
 * its curvature test is significant (it is then summarised by its modified fit) or the analysis refuses it.
 */
function ownOutliers(ds: ConsensusDataset, window: { Tmin: number; Tmax: number }, T0: number): number[] {
  const index: number[] = [];
  const points: RatePoint[] = [];
  ds.points.forEach((p, i) => {
    if (p.T >= window.Tmin && p.T <= window.Tmax) {
      index.push(i);
      points.push(p);
    }
  });
  // The Arrhenius fit's outlier test needs n − 2 − 1 ≥ MIN_DOF_FOR_OUTLIER_TEST.
  if (points.length < MIN_DOF_FOR_OUTLIER_TEST + 3) return [];
  try {
    // The outlier flag of analyseDataset on these points, without the rest of that analysis.
    return analyseOutliers({ points, order: ds.order, T0 }).map((i) => index[i]);
  } catch (err) {
    if (err instanceof AnalysisError) return [];
    throw err;
  }
}

/** Outliers given with the dataset, checked: integers indexing its points, inside the window. */
function givenOutliers(ds: ConsensusDataset, window: { Tmin: number | null; Tmax: number | null }): number[] {
  const list = ds.outliers!;
  if (!Array.isArray(list)) throw new AnalysisError("invalid_input", `Dataset ${ds.id}: outliers must be a list of point indices.`);
  const out = new Set<number>();
  for (const [at, i] of list.entries()) {
    if (!Number.isInteger(i) || i < 0 || i >= ds.points.length) {
      throw new AnalysisError(
        "invalid_input",
        `Dataset ${ds.id}: outliers[${at}] must be the zero-based index of one of its ${ds.points.length} points (got ${describe(i)}).`,
        { datasetId: ds.id },
      );
    }
    const T = ds.points[i].T;
    if ((window.Tmin === null || T >= window.Tmin) && (window.Tmax === null || T <= window.Tmax)) out.add(i);
  }
  return [...out].sort((a, b) => a - b);
}

/** " Point 5, an outlier of its own fit, is left out of its summary." */
function outlierWords(outliers: readonly number[], numbers: readonly number[] | undefined): string {
  if (outliers.length === 0) return "";
  const named = outliers.map((i) => String(numbers?.[i] ?? i + 1));
  const list = named.length === 1 ? named[0] : `${named.slice(0, -1).join(", ")} and ${named[named.length - 1]}`;
  return named.length === 1
    ? ` Point ${list}, an outlier of its own fit, is left out of its summary.`
    : ` Points ${list}, outliers of its own fit, are left out of its summary.`;
}

function checkWindow(w: ConsensusOptions["window"]): { Tmin: number | null; Tmax: number | null } {
  const Tmin = w?.Tmin ?? null;
  const Tmax = w?.Tmax ?? null;
  for (const [name, v] of [
    ["Tmin", Tmin],
    ["Tmax", Tmax],
  ] as const) {
    if (v !== null && (typeof v !== "number" || !Number.isFinite(v) || v <= 0)) {
      throw new AnalysisError("invalid_input", `The window's ${name} must be a positive temperature in kelvin (got ${describe(v)}).`);
    }
  }
  if (Tmin !== null && Tmax !== null && !(Tmin < Tmax)) {
    throw new AnalysisError("invalid_input", `The window's Tmin (${Tmin} K) must be below its Tmax (${Tmax} K).`);
  }
  return { Tmin, Tmax };
}

function windowWords(w: { Tmin: number | null; Tmax: number | null }): string {
  return `${w.Tmin ?? 0} and ${w.Tmax ?? "∞"} K`;
}

function range(n: number): number[] {
  return Array.from({ length: n }, (_, i) => i);
}

/** Support temperatures of the given datasets: distinct count and span, for the modified fit. */
function supportsModified(supports: readonly (DatasetSupport | null)[], blocks: readonly number[]): boolean {
  const temps = new Set<number>();
  let lo = Infinity;
  let hi = -Infinity;
  for (const j of blocks) {
    for (const T of supports[j]!.temps) {
      temps.add(T);
      lo = Math.min(lo, T);
      hi = Math.max(hi, T);
    }
  }
  return temps.size >= 3 && hi / lo >= MODIFIED_MIN_SPAN && blocks.some((j) => carriesCurvature(supports[j]));
}

/**
 * Whether a dataset's summary says anything about curvature: its own fit is the modified one. A
 * straight set's summary (rank 2) carries level and slope only, and two straight sets whose slopes
 * differ are a spread between datasets, not a curvature of the consensus.
 */
function carriesCurvature(s: DatasetSupport | null): boolean {
  return s?.fit.model === "modified_arrhenius";
}

function prefer(arr: ModelFit, mod: ModelFit | null): ModelFit {
  if (!mod) return arr;
  const se = Math.sqrt(mod.cov[2 * 3 + 2]);
  return se > 0 && Math.abs(mod.beta[2] / se) > Z95 ? mod : arr;
}

function fitAll(rows: Rows, supports: readonly (DatasetSupport | null)[], included: number[]): Fits {
  const arr = fitModel(rows, included, 2);
  if (!arr) {
    throw new AnalysisError(
      "too_few_temperatures",
      "The datasets in the consensus cover a single temperature; a consensus k(T) needs at least two different temperatures.",
    );
  }
  const mod = supportsModified(supports, included) ? fitModel(rows, included, 3) : null;
  return { arr, mod, preferred: prefer(arr, mod) };
}

/**
 * Up to this many included datasets the set-aside is one search over removal sets (setAsideChoice);
 * beyond, one dataset at a time (a search would cost too much, and among many a few stray sets hide
 * each other less).
 */
export const EXHAUSTIVE_SET_ASIDE_LIMIT = 20;
/** The removal sets tried are those among this many datasets furthest from the others' consensus. */
export const SET_ASIDE_CANDIDATES = 7;
/**
 * How far each dataset of two or more set aside together must be off the rest: its largest |z| beyond
 * this many times its Bonferroni bound, and by at least {@link MASKING_FACTOR} at some comparison
 * temperature. Setting several datasets aside at once is for a gross disagreement (as a unit,
 * calibration or model mistake gives), not for a spread of tens of per cent, which stays a spread.
 */
export const MASKING_FAR = 3;
/** The factor of a gross disagreement: 2, the width often quoted for a rate constant's uncertainty (common practice). */
export const MASKING_FACTOR = 2;

/**
 * The family-wise bound of the decision to set aside: z_{1−α/(2M)} over all M comparison
 * temperatures of all included datasets (Bonferroni over every comparison made), so that among
 * correct datasets any set-aside at all happens at most about α of the time. The words about one
 * dataset keep its own bound over its own comparison temperatures.
 */
function familyBound(included: readonly number[], readings: readonly (QuickReading | null)[]): number {
  let M = 0;
  for (const j of included) M += readings[j]?.m ?? 0;
  return bonferroniNormal(Math.max(1, M));
}

/** Off at the family-wise bound: some |z| over its comparison temperatures beyond it. */
function offFamily(r: QuickReading | null | undefined, bound: number): boolean {
  return !!r && r.m > 0 && !(r.top <= bound);
}

/** Off at the family-wise bound and grossly so: beyond {@link MASKING_FAR} times the bound and by a factor {@link MASKING_FACTOR}. */
function grosslyOff(r: QuickReading | null | undefined, bound: number): boolean {
  return offFamily(r, bound) && r!.far > MASKING_FAR && r!.widestLn >= Math.log(MASKING_FACTOR);
}

/** Excess Q − dof of a fit (Infinity without one). */
function excessOf(f: ModelFit | null): number {
  return f ? f.Q - f.df : Infinity;
}

/**
 * Largest consistent subset among up to {@link EXHAUSTIVE_SET_ASIDE_LIMIT} included datasets (Cox 2007,
 * Metrologia 44:187), one search instead of one dataset at a time. Looked for when some dataset is
 * off the consensus of the others at the family-wise bound, or the datasets disagree (Cochran's Q of
 * the consensus, p < {@link OFF_CONSENSUS_ALPHA}: two sets off in different ways can hide each other).
 * Removal sets of 1, 2, … {@link MAX_SET_ASIDE} datasets among the {@link SET_ASIDE_CANDIDATES}
 * furthest off are tried, smallest first; a set qualifies when
 * - none of the rest is off the consensus of the others of the rest (family-wise bound),
 * - each dataset removed is off the rest, judged as every dataset is: the consensus of the others
 *   with it in (leaveOneOut over the rest and it), so a curved set meets the others' curve as usual,
 * - when two or more are removed and none of the included datasets was off (the search came from
 *   their disagreement alone), each is grossly off the rest ({@link MASKING_FAR}, {@link MASKING_FACTOR}),
 * - the rest keeps more datasets than are removed, or as many when those removed disagree among
 *   themselves (one of them grossly off the consensus of the others removed): a majority is never
 *   set aside, and two halves that each agree within themselves stay in.
 * The smallest size with a qualifying set decides. When two qualifying sets leave disjoint rests the
 * data cannot tell which part is right and nothing is set aside; otherwise the set whose rest has the
 * smallest excess Q − dof (one model for every rest: modified Arrhenius on the judging fits' values
 * when the curvature is corroborated, {@link corroboratedExcess}, else Arrhenius), near-ties to the one
 * furthest off. Null when nothing qualifies.
 */
function setAsideChoice(
  rows: Rows,
  supports: readonly (DatasetSupport | null)[],
  included: readonly number[],
  fits: Fits,
  readings: readonly (QuickReading | null)[],
  bound: number,
  judgedRows: () => Rows,
  kept: KeptFits,
): number[] | null {
  const m = included.length;
  const agree = (f: ModelFit) => !(f.df > 0) || survivalChiSquare(f.Q, f.df) >= OFF_CONSENSUS_ALPHA;
  const anyOff = included.some((j) => offFamily(readings[j], bound));
  if (!anyOff && agree(fits.preferred)) return null;
  // Found only through the datasets' disagreement (nobody off), a removal of two or more must be gross.
  const gross = !anyOff;
  const fitsOf = (blocks: number[]): Fits | null => {
    try {
      return fitAll(rows, supports, blocks);
    } catch (err) {
      if (err instanceof AnalysisError) return null; // a single temperature left: no curve to judge against
      throw err;
    }
  };
  // The readings of every dataset of the included ones without `removed` against the others of that
  // subset, once per removed set (sorted indices).
  const memo = new Map<string, readonly (QuickReading | null)[] | null>();
  const without = (removed: readonly number[]): readonly (QuickReading | null)[] | null => {
    if (removed.length === 0) return readings;
    const key = removed.join(",");
    if (memo.has(key)) return memo.get(key)!;
    const rest = included.filter((k) => !removed.includes(k));
    const f = fitsOf(rest);
    let out: (QuickReading | null)[] | null = null;
    if (f) {
      const o = leaveOneOut(rows, supports, rest, f, judgedRows, { mod: null });
      out = supports.map((_, k) => (rest.includes(k) ? quickReading(rows, supports, o[k], k) : null));
    }
    memo.set(key, out);
    return out;
  };
  let curvedScore: boolean | null = null;
  const score = (rest: number[]) => {
    curvedScore ??=
      corroboratedExcess(judgedRows, supports, included, judgedRows() === rows && fits.mod ? { full: fits.mod, loo: kept.mod } : null) !==
      null;
    return curvedScore ? excessOf(fitModel(judgedRows(), rest, 3)) : excessOf(fitModel(rows, rest, 2));
  };
  const far = (j: number) => readings[j]?.far ?? 0;
  const candidates = [...included].sort((a, b) => far(b) - far(a)).slice(0, SET_ASIDE_CANDIDATES);
  for (let size = 1; size <= MAX_SET_ASIDE && m - size >= Math.max(size, MIN_CONSISTENT_SUBSET); size++) {
    const qualifying: { removed: number[]; rest: number[]; excess: number; far: number }[] = [];
    for (const chosen of combinations(candidates, size)) {
      const removed = [...chosen].sort((a, b) => a - b);
      const offRest = (j: number) => {
        const r = without(removed.filter((k) => k !== j))?.[j];
        return size === 1 || !gross ? offFamily(r, bound) : grosslyOff(r, bound);
      };
      if (!removed.every(offRest)) continue;
      const restReadings = without(removed);
      const rest = included.filter((k) => !removed.includes(k));
      if (!restReadings || rest.some((k) => offFamily(restReadings[k], bound))) continue;
      // As many kept as set aside only when those set aside do not agree among themselves: one of them
      // grossly off the consensus of the others set aside (a chance disagreement within one half of
      // two does not make that half the wrong one).
      if (rest.length === size) {
        const own = without(rest);
        if (!own || !removed.some((k) => grosslyOff(own[k], bound))) continue;
      }
      qualifying.push({ removed, rest, excess: score(rest), far: Math.max(...removed.map(far)) });
    }
    if (qualifying.length === 0) continue;
    for (let x = 0; x < qualifying.length; x++) {
      for (let y = x + 1; y < qualifying.length; y++) {
        if (!qualifying[x].rest.some((k) => qualifying[y].rest.includes(k))) return null;
      }
    }
    let best = qualifying[0];
    for (const q of qualifying.slice(1)) {
      const dq = q.excess - best.excess;
      if (dq < -SUBSET_Q_TIE || (Math.abs(dq) <= SUBSET_Q_TIE && q.far > best.far)) best = q;
    }
    return best.removed;
  }
  return null;
}

/** Every choice of `size` items of `items`, in order. */
function* combinations<T>(items: readonly T[], size: number, from = 0, prefix: T[] = []): Generator<T[]> {
  if (prefix.length === size) {
    yield prefix;
    return;
  }
  for (let i = from; i <= items.length - (size - prefix.length); i++) yield* combinations(items, size, i + 1, [...prefix, items[i]]);
}

/** Excess Q within which two removals count as equally good and the z rule decides. */
const SUBSET_Q_TIE = 1e-6;

/**
 * The dataset to set aside: the one whose removal leaves the smallest excess Q − dof of the
 * others' fixed-effect fit (Cox 2007 chooses by the consistency of what remains) — the modified fit on
 * the judging fits' values when curved (the excess by dataset from {@link corroboratedExcess}), else
 * the Arrhenius fit; among near-ties, the one furthest off by its largest |z| over its Bonferroni bound.
 */
function leastConsistent(
  included: readonly number[],
  others: readonly (Others | null)[],
  readings: readonly (QuickReading | null)[],
  curved: Map<number, number> | null,
): number {
  const excess = (j: number) => (curved ? (curved.get(j) ?? Infinity) : (others[j]?.restExcess ?? Infinity));
  const far = (j: number) => readings[j]?.far ?? 0;
  let best = -1;
  for (const j of included) {
    if (best < 0) {
      best = j;
      continue;
    }
    const dq = excess(j) - excess(best);
    if (dq < -SUBSET_Q_TIE || (Math.abs(dq) <= SUBSET_Q_TIE && far(j) > far(best))) best = j;
  }
  return best;
}

/** Whether a modified fit's temperature exponent differs from zero: |n| > z_{0.975}·se(n), as {@link prefer}. */
function curvedFit(fit: ModelFit | null): boolean {
  if (!fit) return false;
  const se = Math.sqrt(fit.cov[2 * 3 + 2]);
  return se > 0 && Math.abs(fit.beta[2] / se) > Z95;
}

/**
 * The set-aside score when the included datasets agree on a curvature that rests on none of them
 * alone: on the support values of the fits that judge them (the modified fit's values and
 * covariance whenever determined, so straight summaries still say what they know of the shape),
 * the modified consensus of all of them is curved (|n| > z_{0.975}·se(n)), and so is the modified
 * consensus without each one in turn, with the same sign. Then every removal is scored in that
 * one model: the excess Q₋ⱼ − dof₋ⱼ of the others' fixed-effect modified fit on those values (by
 * dataset index). Otherwise null, and removals are scored by the others' Arrhenius fit: a curvature
 * only one dataset shows is that dataset's claim, and the straight model is the one every subset
 * shares.
 */
function corroboratedExcess(
  judgedRows: () => Rows,
  supports: readonly (DatasetSupport | null)[],
  included: readonly number[],
  same: { full: ModelFit; loo: (ModelFit | null)[] | null } | null,
): Map<number, number> | null {
  if (included.length < 3 || !supportsJudgedModified(supports, included)) return null;
  const jr = judgedRows();
  // On the consensus' own rows these fits are the ones the leave-one-out step made already.
  const full = same ? same.full : fitModel(jr, included, 3);
  if (!curvedFit(full)) return null;
  const sign = Math.sign(full!.beta[2]);
  const loo = same?.loo ?? leaveOneOutFits(jr, included, 3, full, included.length <= EXACT_LEAVE_ONE_OUT_LIMIT);
  const out = new Map<number, number>();
  for (let i = 0; i < included.length; i++) {
    const f = loo[i];
    // Still curved the same way without it (one-sided: the others show it too, in that direction).
    if (!f || !(sign * f.beta[2] > Z95_ONE_SIDED * Math.sqrt(f.cov[2 * 3 + 2]))) return null;
    out.set(included[i], f.Q - f.df);
  }
  return out;
}

/** Support temperatures of the given datasets allow a modified fit, and each of them is judged by its modified fit. */
function supportsJudgedModified(supports: readonly (DatasetSupport | null)[], blocks: readonly number[]): boolean {
  let lo = Infinity;
  let hi = -Infinity;
  for (const j of blocks) {
    const s = supports[j]!;
    if (!s.judge.gModified) return false;
    lo = Math.min(lo, s.Tmin);
    hi = Math.max(hi, s.Tmax);
  }
  return hi / lo >= MODIFIED_MIN_SPAN;
}

/** A dataset's support values and covariance from the fit that judges it (the modified fit's when determined). */
function judgedSupport(s: DatasetSupport | null): DatasetSupport | null {
  if (!s || s.judge === s.fit) return s;
  const K = s.temps.length;
  const lnk = s.temps.map((T) => evaluateOwnFit(s.judge, T).lnk);
  const cov = new Array<number>(K * K);
  for (let a = 0; a < K; a++) {
    for (let b = a; b < K; b++) {
      const v = ownCovariance(s.judge, s.temps[a], s.temps[b]);
      cov[a * K + b] = v;
      cov[b * K + a] = v;
    }
  }
  return { ...s, lnk, cov };
}

/** Fits of the leave-one-out step kept for the set-aside score: the modified fit without each included dataset. */
interface KeptFits {
  mod: (ModelFit | null)[] | null;
}

/** The consensus of the others for every dataset (the full consensus for a dataset left out). */
function leaveOneOut(
  rows: Rows,
  supports: readonly (DatasetSupport | null)[],
  included: number[],
  fits: Fits,
  judgedRows: () => Rows,
  kept: KeptFits,
): (Others | null)[] {
  const J = supports.length;
  const out: (Others | null)[] = new Array(J).fill(null);
  const hull = (blocks: number[]) => ({
    Tmin: Math.min(...blocks.map((j) => supports[j]!.Tmin)),
    Tmax: Math.max(...blocks.map((j) => supports[j]!.Tmax)),
  });
  const all = hull(included);
  const inConsensus = new Set(included);
  for (let j = 0; j < J; j++) {
    if (supports[j] && !inConsensus.has(j))
      out[j] = { fit: fits.preferred, blocks: included, skip: -1, count: included.length, ...all, restExcess: null };
  }
  if (included.length < 2) return out;
  const exact = included.length <= EXACT_LEAVE_ONE_OUT_LIMIT;
  const arr = leaveOneOutFits(rows, included, 2, fits.arr, exact);
  const mod = fits.mod ? leaveOneOutFits(rows, included, 3, fits.mod, exact) : null;
  kept.mod = mod;
  // Others' hull from prefix and suffix minima and maxima.
  const m = included.length;
  const preMin = new Array<number>(m + 1).fill(Infinity);
  const preMax = new Array<number>(m + 1).fill(-Infinity);
  const sufMin = new Array<number>(m + 1).fill(Infinity);
  const sufMax = new Array<number>(m + 1).fill(-Infinity);
  for (let i = 0; i < m; i++) {
    preMin[i + 1] = Math.min(preMin[i], supports[included[i]]!.Tmin);
    preMax[i + 1] = Math.max(preMax[i], supports[included[i]]!.Tmax);
  }
  for (let i = m - 1; i >= 0; i--) {
    sufMin[i] = Math.min(sufMin[i + 1], supports[included[i]]!.Tmin);
    sufMax[i] = Math.max(sufMax[i + 1], supports[included[i]]!.Tmax);
  }
  // Modified fit of the others: the same rule on their support temperatures.
  const tempCount = new Map<number, number>();
  for (const j of included) {
    for (const T of supports[j]!.temps) tempCount.set(T, (tempCount.get(T) ?? 0) + 1);
  }
  // A typed array sorts numerically (temperatures are positive, never NaN).
  const sortedTemps = Float64Array.from(tempCount.keys()).sort();
  const curved = included.filter((j) => carriesCurvature(supports[j])).length;
  for (let i = 0; i < m; i++) {
    const j = included[i];
    const a = arr[i];
    if (!a) continue;
    const own = supports[j]!.temps;
    const onlyOwn = (T: number) => tempCount.get(T) === 1 && own.includes(T);
    const distinct = tempCount.size - own.filter((T) => tempCount.get(T) === 1).length;
    let lo = 0;
    while (lo < sortedTemps.length && onlyOwn(sortedTemps[lo])) lo++;
    let hi = sortedTemps.length - 1;
    while (hi >= lo && onlyOwn(sortedTemps[hi])) hi--;
    const span = hi > lo ? sortedTemps[hi] / sortedTemps[lo] : 1;
    const shaped = distinct >= 3 && span >= MODIFIED_MIN_SPAN;
    const othersCurved = curved - (carriesCurvature(supports[j]) ? 1 : 0) > 0;
    const modOk = mod && shaped && othersCurved;
    const fit = prefer(a, modOk ? mod[i] : null);
    const hull = { Tmin: Math.min(preMin[i], sufMin[i + 1]), Tmax: Math.max(preMax[i], sufMax[i + 1]) };
    const restExcess = a.Q - a.df;
    if (shaped && carriesCurvature(supports[j]) && (!othersCurved || fit.q === 2)) {
      // The dataset compared is curved and the others' consensus is straight. Their straight
      // summaries do not say their curve is straight, only that none of them alone could tell; their
      // modified consensus on the covariance of the fits that judge them (the modified fit's) says
      // what they know of its shape. It is used when the dataset is the only curved one, and when
      // others are curved too but their consensus prefers a line, only where that modified consensus
      // shows the curvature (|n| > z_{0.975}·se(n)): then the line is not what the others say.
      const jr = judgedRows();
      const curve = fitModel(
        jr,
        included.filter((k) => k !== j),
        3,
      );
      if (curve && (!othersCurved || curvedFit(curve))) {
        out[j] = { fit: curve, blocks: included, skip: j, count: m - 1, ...hull, restExcess, rows: jr };
        continue;
      }
    }
    out[j] = { fit, blocks: included, skip: j, count: m - 1, ...hull, restExcess };
  }
  return out;
}

const bonferroniBounds = new Map<number, number>();

/** z_{1−α/(2m)}: the two-sided Bonferroni bound for m comparisons at family level α. */
function bonferroniNormal(m: number): number {
  let b = bonferroniBounds.get(m);
  if (b === undefined) {
    b = quantileNormal(1 - OFF_CONSENSUS_ALPHA / (2 * m));
    bonferroniBounds.set(m, b);
  }
  return b;
}

/** Share vectors per τ² in the weights: one for every leave-one-out fit merged at the full τ². */
class ShareCache {
  private readonly byTau2 = new Map<number, { g: Float64Array; maxNorm: number }>();
  constructor(private readonly rows: Rows) {}

  /** The share vectors and the largest of their norms (a bound on any share by Cauchy–Schwarz). */
  get(blocks: readonly number[], tau2: number): { g: Float64Array; maxNorm: number } {
    let entry = this.byTau2.get(tau2);
    if (!entry) {
      // Rows of the dataset left out contribute to its own share only, which is never read.
      const g = shareVectors(this.rows, blocks, tau2);
      let max = 0;
      for (const k of blocks) max = Math.max(max, g[3 * k] ** 2 + g[3 * k + 1] ** 2 + g[3 * k + 2] ** 2);
      entry = { g, maxNorm: Math.sqrt(max) };
      this.byTau2.set(tau2, entry);
    }
    return entry;
  }
}

/** Comparison temperatures over [a, b]: both ends and the middle in 1/T, quartiles too beyond a factor 2. */
function comparisonTemperatures(a: number, b: number): number[] {
  if (!(b > a)) return [a];
  const steps = b / a > 2 ? 4 : 2;
  const out = new Array<number>(steps + 1);
  out[0] = a;
  for (let i = 1; i < steps; i++) out[i] = 1 / (1 / a + ((1 / b - 1 / a) * i) / steps);
  out[steps] = b;
  return out;
}

/** How the other side of a comparison is read: the others' consensus curve, or the one other dataset's own fit. */
interface OtherSide {
  /** ln k and the variance of that estimate at T. */
  at(T: number): { lnk: number; variance: number };
  covariance(T1: number, T2: number): number;
  differenceVariance(T1: number, T2: number): number;
  tau2: number;
  model: "arrhenius" | "modified_arrhenius";
}

function otherSide(rows: Rows, supports: readonly (DatasetSupport | null)[], o: Others): OtherSide {
  // One other dataset: its own fit, read exactly as the dataset compared is read, so that the
  // verdict of A against B is the mirror of B against A (z and slope z change sign, nothing else).
  const single = o.count === 1 ? o.blocks.find((k) => k !== o.skip) : undefined;
  const s = single !== undefined ? supports[single] : null;
  if (s && s.fit.model !== "single_temperature") {
    const fit = s.judge;
    return {
      at: (T) => evaluateOwnFit(fit, T),
      covariance: (T1, T2) => ownCovariance(fit, T1, T2),
      differenceVariance: (T1, T2) => ownDifferenceVariance(fit, T1, T2),
      tau2: 0,
      // The fit that judges it: its modified fit whenever that is determined, whatever it prefers.
      model: fit.gModified ? "modified_arrhenius" : "arrhenius",
    };
  }
  const { fit } = o;
  return {
    at: (T) => predict(rows, fit, T),
    covariance: (T1, T2) => predictCovariance(rows, fit, T1, T2),
    differenceVariance: (T1, T2) => predictDifferenceVariance(rows, fit, T1, T2),
    tau2: fit.tau2,
    model: fit.q === 3 ? "modified_arrhenius" : "arrhenius",
  };
}

/**
 * Whether the log ratio changes along the comparison temperatures: the Wald statistic of its
 * contrasts d_i − d_m with their covariance (own fit + the other side + τ²·I), pseudo-inverse
 * over the directions with eigenvalue above 1e-10 of the largest; χ² on that many dof.
 */
export function factorChangeTest(d: readonly number[], cov: readonly number[]): { chi2: number; dof: number; p: number } | null {
  const m = d.length;
  if (m < 2) return null;
  const k = m - 1;
  const c = d.slice(0, k).map((x) => x - d[k]);
  const S = new Array<number>(k * k);
  for (let a = 0; a < k; a++) {
    for (let b = 0; b < k; b++) S[a * k + b] = cov[a * m + b] - cov[a * m + k] - cov[k * m + b] + cov[k * m + k];
  }
  const { values, vectors } = symmetricEigen(S, k);
  const top = Math.max(...values);
  if (!(top > 0)) return null;
  let chi2 = 0;
  let dof = 0;
  for (let i = 0; i < k; i++) {
    if (!(values[i] > 1e-10 * top)) continue;
    let proj = 0;
    for (let a = 0; a < k; a++) proj += vectors[a * k + i] * c[a];
    chi2 += (proj * proj) / values[i];
    dof++;
  }
  return { chi2, dof, p: survivalChiSquare(chi2, dof) };
}

/** What the subset loop reads of a comparison: whether the dataset is off, by how far, and its mean offset. */
interface QuickReading {
  off: boolean;
  /** Largest |z| over the Bonferroni bound (0 when the others cover none of its range). */
  far: number;
  /** As {@link Disagreement.meanOffsetLog10}. */
  meanOffsetLog10: number;
  /** Largest |ln(k_own / k_others)| over the comparison temperatures. */
  widestLn: number;
  /** Largest |z| over the comparison temperatures (0 when the others cover none of its range). */
  top: number;
  /** Comparison temperatures (0 when the others cover none of its range). */
  m: number;
}

/**
 * The reading of {@link compare} the subset loop needs, with the same numbers (z per comparison
 * temperature, the bound, the mean log ratio) and nothing else: no objects per temperature.
 */
function quickReading(rows: Rows, supports: readonly (DatasetSupport | null)[], o: Others | null, j: number): QuickReading | null {
  const s = supports[j];
  if (!s || !o) return null;
  const other = otherSide(o.rows ?? rows, supports, o);
  const a = Math.max(s.Tmin, o.Tmin);
  const b = Math.min(s.Tmax, o.Tmax);
  const overlap = a <= b;
  const temps = overlap ? (s.fit.model === "single_temperature" ? [s.temps[0]] : comparisonTemperatures(a, b)) : s.temps;
  const bound = bonferroniNormal(Math.max(1, overlap ? temps.length : 0));
  let sum = 0;
  let off = false;
  let top = -Infinity;
  let widest = 0;
  for (const T of temps) {
    const own = evaluateOwnFit(s.judge, T);
    const there = other.at(T);
    const othersSe = Math.sqrt(there.variance);
    const d = own.lnk - there.lnk;
    const z = Math.abs(d / Math.sqrt(own.variance + other.tau2 + othersSe * othersSe));
    sum += d;
    if (!(z <= bound)) off = true;
    top = Math.max(top, z);
    widest = Math.max(widest, Math.abs(d));
  }
  return {
    off: overlap && off,
    far: overlap ? top / bound : 0,
    meanOffsetLog10: sum / temps.length / Math.LN10,
    widestLn: widest,
    top: overlap ? top : 0,
    m: overlap ? temps.length : 0,
  };
}

function compare(
  rows: Rows,
  supports: readonly (DatasetSupport | null)[],
  o: Others | null,
  j: number,
  datasets: readonly ConsensusDataset[],
  shareCache: ShareCache,
): Disagreement | null {
  const s = supports[j];
  if (!s || !o) return null;
  const { fit } = o;
  const own = o.rows ?? rows;
  const other = otherSide(own, supports, o);
  const a = Math.max(s.Tmin, o.Tmin);
  const b = Math.min(s.Tmax, o.Tmax);
  const overlap = a <= b;
  const temps = overlap ? (s.fit.model === "single_temperature" ? [s.temps[0]] : comparisonTemperatures(a, b)) : s.temps;
  const diffs = temps.map((T) => {
    const own = evaluateOwnFit(s.judge, T);
    const there = other.at(T);
    const ownSe = Math.sqrt(own.variance);
    const othersSe = Math.sqrt(there.variance);
    const d = own.lnk - there.lnk;
    return { T, d, z: d / Math.sqrt(own.variance + other.tau2 + othersSe * othersSe), ownSe, othersSe };
  });
  const meanOffsetLog10 = diffs.reduce((acc, x) => acc + x.d, 0) / diffs.length / Math.LN10;
  const m = overlap ? temps.length : 0;
  const bound = bonferroniNormal(Math.max(1, m));
  const points: ComparisonPoint[] = overlap
    ? diffs.map(({ T, d, z, ownSe, othersSe }) => {
        const ratio = Math.exp(d);
        return {
          T,
          ratio: Number.isFinite(ratio) ? ratio : null,
          log10Ratio: d / Math.LN10,
          z,
          agrees: Math.abs(z) <= bound,
          seOwn: ownSe,
          seOthers: othersSe,
        };
      })
    : [];
  const off = points.some((p) => !p.agrees);
  const result = (rest: Partial<Disagreement>): Disagreement => ({
    comparedWith: o.count,
    model: other.model,
    tau2: other.tau2,
    range: overlap ? { Tmin: a, Tmax: b } : null,
    points,
    bound,
    off,
    activationEnergy: null,
    slopeZ: null,
    factorChanges: null,
    factorChangeP: null,
    meanOffsetLog10,
    restsOn: null,
    agreesOnlyWithinSpread: false,
    ...rest,
  });
  let activationEnergy: Disagreement["activationEnergy"] = null;
  let slopeZ: number | null = null;
  let factorChanges: boolean | null = null;
  let factorChangeP: number | null = null;
  if (points.length >= 2 && s.fit.model !== "single_temperature") {
    const lo = diffs[0];
    const hi = diffs[diffs.length - 1];
    // The same variance model as the z of each temperature: own fit, the other side and τ² per temperature.
    const v = ownDifferenceVariance(s.judge, lo.T, hi.T) + other.differenceVariance(lo.T, hi.T) + 2 * other.tau2;
    slopeZ = (lo.d - hi.d) / Math.sqrt(v);
    // Relatively higher at the cold end: k rises less steeply with T, so a lower activation energy.
    activationEnergy = Math.abs(slopeZ) > Z95 ? (slopeZ > 0 ? "lower" : "higher") : "same";
    const cov = new Array<number>(m * m);
    for (let p = 0; p < m; p++) {
      for (let q = p; q < m; q++) {
        const v = ownCovariance(s.judge, temps[p], temps[q]) + other.covariance(temps[p], temps[q]) + (p === q ? other.tau2 : 0);
        cov[p * m + q] = v;
        cov[q * m + p] = v;
      }
    }
    const test = factorChangeTest(
      diffs.map((x) => x.d),
      cov,
    );
    if (test) {
      factorChangeP = test.p;
      factorChanges = test.p < OFF_CONSENSUS_ALPHA;
    }
  }
  let restsOn: Disagreement["restsOn"] = null;
  if (overlap && o.count >= 2) {
    // Where the dataset is judged hardest: the comparison temperature with the largest |z|.
    const worst = diffs.reduce((a, b) => (Math.abs(b.z) > Math.abs(a.z) ? b : a));
    const { g, maxNorm } = (o.rows ? new ShareCache(o.rows) : shareCache).get(o.blocks, fit.weightTau2);
    const a = shareDirection(own, fit, worst.T);
    let best = -1;
    let bestShare = -Infinity;
    // No share can exceed ‖a‖·max‖g_k‖: with many datasets that settles it without the loop.
    const reachable = Math.hypot(a[0], a[1], a[2]) * maxNorm > DOMINANT_SHARE;
    for (const k of reachable ? o.blocks : []) {
      if (k === o.skip) continue;
      const share = a[0] * g[3 * k] + a[1] * g[3 * k + 1] + a[2] * g[3 * k + 2];
      if (share > bestShare) {
        bestShare = share;
        best = k;
      }
    }
    if (best >= 0 && bestShare > DOMINANT_SHARE) {
      const { Tmin, Tmax } = supports[best]!;
      const inRange = Tmin <= worst.T * (1 + 1e-12) && worst.T <= Tmax * (1 + 1e-12);
      restsOn = { id: datasets[best].id, share: Math.min(1, bestShare), T: worst.T, Tmin, Tmax, inRange };
    }
  }
  // Beyond its own uncertainty there, and τ²₋ⱼ (which also widens the other side) outweighs both variances.
  const agreesOnlyWithinSpread =
    overlap &&
    !off &&
    o.count >= 2 &&
    diffs.some((x) => other.tau2 > x.ownSe * x.ownSe + x.othersSe * x.othersSe && Math.abs(x.d) > bound * x.ownSe);
  return result({ activationEnergy, slopeZ, factorChanges, factorChangeP, restsOn, agreesOnlyWithinSpread });
}

function verdictOf(
  label: (j: number) => string,
  j: number,
  s: DatasetSupport | null,
  d: Disagreement | null,
  o: Others | null,
  leftOut: string | null,
  unitSuspect: string | null,
  otherCount: number,
  datasets: readonly ConsensusDataset[],
  offOthers: string[],
): string {
  return describeVerdict({
    name: label(j),
    own: s ? { Tmin: s.Tmin, Tmax: s.Tmax } : null,
    leftOut,
    setAside: leftOut === SET_ASIDE_REASON,
    otherCount,
    unitSuspect,
    comparison:
      d && o
        ? {
            count: o.count,
            othersRange: { Tmin: o.Tmin, Tmax: o.Tmax },
            restsOn: d.restsOn ? { ...d.restsOn, name: label(datasets.findIndex((ds) => ds.id === d.restsOn!.id)) } : null,
            range: d.range,
            points: d.points,
            off: d.off,
            activationEnergy: d.activationEnergy,
            factorChanges: d.factorChanges,
            meanOffsetLog10: d.meanOffsetLog10,
            spread: d.agreesOnlyWithinSpread ? { tau2: d.tau2, offOthers } : null,
          }
        : null,
  });
}

function collectFlags(members: ConsensusMember[], nIncluded: number): ConsensusFlag[] {
  const flags: ConsensusFlag[] = [];
  if (nIncluded < 3) {
    flags.push({
      code: "few_datasets",
      severity: "info",
      message: `Only ${nIncluded} dataset${nIncluded === 1 ? "" : "s"} in the consensus: the between-dataset variance and the comparison of each dataset with the others need at least 3 to mean much.`,
    });
  }
  for (const m of members) {
    const d = m.disagreement;
    if (m.unitSuspect) {
      flags.push({ code: "unit_suspect", severity: "warn", message: m.verdict, datasetIds: [m.id] });
    } else if (d && !d.range) {
      flags.push({ code: "not_compared", severity: "info", message: m.verdict, datasetIds: [m.id] });
    } else if (d?.off || m.setAside) {
      // Two datasets that disagree: neither can be called the odd one out.
      const pair = m.included && d?.comparedWith === 1;
      flags.push({ code: pair ? "datasets_disagree" : "off_consensus", severity: "warn", message: m.verdict, datasetIds: [m.id] });
    }
  }
  return flags;
}

function expOrNull(x: number): number | null {
  const v = Math.exp(x);
  return Number.isFinite(v) ? v : null;
}

function gridT(Tmin: number, Tmax: number, n: number): number[] {
  if (!(Tmax > Tmin)) return [Tmin];
  return Array.from({ length: n }, (_, i) =>
    i === 0 ? Tmin : i === n - 1 ? Tmax : 1 / (1 / Tmin + ((1 / Tmax - 1 / Tmin) * i) / (n - 1)),
  );
}

function commonParts(
  rows: Rows,
  fit: ModelFit,
  covered: { Tmin: number; Tmax: number },
  coverage: (T: number) => number,
): Omit<ConsensusFitCommon, "covariance"> {
  const T = gridT(covered.Tmin, covered.Tmax, BAND_POINTS);
  const lnk: number[] = [];
  const lower: number[] = [];
  const upper: number[] = [];
  for (const t of T) {
    const p = predict(rows, fit, t);
    const half = Z95 * Math.sqrt(p.variance + fit.tau2);
    lnk.push(p.lnk);
    lower.push(p.lnk - half);
    upper.push(p.lnk + half);
  }
  const factorT = gridT(covered.Tmin, covered.Tmax, FACTOR_POINTS);
  if (REFERENCE_TEMPERATURE > covered.Tmin && REFERENCE_TEMPERATURE < covered.Tmax) {
    factorT.push(REFERENCE_TEMPERATURE);
    factorT.sort((a, b) => a - b);
  }
  const uncertaintyFactor = factorT.map((t) => ({
    T: t,
    f: expOrNull(Z95 * Math.sqrt(predict(rows, fit, t).variance + fit.tau2)),
    datasets: coverage(t),
  }));
  return { tau2: fit.tau2, q: fit.Q, dof: fit.df, i2: fit.i2, supportValues: fit.rows, band: { T, lnk, lower, upper }, uncertaintyFactor };
}

function buildArrhenius(
  rows: Rows,
  fit: ModelFit,
  covered: { Tmin: number; Tmax: number },
  coverage: (T: number) => number,
): ConsensusArrhenius {
  const { values, cov } = toPublished(rows, fit);
  return {
    params: { lnA: values[0], A: expOrNull(values[0]), Ea: values[1] },
    se: { lnA: Math.sqrt(cov[0][0]), Ea: Math.sqrt(cov[1][1]) },
    covariance: cov,
    ...commonParts(rows, fit, covered, coverage),
  };
}

function buildModified(
  rows: Rows,
  fit: ModelFit,
  covered: { Tmin: number; Tmax: number },
  coverage: (T: number) => number,
  T0: number,
): ConsensusModifiedArrhenius {
  const { values, cov } = toPublished(rows, fit);
  return {
    params: { lnA: values[0], A: expOrNull(values[0]), n: values[1], Ea: values[2], T0 },
    se: { lnA: Math.sqrt(cov[0][0]), n: Math.sqrt(cov[1][1]), Ea: Math.sqrt(cov[2][2]) },
    covariance: cov,
    ...commonParts(rows, fit, covered, coverage),
  };
}
