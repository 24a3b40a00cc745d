/**
 * The consensus' findings in words: factors, places and directions a reader can check on the plot.
 */
import { formatNumber, formatSignificant, formatTenTo } from "../format";
import { AVOGADRO } from "./constants";
import type { ReactionOrder } from "./types";

/** Window (log10 units) around a unit-mistake factor. */
export const UNIT_SUSPECT_WINDOW = 0.15;

/** The unit mistake whose factor (log10) lies within the window of |offset|, if any. */
export function matchUnitMistake(offsetLog10: number, order: ReactionOrder): string | null {
  const m = order - 1;
  if (m === 0) return null;
  const candidates = unitMistakes(m);
  const a = Math.abs(offsetLog10);
  for (const [c, label] of candidates) if (Math.abs(a - c) <= UNIT_SUSPECT_WINDOW) return label;
  return null;
}

const unitMistakeCache = new Map<number, [number, string][]>();

/** The unit-mistake factors (log10) and their words for order − 1 = m, made once per m. */
function unitMistakes(m: number): [number, string][] {
  let candidates = unitMistakeCache.get(m);
  if (!candidates) {
    const lgNA = Math.log10(AVOGADRO);
    candidates = [
      [m * lgNA, `a factor of N_A${m > 1 ? "²" : ""} (molecule ↔ mol)`],
      [3 * m, `a factor of 10${superscript(3 * m)} (L ↔ cm³)`],
      [6 * m, `a factor of 10${superscript(6 * m)} (m³ ↔ cm³)`],
      [m * (lgNA - 3), `a factor of (N_A/1000)${m > 1 ? "²" : ""} (L mol⁻¹ ↔ cm³ molecule⁻¹)`],
      [m * (lgNA - 6), `a factor of (N_A/10⁶)${m > 1 ? "²" : ""} (m³ mol⁻¹ ↔ cm³ molecule⁻¹)`],
    ];
    unitMistakeCache.set(m, candidates);
  }
  return candidates;
}

const SUPERSCRIPT = "⁰¹²³⁴⁵⁶⁷⁸⁹";

/** 12 → "¹²": the exponent of an exact power of ten in a unit's name. */
function superscript(n: number): string {
  return String(n).replace(/\d/g, (d) => SUPERSCRIPT[Number(d)]);
}

/**
 * The size of a factor from |log10|, through the site's one formatter (lib/format.ts): three
 * significant digits below 1000 ("1.04", "2.00", "4.80", "12.3"), so factors side by side read
 * alike; above, the exponent form of every page ("6.02e23"), also where 10^|log10| overflows.
 */
export function factorSize(log10: number): string {
  const a = Math.abs(log10);
  return a < 3 ? formatSignificant(10 ** a, 3) : formatTenTo(a, 3);
}

/** Whether a factor is written "1.00": it then reads as agreement, never as "a factor 1.00 below". */
export function factorRoundsToOne(log10: number): boolean {
  return factorSize(log10) === "1.00";
}

/**
 * "a factor 4.80 above" / "a factor 6.02e23 below" from a log10 ratio; a factor that rounds to
 * 1.00 is "the same to three digits" (no direction can be read from it).
 */
export function describeFactor(log10: number): string {
  if (factorRoundsToOne(log10)) return "the same to three digits";
  return `a factor ${factorSize(log10)} ${log10 >= 0 ? "above" : "below"}`;
}

/**
 * A factor at a temperature where the dataset is off: as describeFactor, but a difference too
 * small to show in three digits (a very precise pair) is given in percent with its direction.
 */
export function describeOffFactor(log10: number): string {
  if (!factorRoundsToOne(log10)) return describeFactor(log10);
  return `${formatNumber(Math.abs(Math.expm1(log10 * Math.LN10)) * 100, 2)} % ${log10 >= 0 ? "above" : "below"}`;
}

/** A temperature for prose: whole kelvin above 100 K, three significant digits below. */
export function describeT(T: number): string {
  return T >= 100 ? `${Math.round(T)} K` : `${formatNumber(T, 3)} K`;
}

/** "220 K", "220 and 300 K", "220, 300 and 420 K". */
export function listTemperatures(Ts: number[]): string {
  const parts = Ts.map((T) => describeT(T).replace(/ K$/, ""));
  if (parts.length === 1) return `${parts[0]} K`;
  return `${parts.slice(0, -1).join(", ")} and ${parts[parts.length - 1]} K`;
}

/** One comparison temperature, as the words need it. */
export interface ComparedPoint {
  T: number;
  log10Ratio: number;
  agrees: boolean;
}

/**
 * "a factor 4.8 above at 220 K, a factor 1.9 above at 300 K; agrees at 420 K" — every
 * temperature, off ones with their factor, agreeing ones together.
 */
export function describeComparison(points: ComparedPoint[]): string {
  const off = points.filter((p) => !p.agrees).map((p) => `${describeOffFactor(p.log10Ratio)} at ${describeT(p.T)}`);
  const agreeing = points.filter((p) => p.agrees).map((p) => p.T);
  const parts: string[] = [];
  if (off.length) parts.push(off.join(", "));
  if (agreeing.length) parts.push(`agrees at ${listTemperatures(agreeing)}`);
  return parts.join("; ");
}

/** Whose activation energy a dataset is compared with: one other dataset's, or several others'. */
export function othersPossessive(otherCount: number): string {
  return otherCount === 1 ? "the other dataset's" : "the others'";
}

/**
 * Where the log ratio bends away from the straight line (in 1/T) between its ends by more than the
 * ends differ: "higher"/"lower" in the middle, or null. With fewer than 3 temperatures, null.
 */
export function middleBend(points: readonly ComparedPoint[]): "higher" | "lower" | null {
  if (points.length < 3) return null;
  const lo = points[0];
  const hi = points[points.length - 1];
  const ends = Math.abs(hi.log10Ratio - lo.log10Ratio);
  let worst = 0;
  for (const p of points.slice(1, -1)) {
    const chord = lo.log10Ratio + ((hi.log10Ratio - lo.log10Ratio) * (1 / p.T - 1 / lo.T)) / (1 / hi.T - 1 / lo.T);
    const dev = p.log10Ratio - chord;
    if (Math.abs(dev) > Math.abs(worst)) worst = dev;
  }
  return Math.abs(worst) > ends ? (worst > 0 ? "higher" : "lower") : null;
}

/** Everything the slope and shape clause depends on. */
export interface SlopeInput {
  activationEnergy: "lower" | "higher" | "same" | null;
  otherCount: number;
  factorChanges: boolean | null;
  /** Off at every comparison temperature, all in the same direction. */
  offThroughout?: boolean;
  /** From {@link middleBend}. */
  bend?: "higher" | "lower" | null;
  /** "the others' consensus" instead of "the others'" (the others disagree with each other). */
  whose?: string;
}

/**
 * The clause on how the factor runs along the range, each wording with its condition:
 * - the factor changes (χ² test p < 0.05) and bends in the middle more than the ends differ →
 *   the curvature differs (this wins over an end-to-end slope, which a bulge can also tilt);
 * - the ends differ (|slope z| > z_{0.975} = 1.959964) → its activation energy is lower or higher;
 * - the ends agree but the factor changes → the curvature differs;
 * - the ends agree, the factor test does not reject, and it is off at every temperature in the
 *   same direction → about the same factor throughout;
 * - otherwise nothing: the factors listed say all the data show.
 */
export function describeSlope(v: SlopeInput): string {
  const whose = v.whose ?? othersPossessive(v.otherCount);
  if (v.factorChanges && v.bend) return `its curvature differs from ${whose}: ${v.bend} in the middle of its range than at its ends`;
  if (v.activationEnergy === "lower") return `its activation energy is lower than ${whose}`;
  if (v.activationEnergy === "higher") return `its activation energy is higher than ${whose}`;
  if (v.activationEnergy === "same" && v.factorChanges)
    return `the factor changes along its range, though not between its ends: its curvature differs from ${whose}`;
  if (v.activationEnergy === "same" && v.factorChanges === false && v.offThroughout)
    return `about the same factor throughout: its activation energy agrees with ${whose}`;
  return "";
}

/** "Dataset 12" → "dataset 12" inside a sentence; other labels are kept as given. */
export function lowerFirst(label: string): string {
  return label.startsWith("Dataset ") ? `d${label.slice(1)}` : label;
}

/** What the verdict sentence needs to know about one dataset's comparison. */
export interface VerdictInput {
  /** How the dataset is named ("Dataset 12", or a label). */
  name: string;
  /** Its own range inside the window; null when it has no points there. */
  own: { Tmin: number; Tmax: number } | null;
  /** Why it is left out of the consensus; null when it is in. */
  leftOut: string | null;
  /** Set aside as off the consensus of the others (largest consistent subset): compared with the datasets that shaped the curve. */
  setAside?: boolean;
  /** Included datasets other than this one. */
  otherCount: number;
  unitSuspect: string | null;
  /** Null when it could not be compared (nothing else in the consensus, or the others cover one temperature). */
  comparison: {
    /** Datasets in the consensus it is compared with. */
    count: number;
    /** Temperatures those datasets cover. */
    othersRange: { Tmin: number; Tmax: number };
    /**
     * The other dataset carrying most of the others' consensus at temperature T, with its name and
     * range; inRange false when T is outside that range (the others' curve there extrapolates it).
     */
    restsOn: { name: string; share: number; T?: number; Tmin?: number; Tmax?: number; inRange?: boolean } | null;
    /** The overlap of the ranges; null when there is none. */
    range: { Tmin: number; Tmax: number } | null;
    points: ComparedPoint[];
    off: boolean;
    activationEnergy: "lower" | "higher" | "same" | null;
    factorChanges: boolean | null;
    meanOffsetLog10: number;
    /**
     * Set when it agrees only within the spread between the others (τ²₋ⱼ outweighs both fits'
     * own variances where it would otherwise be off): τ²₋ⱼ, and the others that are themselves off.
     */
    spread?: { tau2: number; offOthers: string[] } | null;
  } | null;
}

/**
 * Who carries the others' consensus where the dataset is judged hardest. A share at a temperature
 * outside that dataset's own range is not support there: the curve there extrapolates it.
 */
function restsOnWords(r: NonNullable<NonNullable<VerdictInput["comparison"]>["restsOn"]>): string {
  const pct = Math.round(r.share * 100);
  const name = lowerFirst(r.name);
  if (r.inRange === false && r.T != null && r.Tmin != null && r.Tmax != null) {
    return `which at ${describeT(r.T)} is an extrapolation of ${name}, measured at ${describeT(r.Tmin)}–${describeT(r.Tmax)}, with ${pct} % of its weight`;
  }
  return `which rests ${pct} % on ${name} there`;
}

/** The comparison of one dataset with the others, in one or two sentences (each template with its condition). */
export function describeVerdict(v: VerdictInput): string {
  const { name, leftOut, unitSuspect } = v;
  const setAside = v.setAside === true;
  const out = setAside ? " Off the consensus — not used for the curve." : leftOut ? ` Left out of the consensus: ${leftOut}.` : "";
  if (!v.own) return `${name} has no points inside the temperature window.`;
  const d = v.comparison;
  if (!d) {
    return v.otherCount === 0
      ? `${name} is the only dataset in the consensus: there is nothing to compare it with.${out}`
      : `The other datasets alone cover a single temperature, so ${lowerFirst(name)} cannot be compared with them.${out}`;
  }
  let against = leftOut && !setAside ? "the consensus" : d.count === 1 ? "the only other dataset" : `the consensus of the other ${d.count}`;
  if (d.restsOn) against += ` (${restsOnWords(d.restsOn)})`;
  if (unitSuspect) return `${name} is ${describeFactor(d.meanOffsetLog10)} ${against}, close to ${unitSuspect}: check its units.${out}`;
  if (!d.range || d.points.length === 0) {
    return `${name} (${describeT(v.own.Tmin)}–${describeT(v.own.Tmax)}) lies outside the temperatures of ${against} (${describeT(d.othersRange.Tmin)}–${describeT(d.othersRange.Tmax)}): not compared.${out}`;
  }
  const differs = d.activationEnergy === "lower" || d.activationEnergy === "higher";
  const bend = middleBend(d.points);
  if (!d.off) {
    const widest = d.points.reduce((a, b) => (Math.abs(b.log10Ratio) > Math.abs(a.log10Ratio) ? b : a));
    const largest = factorRoundsToOne(widest.log10Ratio)
      ? "k the same to three digits at each"
      : `largest difference ${describeFactor(widest.log10Ratio)}, at ${describeT(widest.T)}`;
    const temps = listTemperatures(d.points.map((p) => p.T));
    const spread = d.spread;
    // The others disagreeing with each other: compare with their consensus, and say who is off.
    const whose = spread ? "the others' consensus" : undefined;
    const clause = differs ? describeSlope({ ...slopeOf(d), bend: null, whose }) : "";
    const though = clause ? `, though ${clause}` : "";
    if (spread) {
      const n = spread.offOthers.length;
      const who = n ? `, and ${listNames(spread.offOthers)} ${n === 1 ? "is" : "are"} off the consensus of the rest` : "";
      const tau = `τ² of the others = ${formatNumber(spread.tau2, 2)} in (ln k)², a factor ${factorSize(Math.sqrt(spread.tau2) / Math.LN10)} per standard deviation`;
      const slope = clause ? ` ${clause[0].toUpperCase()}${clause.slice(1)}.` : "";
      return `${name} agrees with ${against} at ${temps} (${largest}) only within the wide spread between the others (${tau}): they disagree with each other${who}.${slope}${out}`;
    }
    return `${name} agrees with ${against} within its uncertainty at ${temps} (${largest})${though}.${out}`;
  }
  const where = describeComparison(d.points);
  const offThroughout =
    d.points.every((p) => !p.agrees) && (d.points.every((p) => p.log10Ratio > 0) || d.points.every((p) => p.log10Ratio < 0));
  const clause = describeSlope({ ...slopeOf(d), offThroughout, bend });
  const slope = !clause ? "" : differs || (d.factorChanges && bend) ? `: ${clause}` : ` — ${clause}`;
  return `${name} is off ${against}: ${where}${slope}.${out}`;
}

function slopeOf(d: NonNullable<VerdictInput["comparison"]>): SlopeInput {
  return { activationEnergy: d.activationEnergy, otherCount: d.count, factorChanges: d.factorChanges };
}

/** "A", "A and B", "A, B and C". */
function listNames(names: string[]): string {
  const parts = names.map(lowerFirst);
  return parts.length === 1 ? parts[0] : `${parts.slice(0, -1).join(", ")} and ${parts[parts.length - 1]}`;
}
