"use client";

import { useXAxisScale, useYAxisScale } from "recharts";

/** Above this many points a scatter is drawn as one SVG path rather than an element per point. */
export const POINT_CLOUD_FROM = 200;

/**
 * Many points (and their ±1σ bars) inside a recharts chart as two SVG paths. Recharts' Scatter
 * renders several React components per point, which for a thousand points blocked the page for
 * seconds; one path costs one element. Coordinates are in the units of the x axis `xAxisId` and
 * the default y axis.
 */
export function PointCloud({
  points,
  xAxisId,
  colour,
  radius = 2.5,
}: {
  points: { x: number; y: number; err?: number }[];
  xAxisId: string;
  colour: string;
  radius?: number;
}) {
  const xScale = useXAxisScale(xAxisId);
  const yScale = useYAxisScale();
  if (!xScale || !yScale) return null;
  const dots: string[] = [];
  const bars: string[] = [];
  const r = radius;
  for (const p of points) {
    const px = Number(xScale(p.x));
    const py = Number(yScale(p.y));
    if (!Number.isFinite(px) || !Number.isFinite(py)) continue;
    // A circle as two half arcs.
    dots.push(`M${(px - r).toFixed(1)},${py.toFixed(1)}a${r},${r} 0 1,0 ${2 * r},0a${r},${r} 0 1,0 ${-2 * r},0`);
    if (p.err) {
      const top = Number(yScale(p.y + p.err));
      const bottom = Number(yScale(p.y - p.err));
      if (Number.isFinite(top) && Number.isFinite(bottom))
        bars.push(
          `M${px.toFixed(1)},${top.toFixed(1)}V${bottom.toFixed(1)}M${(px - 3).toFixed(1)},${top.toFixed(1)}h6M${(px - 3).toFixed(1)},${bottom.toFixed(1)}h6`,
        );
    }
  }
  return (
    <g aria-hidden>
      {bars.length > 0 && <path d={bars.join("")} stroke={colour} strokeWidth={1} fill="none" />}
      <path d={dots.join("")} fill={colour} stroke="none" />
    </g>
  );
}
