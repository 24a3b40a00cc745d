/**
 * The authors' valid range against the data, checked as it is typed: a range that does not overlap
 * the measured temperatures is almost always a unit slip (a range in K read as °C, or the reverse),
 * so the editor says where the two lie, in kelvin, and which unit would make them meet.
 */
import { parseNumberCell } from "@/lib/deposits/import-table";
import { formatRange, formatSignificant } from "@/lib/format";
import { toKelvin, UnitError } from "@/lib/kinetics/units";
import type { EditorForm } from "./form-model";

const UNIT_WORDS: Record<string, string> = { K: "kelvin", degC: "°C" };

function kelvinOrNull(text: string, unit: string): number | null {
  const v = parseNumberCell(text.trim());
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
 * A plain-words warning when the stated valid range (in its own unit) and the data (in units.T)
 * share no temperature; null when they do, or when either is not given yet.
 */
export function validityRangeWarning(form: EditorForm): string | null {
  const fit = form.reportedFit;
  if (!fit.enabled) return null;
  const data = dataRangeK(form);
  const lo = kelvinOrNull(fit.Tmin, fit.rangeUnit);
  const hi = kelvinOrNull(fit.Tmax, fit.rangeUnit);
  if (!data || (lo === null && hi === null)) return null;
  const range: [number, number] = [lo ?? -Infinity, hi ?? Infinity];
  if (overlaps(range, data)) return null;
  const side = range[1] < data[0] ? "below" : "above";
  const stated =
    lo !== null && hi !== null
      ? formatRange(lo, hi, "K")
      : lo !== null
        ? `from ${formatSignificant(lo)} K`
        : `up to ${formatSignificant(hi)} K`;
  let advice = "Check the numbers and the unit chosen beside them.";
  const other = fit.rangeUnit === "K" ? "degC" : "K";
  const otherLo = kelvinOrNull(fit.Tmin, other);
  const otherHi = kelvinOrNull(fit.Tmax, other);
  if ((otherLo !== null || otherHi !== null) && overlaps([otherLo ?? -Infinity, otherHi ?? Infinity], data))
    advice = `Read in ${UNIT_WORDS[other]} they would cover the data: is the unit beside the range right?`;
  return `The valid range (${stated}) lies wholly ${side} the measured temperatures (${formatRange(data[0], data[1], "K")}). ${advice}`;
}
