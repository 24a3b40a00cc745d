/**
 * Whether a temperature lies outside a measured range, and how far: in kelvin from the nearest
 * end, and in 1/T as a multiple of the range's width in 1/T (the scale on which the Arrhenius
 * fit's uncertainty grows, so 1 means "as far again as the data span").
 */
import type { Extrapolation } from "./types";

/**
 * k(298.15 K) beyond this many widths of the measured range in 1/T is given without a confidence
 * interval: that far out the interval only says how well the line is known if the expression
 * still holds there, which the data cannot show.
 */
export const K298_INTERVAL_MAX_WIDTHS = 1;

/**
 * @param T temperature, K
 * @param Tmin lowest measured temperature, K
 * @param Tmax highest measured temperature, K (> Tmin)
 * @example extrapolationOf(298.15, 1000, 2000) // { extrapolated: true, extrapolation: { side: "below", kelvin: 701.85, inverseTWidths: 4.708… } }
 */
export function extrapolationOf(T: number, Tmin: number, Tmax: number): { extrapolated: boolean; extrapolation: Extrapolation | null } {
  if (T >= Tmin && T <= Tmax) return { extrapolated: false, extrapolation: null };
  const below = T < Tmin;
  const end = below ? Tmin : Tmax;
  // |1/T − 1/end| / (1/Tmin − 1/Tmax) = |end − T|·Tmin·Tmax / (T·end·(Tmax − Tmin)), written with the
  // differences of temperatures (exact for close values), never of their reciprocals, which cancel in a narrow range.
  const widths = (Math.abs(end - T) / (Tmax - Tmin)) * (Tmin / T) * (Tmax / end);
  return {
    extrapolated: true,
    extrapolation: {
      side: below ? "below" : "above",
      kelvin: Math.abs(T - end),
      // A range narrower than double precision can resolve in 1/T: as far as a number can say.
      inverseTWidths: Number.isFinite(widths) ? widths : Number.MAX_VALUE,
    },
  };
}
