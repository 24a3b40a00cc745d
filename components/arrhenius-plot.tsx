"use client";

import { formatRange, formatSignificant } from "@/lib/format";
import { ScrollRegion } from "./scroll-region";

// Up to this many points the figure carries them as a table too; beyond, the page's downloads do.
const TABLE_LIMIT = 500;
import { niceScale, temperatureTicks } from "./plot-scales";
import { Area, CartesianGrid, ComposedChart, Legend, Line, ResponsiveContainer, Scatter, Tooltip, XAxis, YAxis } from "recharts";

export interface PlotPoint {
  T: number;
  lnk: number;
  outlier: boolean;
}

export interface PlotBand {
  model: "arrhenius" | "modified_arrhenius";
  T: number[];
  lnk: number[];
  lower: number[] | null;
  upper: number[] | null;
}

/**
 * Arrhenius plot: ln k against 1000/T, with T in K on the top axis. Measured points are circles;
 * points flagged as outliers are crosses (shape and colour both differ). The fitted line and its
 * 95 % confidence band come from the chosen model.
 */
export function ArrheniusPlot({
  points,
  band,
  kUnitLabel,
  reported,
}: {
  points: PlotPoint[];
  band: PlotBand;
  kUnitLabel: string;
  /** The authors' own expression, drawn dashed over the data and the re-fit (same units as the points). */
  reported?: { T: number[]; lnk: number[] };
}) {
  const reportedLine = reported
    ? reported.T.map((t, i) => ({ x: 1000 / t, reported: reported.lnk[i] })).filter((p) => Number.isFinite(p.reported))
    : [];
  const xs = [...points.map((p) => 1000 / p.T), ...band.T.map((t) => 1000 / t), ...reportedLine.map((p) => p.x)];
  const x = niceScale(Math.min(...xs), Math.max(...xs));
  const domain = x.domain;
  const topTicks = temperatureTicks(domain);
  const ys = [
    ...points.map((p) => p.lnk),
    ...(band.lower ?? band.lnk),
    ...(band.upper ?? band.lnk),
    ...reportedLine.map((p) => p.reported),
  ].filter(Number.isFinite);
  const y = niceScale(Math.min(...ys), Math.max(...ys));
  const fit = band.T.map((t, i) => ({
    x: 1000 / t,
    fit: band.lnk[i],
    range: band.lower && band.upper ? [band.lower[i], band.upper[i]] : undefined,
  }));
  const normal = points.filter((p) => !p.outlier).map((p) => ({ x: 1000 / p.T, y: p.lnk, T: p.T }));
  const flagged = points.filter((p) => p.outlier).map((p) => ({ x: 1000 / p.T, y: p.lnk, T: p.T }));
  const fitName = band.model === "modified_arrhenius" ? "modified Arrhenius fit" : "Arrhenius fit";
  const Ts = points.map((p) => p.T);
  const summary = `Arrhenius plot, ln k against 1000/T, of ${points.length} points between ${formatRange(Math.min(...Ts), Math.max(...Ts), "K")}, ln k from ${y.domain[0]} to ${y.domain[1]}, with the ${fitName}${band.lower ? " and its 95 % band" : ""}${flagged.length ? `; ${flagged.length} point${flagged.length === 1 ? "" : "s"} flagged as outlier${flagged.length === 1 ? "" : "s"}, drawn as crosses` : ""}${reportedLine.length ? "; the expression the authors report is drawn dashed" : ""}. The fitted parameters are in the table below.`;
  return (
    <figure className="space-y-2">
      <div className="h-96 w-full" role="img" aria-label={summary}>
        <ResponsiveContainer width="100%" height="100%">
          <ComposedChart margin={{ top: 28, right: 24, bottom: 28, left: 16 }}>
            <CartesianGrid stroke="#e6e1d6" />
            <XAxis
              xAxisId="inv"
              dataKey="x"
              type="number"
              domain={domain}
              ticks={x.ticks}
              allowDataOverflow
              label={{ value: "1000 / T  (K⁻¹)", position: "bottom", offset: 8 }}
              tickFormatter={(v: number) => v.toFixed(x.decimals)}
            />
            <XAxis
              xAxisId="T"
              dataKey="x"
              type="number"
              orientation="top"
              domain={domain}
              ticks={topTicks.map((t) => t.x)}
              allowDataOverflow
              tickFormatter={(v: number) => String(topTicks.find((t) => Math.abs(t.x - v) < 1e-9)?.T ?? Math.round(1000 / v))}
              label={{ value: "T  (K)", position: "top", offset: 8 }}
            />
            <YAxis
              dataKey="y"
              type="number"
              domain={y.domain}
              ticks={y.ticks}
              tickFormatter={(v: number) => v.toFixed(y.decimals).replace("-", "\u2212")}
              label={{ value: `ln k  (k in ${kUnitLabel})`, angle: -90, position: "insideLeft", style: { textAnchor: "middle" } }}
              width={80}
            />
            <Tooltip
              formatter={(v) => (Array.isArray(v) ? v.map((x) => Number(x).toFixed(3)).join(" … ") : Number(v).toFixed(3))}
              labelFormatter={(x) => `1000/T = ${Number(x).toFixed(3)} K⁻¹ (T = ${(1000 / Number(x)).toFixed(1)} K)`}
            />
            <Legend verticalAlign="bottom" wrapperStyle={{ paddingTop: 24 }} />
            {band.lower && (
              <Area
                xAxisId="inv"
                data={fit}
                dataKey="range"
                name="95 % confidence band"
                stroke="none"
                fill="#8f4419"
                fillOpacity={0.15}
                isAnimationActive={false}
              />
            )}
            <Line
              xAxisId="inv"
              data={fit}
              dataKey="fit"
              name={fitName}
              stroke="#8f4419"
              strokeWidth={2}
              dot={false}
              isAnimationActive={false}
            />
            {reportedLine.length > 0 && (
              <Line
                xAxisId="inv"
                data={reportedLine}
                dataKey="reported"
                name="expression the authors report"
                stroke="#3d6b35"
                strokeWidth={2}
                strokeDasharray="6 4"
                dot={false}
                isAnimationActive={false}
              />
            )}
            <Scatter xAxisId="inv" data={normal} dataKey="y" name="measured" fill="#22537a" shape="circle" isAnimationActive={false} />
            {flagged.length > 0 && (
              <Scatter
                xAxisId="inv"
                data={flagged}
                dataKey="y"
                name="flagged as outlier"
                fill="#a12a2a"
                shape="cross"
                legendType="cross"
                isAnimationActive={false}
              />
            )}
          </ComposedChart>
        </ResponsiveContainer>
      </div>
      <figcaption className="text-xs text-muted">
        Circles: points used in the fit. Crosses: points flagged as outliers (still part of the fit).
        {band.lower ? ` Shaded: 95 % confidence band of the ${fitName}.` : ""}
        {reportedLine.length ? " Dashed: the expression the authors report, over its stated range (else the data's)." : ""}
      </figcaption>
      {points.length <= TABLE_LIMIT && (
        <details className="text-sm">
          <summary className="cursor-pointer text-link">The plotted points as a table</summary>
          <ScrollRegion label="Plotted points" scrollClassName="max-h-80 overflow-auto">
            <table className="table">
              <thead>
                <tr>
                  <th scope="col">T (K)</th>
                  <th scope="col">1000/T (K⁻¹)</th>
                  <th scope="col">ln k</th>
                  <th scope="col">Flag</th>
                </tr>
              </thead>
              <tbody>
                {points.map((p, i) => (
                  <tr key={i}>
                    <td>{formatSignificant(p.T, 5)}</td>
                    <td>{formatSignificant(1000 / p.T, 5)}</td>
                    <td>{formatSignificant(p.lnk, 5)}</td>
                    <td>{p.outlier ? "outlier" : ""}</td>
                  </tr>
                ))}
              </tbody>
            </table>
          </ScrollRegion>
        </details>
      )}
    </figure>
  );
}
