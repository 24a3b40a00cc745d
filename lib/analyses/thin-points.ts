import { createLTTB } from "downsample";

/** A point as drawn on an Arrhenius plot: x = 1000/T, y = ln k, with its index in the pasted data. */
export interface DrawnPoint {
  x: number;
  y: number;
  index: number;
}

/** How many points a plot draws at most; the fit always uses all of them. */
export const DRAWN_POINTS = 1000;

const lttb = createLTTB<DrawnPoint>({ x: "x", y: "y" });

/**
 * Thins points for drawing with Largest-Triangle-Three-Buckets (Steinarsson 2013, the `downsample`
 * package), which keeps the visual extremes of each 1/T bucket, and always keeps every point in
 * `keep` (the flagged outliers). Below `max` points every point is returned.
 */
export function thinForDrawing(points: readonly DrawnPoint[], keep: ReadonlySet<number>, max = DRAWN_POINTS): DrawnPoint[] {
  if (points.length <= max) return [...points];
  const sorted = [...points].sort((a, b) => a.x - b.x);
  const kept = sorted.filter((p) => keep.has(p.index));
  const thinned = lttb(sorted, Math.max(3, max - kept.length)) as DrawnPoint[];
  const seen = new Set(thinned.map((p) => p.index));
  return [...thinned, ...kept.filter((p) => !seen.has(p.index))];
}
