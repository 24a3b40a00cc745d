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

/** The slope sentence from the difference of log ratios between the cold and the hot end. */
export function describeSlope(slope: "lower" | "higher" | "same" | null): string {
  if (slope === "lower") return "its activation energy is lower than the others'";
  if (slope === "higher") return "its activation energy is higher than the others'";
  if (slope === "same") return "about the same factor throughout: its activation energy agrees with the others'";
  return "";
}
