/**
 * The authors' valid range against the data, checked as it is typed: a range that does not overlap
 * the measured temperatures is almost always a unit slip (a range in K read as °C, or the reverse),
 * and one reaching well beyond them claims more than the data show; the editor says where the two
 * lie, in kelvin, and when the other unit would match the data much better.
 */
import { parseNumberText } from "@/lib/number-text";
import { formatNumber, formatRange } from "@/lib/format";
import { toKelvin, UnitError } from "@/lib/kinetics/units";
import type { EditorForm } from "./form-model";

const UNIT_WORDS: Record<string, string> = { K: "kelvin", degC: "°C" };

function kelvinOrNull(text: string, unit: string): number | null {
  const v = parseNumberText(text.trim());
  if (v === null) return null;
  try {
    return toKelvin(v, unit);
  } catch (e) {
    if (e instanceof UnitError) return null;
    throw e;
  }
}

/** The measured temperatures, lowest and highest, in kelvin; null with fewer than one readable row. */
function dataRangeK(form: EditorForm): [number, number] | null {
  let lo = Infinity;
  let hi = -Infinity;
  for (const row of form.points) {
    const T = kelvinOrNull(row.T, form.units.T);
    if (T === null) continue;
    lo = Math.min(lo, T);
    hi = Math.max(hi, T);
  }
  return lo <= hi ? [lo, hi] : null;
}

function overlaps(a: [number, number], b: [number, number]): boolean {
  return a[0] <= b[1] && b[0] <= a[1];
}

/**
 * How far a range reaches beyond the data: it reaches "well beyond" when an end lies below the
 * lowest measured T divided by REACH_FACTOR or above the highest times REACH_FACTOR, or when less
 * than MIN_COVERED of its width lies within the data. Our own rule (common practice: an expression
 * is reliable only over the temperatures it was fitted to, so a stated range much wider than the
 * data is worth a second look).
 */
export const REACH_FACTOR = 1.5;
export const MIN_COVERED = 0.5;

function coveredFraction(range: [number, number], data: [number, number]): number | null {
  if (!Number.isFinite(range[0]) || !Number.isFinite(range[1]) || range[1] <= range[0]) return null;
  const inside = Math.max(0, Math.min(range[1], data[1]) - Math.max(range[0], data[0]));
  return inside / (range[1] - range[0]);
}

function reachesWellBeyond(range: [number, number], data: [number, number]): boolean {
  if (range[0] < data[0] / REACH_FACTOR || range[1] > data[1] * REACH_FACTOR) return true;
  const covered = coveredFraction(range, data);
  return covered !== null && covered < MIN_COVERED;
}

/** How well a range matches the data: the shared width over the width of both together (0 … 1). */
function match(range: [number, number], data: [number, number]): number {
  const lo = Math.max(range[0], data[0]);
  const hi = Math.min(range[1], data[1]);
  const union = Math.max(range[1], data[1]) - Math.min(range[0], data[0]);
  if (!Number.isFinite(union) || union <= 0) return overlaps(range, data) ? 1 : 0;
  return Math.max(0, hi - lo) / union;
}

/**
 * A plain-words warning when the stated valid range (in its own unit) and the data (in units.T)
 * share no temperature, or when the range reaches well beyond the data (REACH_FACTOR,
 * MIN_COVERED); it says when the other unit would match the data much better. Null when the range
 * fits the data, or when either is not given yet.
 */
export function validityRangeWarning(form: EditorForm): string | null {
  const fit = form.reportedFit;
  if (!fit.enabled) return null;
  const data = dataRangeK(form);
  const lo = kelvinOrNull(fit.Tmin, fit.rangeUnit);
  const hi = kelvinOrNull(fit.Tmax, fit.rangeUnit);
  if (!data || (lo === null && hi === null)) return null;
  const range: [number, number] = [lo ?? -Infinity, hi ?? Infinity];
  const meets = overlaps(range, data);
  if (meets && !reachesWellBeyond(range, data)) return null;
  const stated =
    lo !== null && hi !== null
      ? formatRange(lo, hi, "K")
      : lo !== null
        ? `from ${formatNumber(lo, 4)} K`
        : `up to ${formatNumber(hi, 4)} K`;
  const measured = formatRange(data[0], data[1], "K");
  let advice = meets
    ? "An expression is reliable only over the temperatures it was fitted to: check the range and the unit chosen beside it."
    : "Check the numbers and the unit chosen beside them.";
  const other = fit.rangeUnit === "K" ? "degC" : "K";
  const otherLo = kelvinOrNull(fit.Tmin, other);
  const otherHi = kelvinOrNull(fit.Tmax, other);
  if (otherLo !== null || otherHi !== null) {
    const otherRange: [number, number] = [otherLo ?? -Infinity, otherHi ?? Infinity];
    if (!reachesWellBeyond(otherRange, data) && overlaps(otherRange, data) && match(otherRange, data) > match(range, data) + 0.2)
      advice = `Read in ${UNIT_WORDS[other]} the same numbers would match the data much better: is the unit beside the range right?`;
  }
  if (!meets) {
    const side = range[1] < data[0] ? "below" : "above";
    return `The valid range (${stated}) lies wholly ${side} the measured temperatures (${measured}). ${advice}`;
  }
  return `The valid range (${stated}) reaches well beyond the measured temperatures (${measured}). ${advice}`;
}
