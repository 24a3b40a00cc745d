/**
 * A number to `digits` significant digits for tables: exponent form outside 0.001…100 000,
 * "—" for a missing or non-finite value. The same on server and client.
 */
export function formatSignificant(v: number | null | undefined, digits = 4): string {
  if (v === null || v === undefined || !Number.isFinite(v)) return "—";
  if (v === 0) return "0";
  const a = Math.abs(v);
  return a >= 1e5 || a < 1e-3 ? v.toExponential(digits - 1) : v.toPrecision(digits);
}
