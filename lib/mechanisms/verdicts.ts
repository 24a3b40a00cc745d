/**
 * A mechanism's k(T) against the consensus of a reaction (lib/kinetics consensus, over the reaction
 * page's choice of datasets; with one dataset, the same engine's summary of that dataset): over the
 * overlap of the person's use window and the measured range, the ratio k_mechanism / k_consensus at
 * both ends and at the worst point, each inside or outside the consensus uncertainty factor f(T)
 * (its 95 % band, between-dataset variance included); the parts of the window outside every
 * measured range are named as extrapolation.
 */
import { GAS_CONSTANT } from "@/lib/kinetics/constants";
import type { ConsensusResult } from "@/lib/kinetics/consensus";
import type { MechanismRate } from "./types";

export type MechanismVerdict = "agrees" | "disagrees" | "extrapolated" | "no_data" | "not_checked";

export const VERDICT_WORDS: Record<MechanismVerdict, string> = {
  agrees: "agrees",
  disagrees: "disagrees",
  extrapolated: "extrapolated",
  no_data: "no data",
  not_checked: "not checked yet",
};

/** The default use window, K. */
export const DEFAULT_USE_WINDOW = { Tmin: 300, Tmax: 2500 } as const;

/** Temperatures compared across the overlap, evenly spaced in 1/T. */
export const COMPARISON_TEMPERATURES = 21;

export interface RatioAt {
  /** K */
  T: number;
  /** k_mechanism / k_consensus */
  ratio: number;
  /** Consensus uncertainty factor at T (95 %). */
  f: number;
  inside: boolean;
}

export interface Comparison {
  basis: "consensus" | "single_dataset";
  /** Datasets the consensus rests on. */
  datasets: number;
  /** Overlap of the use window and the measured range, K. */
  overlap: { Tmin: number; Tmax: number };
  low: RatioAt;
  high: RatioAt;
  worst: RatioAt;
}

export interface ReactionVerdict {
  verdict: MechanismVerdict;
  /** Parts of the use window outside every measured range, K. */
  extrapolated: { Tmin: number; Tmax: number }[];
  comparison: Comparison | null;
  /** One sentence. */
  note: string;
}

type Band = { T: number[]; lnk: number[]; upper: number[] };

/**
 * What a verdict reads of a consensus (a ConsensusResult is one): the preferred fit's parameters and
 * its 95 % band, the temperatures covered and how many datasets entered.
 */
export interface ComparableConsensus {
  preferred: ConsensusResult["preferred"];
  arrhenius: { params: { lnA: number; Ea: number }; band: Band };
  modifiedArrhenius: { params: { lnA: number; n: number; T0: number; Ea: number }; band: Band } | null;
  range: { Tmin: number; Tmax: number };
  included: number;
}

/** Only what a verdict reads (kept per reaction): the model not preferred keeps its parameters but no band. */
export function comparableConsensus(result: ConsensusResult): ComparableConsensus {
  const band = (b: Band, used: boolean): Band => (used ? { T: b.T, lnk: b.lnk, upper: b.upper } : { T: [], lnk: [], upper: [] });
  const modified = result.preferred === "modified_arrhenius" && result.modifiedArrhenius !== null;
  const a = result.arrhenius;
  const m = result.modifiedArrhenius;
  return {
    preferred: result.preferred,
    arrhenius: { params: { lnA: a.params.lnA, Ea: a.params.Ea }, band: band(a.band, !modified) },
    modifiedArrhenius: m
      ? { params: { lnA: m.params.lnA, n: m.params.n, T0: m.params.T0, Ea: m.params.Ea }, band: band(m.band, modified) }
      : null,
    range: { Tmin: result.range.Tmin, Tmax: result.range.Tmax },
    included: result.included,
  };
}

/** ln k of the consensus's preferred fit at T (canonical units). */
export function consensusLnK(result: ComparableConsensus, T: number): number {
  if (result.preferred === "modified_arrhenius" && result.modifiedArrhenius) {
    const p = result.modifiedArrhenius.params;
    return p.lnA + p.n * Math.log(T / p.T0) - p.Ea / (GAS_CONSTANT * T);
  }
  const p = result.arrhenius.params;
  return p.lnA - p.Ea / (GAS_CONSTANT * T);
}

/** f(T) = exp(upper − ln k̂) of the preferred fit's 95 % band, linear in 1/T between its temperatures, held at its ends. */
export function consensusFactor(result: ComparableConsensus, T: number): number {
  const band = (result.preferred === "modified_arrhenius" && result.modifiedArrhenius ? result.modifiedArrhenius : result.arrhenius).band;
  const n = band.T.length;
  const half = (i: number) => band.upper[i] - band.lnk[i];
  if (n === 0) return Infinity;
  const x = 1 / T;
  // Band temperatures run either way in 1/T; find the bracketing pair.
  let best = 0;
  for (let i = 0; i < n; i++) if (Math.abs(1 / band.T[i] - x) < Math.abs(1 / band.T[best] - x)) best = i;
  const other =
    best + 1 < n && (1 / band.T[best] - x) * (1 / band.T[best + 1] - x) <= 0
      ? best + 1
      : best - 1 >= 0 && (1 / band.T[best] - x) * (1 / band.T[best - 1] - x) <= 0
        ? best - 1
        : best;
  if (other === best) return Math.exp(half(best));
  const x0 = 1 / band.T[best];
  const x1 = 1 / band.T[other];
  const w = x1 === x0 ? 0 : (x - x0) / (x1 - x0);
  return Math.exp(half(best) * (1 - w) + half(other) * w);
}

/** Parts of [Tmin, Tmax] that no range covers. */
export function uncovered(window: { Tmin: number; Tmax: number }, ranges: readonly { Tmin: number; Tmax: number }[]) {
  const sorted = [...ranges].filter((r) => r.Tmax >= r.Tmin).sort((a, b) => a.Tmin - b.Tmin);
  const gaps: { Tmin: number; Tmax: number }[] = [];
  let from = window.Tmin;
  for (const r of sorted) {
    if (r.Tmin > from) gaps.push({ Tmin: from, Tmax: Math.min(r.Tmin, window.Tmax) });
    from = Math.max(from, r.Tmax);
    if (from >= window.Tmax) break;
  }
  if (from < window.Tmax) gaps.push({ Tmin: from, Tmax: window.Tmax });
  return gaps.filter((g) => g.Tmax > g.Tmin);
}

const round = (T: number) => Math.round(T);
const describeRanges = (ranges: readonly { Tmin: number; Tmax: number }[]) =>
  ranges.map((r) => `${round(r.Tmin)}–${round(r.Tmax)} K`).join(", ");
const factorWords = (ratio: number) => (ratio >= 1 ? `${formatFactor(ratio)} × above` : `${formatFactor(1 / ratio)} × below`);
function formatFactor(x: number): string {
  // Three digits: with two, a ratio just outside f (1.14 against 1.10) printed as the same number.
  return x >= 100 ? x.toExponential(2) : x.toPrecision(3);
}

/**
 * The verdict of one mechanism rate against one reaction's consensus.
 *
 * @param ranges the measured ranges (K) of the datasets that entered the comparison: the use window outside them is reported as used without measurements
 */
export function judgeMechanismRate({
  rate,
  alsoRates = [],
  window,
  result,
  basis,
  ranges,
}: {
  rate: MechanismRate;
  /** The rates of its DUPLICATE entries: the mechanism's k is the sum of all of them (common practice of mechanism formats). */
  alsoRates?: readonly MechanismRate[];
  window: { Tmin: number; Tmax: number };
  result: ComparableConsensus | null;
  basis: "consensus" | "single_dataset";
  ranges: readonly { Tmin: number; Tmax: number }[];
}): ReactionVerdict {
  const extrapolated = uncovered(window, ranges);
  if (!result) {
    return { verdict: "no_data", extrapolated: [], comparison: null, note: "No published data can be compared for this reaction." };
  }
  const Tmin = Math.max(window.Tmin, result.range.Tmin);
  const Tmax = Math.min(window.Tmax, result.range.Tmax);
  if (!(Tmax >= Tmin)) {
    return {
      verdict: "extrapolated",
      extrapolated,
      comparison: null,
      note: `The data cover ${round(result.range.Tmin)}–${round(result.range.Tmax)} K, outside the use window ${round(window.Tmin)}–${round(window.Tmax)} K: the mechanism is used at ${describeRanges(extrapolated)} without measurements.`,
    };
  }
  const terms = [rate, ...alsoRates];
  const at = (T: number): RatioAt => {
    // One term in logarithms (no overflow for any A); a duplicate sum term by term.
    const lnMech =
      terms.length === 1
        ? Math.log(rate.A) + rate.b * Math.log(T) - rate.Ea / (GAS_CONSTANT * T)
        : Math.log(terms.reduce((sum, t) => sum + t.A * T ** t.b * Math.exp(-t.Ea / (GAS_CONSTANT * T)), 0));
    const ratio = Math.exp(lnMech - consensusLnK(result, T));
    const f = consensusFactor(result, T);
    return { T, ratio, f, inside: Math.abs(Math.log(ratio)) <= Math.log(f) };
  };
  const count = Tmax > Tmin ? COMPARISON_TEMPERATURES : 1;
  const points: RatioAt[] = [];
  for (let i = 0; i < count; i++) {
    const x = 1 / Tmax + ((1 / Tmin - 1 / Tmax) * i) / Math.max(1, count - 1);
    points.push(at(i === 0 ? Tmax : i === count - 1 ? Tmin : 1 / x));
  }
  // Worst: the most uncertainty factors away (|ln ratio| / ln f).
  const score = (p: RatioAt) => Math.abs(Math.log(p.ratio)) / Math.max(Math.log(p.f), 1e-12);
  const worst = points.reduce((a, b) => (score(b) > score(a) ? b : a));
  const comparison: Comparison = {
    basis,
    datasets: result.included,
    overlap: { Tmin, Tmax },
    low: points[points.length - 1],
    high: points[0],
    worst,
  };
  // A sum of duplicate terms that is not a positive rate somewhere is no rate there at all.
  const notRate = points.find((p) => !(p.ratio > 0) || !Number.isFinite(p.ratio));
  if (notRate) {
    return {
      verdict: "disagrees",
      extrapolated,
      comparison: null,
      note: `The mechanism's rate (with its duplicate entries) is not a positive number at ${round(notRate.T)} K, so it cannot be compared.`,
    };
  }
  const disagrees = points.some((p) => !p.inside);
  const over = round(Tmin) === round(Tmax) ? `at ${round(Tmin)} K` : `over ${round(Tmin)}–${round(Tmax)} K`;
  const against = basis === "consensus" ? `the consensus of ${result.included} datasets` : "the one dataset";
  let note = disagrees
    ? `Outside the uncertainty factor of ${against} ${over}: ${factorWords(worst.ratio)} at ${round(worst.T)} K (f = ${worst.f.toPrecision(3)}).`
    : `Inside the uncertainty factor of ${against} ${over} (at most ${factorWords(worst.ratio)}, at ${round(worst.T)} K).`;
  if (extrapolated.length) note += ` Used without measurements at ${describeRanges(extrapolated)}.`;
  return { verdict: disagrees ? "disagrees" : "agrees", extrapolated, comparison, note };
}
