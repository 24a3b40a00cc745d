/**
 * Round axis ticks for the plots: steps of 1, 2 or 5 × 10ⁿ, so every label is a short round
 * number and no two labels read the same.
 */

/**
 * The round step (1, 2, 2.5 or 5 × 10ⁿ) that splits `span` into about `count` intervals. 2.5 × 10ⁿ
 * only for n ≥ 0 (2.5, 25, …): below that it would need one decimal more than its neighbours
 * (0.025 writes −11.675 where 0.02 writes −11.68), so 2 × 10ⁿ is taken instead.
 */
export function niceStep(span: number, count = 5): number {
  if (!(span > 0) || !Number.isFinite(span)) return 1;
  const raw = span / Math.max(1, count);
  const exponent = Math.floor(Math.log10(raw));
  const power = 10 ** exponent;
  const m = raw / power;
  return (m <= 1 ? 1 : m <= 2 ? 2 : m <= 2.5 ? (exponent >= 0 ? 2.5 : 2) : m <= 5 ? 5 : 10) * power;
}

/** Decimals needed to write multiples of `step` exactly (0.25 → 2, 5 → 0). */
export function decimalsOf(step: number): number {
  for (let d = 0; d < 12; d++) if (Math.abs(Math.round(step * 10 ** d) - step * 10 ** d) < 1e-9 * 10 ** d) return d;
  return 12;
}

/**
 * Round ticks covering [min, max] and the domain widened to the outer ticks.
 * @example niceScale(3.1, 4.62) // { domain: [3, 5], ticks: [3, 3.5, 4, 4.5, 5], decimals: 1 }
 */
export function niceScale(min: number, max: number, count = 5): { domain: [number, number]; ticks: number[]; decimals: number } {
  if (!Number.isFinite(min) || !Number.isFinite(max)) return { domain: [0, 1], ticks: [0, 1], decimals: 0 };
  if (min === max) {
    const half = Math.abs(min) * 0.05 || 0.5;
    return niceScale(min - half, max + half, count);
  }
  const step = niceStep(max - min, count);
  const decimals = decimalsOf(step);
  const lo = Math.floor(min / step + 1e-9) * step;
  const hi = Math.ceil(max / step - 1e-9) * step;
  const ticks: number[] = [];
  for (let i = 0; lo + i * step <= hi + step * 1e-9; i++) ticks.push(Number((lo + i * step).toFixed(decimals)));
  return { domain: [ticks[0], ticks[ticks.length - 1]], ticks, decimals };
}

/** The share of the data's span kept free on each side of a plot's axis. */
export const PLOT_MARGIN = 0.04;

/**
 * THE scale of a plot's axis: niceScale over the data widened by {@link PLOT_MARGIN} of their span on
 * each side, so a point on a round value at the data's edge is never on the axis line with half its
 * marker clipped off. Every plot (dataset, review, reaction, editor preview, /analyse) uses it.
 * @example plotScale(2.5, 4) // { domain: [2.4, 4.2], … }: 2.5 and 4 lie inside, not on the edge
 */
export function plotScale(min: number, max: number, count = 5): { domain: [number, number]; ticks: number[]; decimals: number } {
  const margin = max > min && Number.isFinite(max - min) ? (max - min) * PLOT_MARGIN : 0;
  return niceScale(min - margin, max + margin, count);
}

/**
 * Round temperatures for the top axis of an Arrhenius plot whose bottom axis is 1000/T in
 * `domain` (K⁻¹), returned as positions on that axis. The labels follow one regular rule, never a
 * sequence with a value skipped here and there: either every multiple of one round step (narrow
 * ranges: 700, 725, 750…) or round values of every decade (wide ranges, where high temperatures
 * crowd together on the 1/T scale: 200, 300, 500, 1000, 2000), whichever gives the most labels
 * that stay apart — from the coldest up, stopping where they would crowd at the hot end; the greedy
 * thinning of the candidates is the last resort.
 */
export function temperatureTicks(domain: [number, number], count = 5): { x: number; T: number }[] {
  const x1 = domain[1];
  // A domain that starts at 0 K⁻¹ reaches infinite T: label up to 40 times the lowest temperature.
  const x0 = domain[0] > 0 ? domain[0] : x1 / 40;
  if (!(x1 > x0)) return [];
  const tLow = 1000 / x1;
  const tHigh = 1000 / x0;
  // About 49 px between neighbouring labels at the plot's tick spacing (64 px): four-digit temperatures stay apart.
  const minGap = (x1 - x0) / (count * 1.3);
  // Half a label's width from the left end: a label on the corner stands over the ln k axis's top label.
  const corner = x0 + minGap * 0.4;
  const placed = (Ts: Iterable<number>) =>
    [...new Set(Ts)]
      .sort((a, b) => a - b)
      .map((T) => ({ x: 1000 / T, T }))
      .filter((t) => t.x >= corner && t.x <= x1);
  /** The set from the coldest label up to the last one still apart from its neighbour (crowding begins at the hot end). */
  const apartFromCold = <T extends { x: number }>(ticks: T[]): T[] => {
    let n = 1;
    while (n < ticks.length && Math.abs(ticks[n - 1].x - ticks[n].x) >= minGap) n += 1;
    return ticks.slice(0, n);
  };

  // Regular sets: the multiples of each round step, and round mantissas of every decade.
  const sets: { x: number; T: number }[][] = [];
  const finest = niceStep(tHigh - tLow, count * 4);
  for (let e = Math.floor(Math.log10(finest)); e <= Math.ceil(Math.log10(tHigh)); e++) {
    // 1, 2 or 5 × 10ⁿ: labels of two significant figures wherever the step allows (no 725 or 1250).
    for (const m of [1, 2, 5]) {
      const step = m * 10 ** e;
      if (step < finest) continue;
      const decimals = decimalsOf(step);
      const Ts: number[] = [];
      for (let T = Math.ceil(tLow / step - 1e-9) * step; T <= tHigh + step * 1e-9 && Ts.length < 200; T += step)
        Ts.push(Number(T.toFixed(decimals)));
      sets.push(placed(Ts));
    }
  }
  const decades = (mantissas: number[]) => {
    const Ts: number[] = [];
    for (let k = Math.floor(Math.log10(tLow)); k <= Math.ceil(Math.log10(tHigh)); k++)
      for (const m of mantissas) Ts.push(Number((m * 10 ** k).toPrecision(6)));
    return placed(Ts.filter((T) => T >= tLow * (1 - 1e-9) && T <= tHigh * (1 + 1e-9)));
  };
  for (const mantissas of [
    [1, 2, 5],
    [1, 2, 3, 5],
    [1, 1.5, 2, 3, 4, 5, 6, 8],
    [1, 1.2, 1.5, 2, 2.5, 3, 4, 5, 6, 8],
  ])
    sets.push(decades(mantissas));
  // The most labels apart (at least two); on a tie, the set found first (a step before decades).
  let best: { x: number; T: number }[] | null = null;
  for (const whole of sets) {
    const set = apartFromCold(whole);
    if (set.length >= 2 && (!best || set.length > best.length)) best = set;
  }
  if (best) return best;

  // Last resort (a range too narrow for two round labels apart): from the lowest temperature up, a
  // candidate is kept only if it is far enough from the last kept one.
  const candidates = new Set<number>();
  const step = niceStep(tHigh - tLow, count * 2);
  const decimals = decimalsOf(step);
  for (let T = Math.ceil(tLow / step - 1e-9) * step; T <= tHigh + step * 1e-9; T += step) candidates.add(Number(T.toFixed(decimals)));
  const out: { x: number; T: number }[] = [];
  for (const t of placed(candidates)) if (out.length === 0 || Math.abs(out[out.length - 1].x - t.x) >= minGap) out.push(t);
  return out;
}
