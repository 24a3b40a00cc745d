/**
 * The consensus' findings in words: factors, places and directions a reader can check on the plot.
 */
import { AVOGADRO } from "./constants";
import type { ReactionOrder } from "./types";

/** Window (log10 units) around a unit-mistake factor. */
export const UNIT_SUSPECT_WINDOW = 0.15;

/** The unit mistake whose factor (log10) lies within the window of |offset|, if any. */
export function matchUnitMistake(offsetLog10: number, order: ReactionOrder): string | null {
  const m = order - 1;
  if (m === 0) return null;
  const lgNA = Math.log10(AVOGADRO);
  const candidates: [number, string][] = [
    [m * lgNA, `a factor of N_A${m > 1 ? "²" : ""} (molecule ↔ mol)`],
    [3 * m, `a factor of 10^${3 * m} (L ↔ cm³)`],
    [6 * m, `a factor of 10^${6 * m} (m³ ↔ cm³)`],
    [m * (lgNA - 3), `a factor of (N_A/1000)${m > 1 ? "²" : ""} (L mol⁻¹ ↔ cm³ molecule⁻¹)`],
    [m * (lgNA - 6), `a factor of (N_A/10⁶)${m > 1 ? "²" : ""} (m³ mol⁻¹ ↔ cm³ molecule⁻¹)`],
  ];
  const a = Math.abs(offsetLog10);
  for (const [c, label] of candidates) if (Math.abs(a - c) <= UNIT_SUSPECT_WINDOW) return label;
  return null;
}

/** "a factor 4.8 above" / "a factor 10^23.78 below" from a log10 ratio. */
export function describeFactor(log10: number): string {
  const a = Math.abs(log10);
  // Three digits below a factor 2 ("1.04"), two above ("4.8"), a power of ten for unit-size factors.
  const size = a < 3 ? (10 ** a).toPrecision(10 ** a < 2 ? 3 : 2) : `10^${a.toFixed(2)}`;
  return `a factor ${size} ${log10 >= 0 ? "above" : "below"}`;
}

/** A temperature for prose: whole kelvin above 100 K, three significant digits below. */
export function describeT(T: number): string {
  return T >= 100 ? `${Math.round(T)} K` : `${Number(T.toPrecision(3))} K`;
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
  const off = points.filter((p) => !p.agrees).map((p) => `${describeFactor(p.log10Ratio)} at ${describeT(p.T)}`);
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
 * The slope clause from the test between the cold and the hot end ("lower"/"higher": |z| > 1.96),
 * and, when the ends agree, from the test of a constant factor along the range.
 */
export function describeSlope(
  slope: "lower" | "higher" | "same" | null,
  otherCount: number,
  factorChanges: boolean | null = false,
): string {
  const whose = othersPossessive(otherCount);
  if (slope === "lower") return `its activation energy is lower than ${whose}`;
  if (slope === "higher") return `its activation energy is higher than ${whose}`;
  if (slope === "same" && factorChanges === false) return `about the same factor throughout: its activation energy agrees with ${whose}`;
  if (slope === "same" && factorChanges)
    return `the factor changes along its range, though not between its ends: its curvature differs from ${whose}`;
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
  /** Included datasets other than this one. */
  otherCount: number;
  unitSuspect: string | null;
  /** Null when it could not be compared (nothing else in the consensus, or the others cover one temperature). */
  comparison: {
    /** Datasets in the consensus it is compared with. */
    count: number;
    /** Temperatures those datasets cover. */
    othersRange: { Tmin: number; Tmax: number };
    /** The other dataset carrying most of the others' consensus, with its name. */
    restsOn: { name: string; share: number } | null;
    /** The overlap of the ranges; null when there is none. */
    range: { Tmin: number; Tmax: number } | null;
    points: ComparedPoint[];
    off: boolean;
    activationEnergy: "lower" | "higher" | "same" | null;
    factorChanges: boolean | null;
    meanOffsetLog10: number;
  } | null;
}

/** The comparison of one dataset with the others, in one or two sentences (each template with its condition). */
export function describeVerdict(v: VerdictInput): string {
  const { name, leftOut, unitSuspect } = v;
  const out = leftOut ? ` Left out of the consensus: ${leftOut}.` : "";
  if (!v.own) return `${name} has no points inside the temperature window.`;
  const d = v.comparison;
  if (!d) {
    return v.otherCount === 0
      ? `${name} is the only dataset in the consensus: there is nothing to compare it with.${out}`
      : `The other datasets alone cover a single temperature, so ${lowerFirst(name)} cannot be compared with them.${out}`;
  }
  let against = leftOut ? "the consensus" : d.count === 1 ? "the only other dataset" : `the consensus of the other ${d.count}`;
  if (d.restsOn) against += ` (which rests ${Math.round(d.restsOn.share * 100)} % on ${lowerFirst(d.restsOn.name)} there)`;
  if (unitSuspect) return `${name} is ${describeFactor(d.meanOffsetLog10)} ${against}, close to ${unitSuspect}: check its units.${out}`;
  if (!d.range || d.points.length === 0) {
    return `${name} (${describeT(v.own.Tmin)}–${describeT(v.own.Tmax)}) lies outside the temperatures of ${against} (${describeT(d.othersRange.Tmin)}–${describeT(d.othersRange.Tmax)}): not compared.${out}`;
  }
  const differs = d.activationEnergy === "lower" || d.activationEnergy === "higher";
  if (!d.off) {
    const widest = d.points.reduce((a, b) => (Math.abs(b.log10Ratio) > Math.abs(a.log10Ratio) ? b : a));
    const within = `within its uncertainty at ${listTemperatures(d.points.map((p) => p.T))} (largest difference ${describeFactor(widest.log10Ratio)}, at ${describeT(widest.T)})`;
    return `${name} agrees with ${against} ${within}${differs ? `, though ${describeSlope(d.activationEnergy, d.count)}` : ""}.${out}`;
  }
  const where = describeComparison(d.points);
  const clause = describeSlope(d.activationEnergy, d.count, d.factorChanges);
  const slope = !clause ? "" : differs ? `: ${clause}` : ` — ${clause}`;
  return `${name} is off ${against}: ${where}${slope}.${out}`;
}
