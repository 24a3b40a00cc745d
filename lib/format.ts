/** The minus sign (U+2212) a reader sees; "-" is a hyphen. */
export const MINUS = "\u2212";

/**
 * A number to `digits` significant digits for tables: exponent form "1.234e−11" / "1.23e5"
 * outside 0.001…100 000 (never "e+"), plain decimals inside ("190", not "1.9e+2"), "—" for a
 * missing or non-finite value, a true minus sign and never a negative zero. The same on server
 * and client; every number on the dataset and reaction pages goes through it or formatNumber.
 */
export function formatSignificant(v: number | null | undefined, digits = 4): string {
  if (v === null || v === undefined || !Number.isFinite(v)) return "—";
  if (v === 0) return "0";
  const a = Math.abs(v);
  const text = a >= 1e5 || a < 1e-3 ? v.toExponential(digits - 1).replace("e+", "e") : plainDecimal(v, digits);
  return text.replace(/-/g, MINUS);
}

/** `v` rounded to `digits` significant digits, written without an exponent (trailing zeros kept). */
function plainDecimal(v: number, digits: number): string {
  const rounded = Number(v.toPrecision(digits));
  if (rounded === 0) return "0";
  const decimals = Math.max(0, digits - 1 - Math.floor(Math.log10(Math.abs(rounded))));
  return rounded.toFixed(Math.min(decimals, 100));
}

/**
 * A number as a person typed it, at most `digits` significant digits and no trailing zeros
 * ("8.3e−11", "7.5", "298.15"), in the same exponent form and with the same minus as
 * formatSignificant.
 */
export function formatNumber(v: number | null | undefined, digits = 5): string {
  const s = formatSignificant(v, digits);
  if (s === "—" || s === "0") return s;
  return s.replace(/(\.\d*?)0+(?=e|$)/, "$1").replace(/\.(?=e|$)/, "");
}

/** A signed value to `decimals` places with a true minus, "0.0" rather than "−0.0". */
export function formatFixed(v: number | null | undefined, decimals: number): string {
  if (v === null || v === undefined || !Number.isFinite(v)) return "—";
  const s = v.toFixed(decimals);
  return Number(s) === 0 ? s.replace("-", "") : s.replace("-", MINUS);
}

/**
 * Both ends of a range written alike: the same number of decimals, chosen so that the end of
 * larger magnitude has `digits` significant digits (at most 3 decimals, less the trailing zeros
 * both ends share), a true minus sign, and
 * "a to b" when an end is negative ("−248.2 to −98.2 °C", where an en dash would read as a minus),
 * "a–b" otherwise. One value when both ends round to the same text.
 *
 * @example formatRange(-248.15, -98.15, "°C") // "−248.2 to −98.2 °C"; formatRange(250, 400, "K") // "250–400 K"
 */
export function formatRange(lo: number | null | undefined, hi: number | null | undefined, unit: string, digits = 4): string {
  if (lo === null || lo === undefined || hi === null || hi === undefined || !Number.isFinite(lo) || !Number.isFinite(hi)) return "—";
  const big = Math.max(Math.abs(lo), Math.abs(hi));
  let decimals = big === 0 ? 0 : Math.min(3, Math.max(0, digits - 1 - Math.floor(Math.log10(big))));
  const text = (v: number) => {
    // Halves round away from zero after the binary noise is dropped: −248.15 → −248.2, as a reader rounds.
    const scaled = Math.round(Number((Math.abs(v) * 10 ** decimals).toPrecision(12)));
    const s = (scaled / 10 ** decimals).toFixed(decimals);
    return scaled === 0 || v >= 0 ? s : `${MINUS}${s}`;
  };
  // Zeros both ends share at the end say nothing: 250.0–400.0 K is 250–400 K.
  while (decimals > 0 && text(lo).endsWith("0") && text(hi).endsWith("0")) decimals--;
  const [a, b] = [text(lo), text(hi)];
  const space = unit === "" ? "" : ` ${unit}`;
  if (a === b) return `${a}${space}`;
  return lo < 0 || hi < 0 ? `${a} to ${b}${space}` : `${a}–${b}${space}`;
}

/**
 * 10^log10 in the exponent form of formatSignificant ("2.24e−305"), also where the power itself
 * would overflow to Infinity or underflow to 0.
 */
export function formatTenTo(log10: number, digits = 3): string {
  if (!Number.isFinite(log10)) return "—";
  if (Math.abs(log10) < 300) return formatSignificant(10 ** log10, digits);
  let exponent = Math.floor(log10);
  let mantissa = Number((10 ** (log10 - exponent)).toFixed(digits - 1));
  if (mantissa >= 10) {
    mantissa /= 10;
    exponent += 1;
  }
  return `${mantissa.toFixed(digits - 1)}e${exponent}`.replace(/-/g, MINUS);
}

/**
 * How long something has waited, in our plain units: "under 1 h", "3 h", "2 d 4 h", "12 d".
 * Hours are dropped from 10 days on (they no longer tell anything).
 *
 * @example formatWaiting(52 * 3_600_000) // "2 d 4 h"
 */
export function formatWaiting(ms: number): string {
  if (!Number.isFinite(ms) || ms < 3_600_000) return "under 1 h";
  const hours = Math.floor(ms / 3_600_000);
  const days = Math.floor(hours / 24);
  const rest = hours % 24;
  if (days === 0) return `${hours} h`;
  if (days >= 10 || rest === 0) return `${days} d`;
  return `${days} d ${rest} h`;
}
