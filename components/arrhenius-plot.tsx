"use client";

import { useId } from "react";
import { formatRange, formatSignificant } from "@/lib/format";
import { ScrollRegion } from "./scroll-region";
import { kScaleSymbol, onKScale, useKScale } from "./k-scale";
import { plotScale, temperatureTicks } from "./plot-scales";
import { PointCloud, POINT_CLOUD_FROM } from "./point-cloud";
import { usePlotWidth } from "./plot-width";
import { Area, CartesianGrid, ComposedChart, ErrorBar, Legend, Line, ResponsiveContainer, Scatter, Tooltip, XAxis, YAxis } from "recharts";

// Up to this many points the figure carries them as a table too; beyond, the page's downloads do.
const TABLE_LIMIT = 500;

export interface PlotPoint {
  T: number;
  lnk: number;
  outlier: boolean;
  /** Stated standard uncertainty of ln k, drawn as a ±1σ error bar. */
  sigmaLnK?: number;
}

export interface PlotBand {
  model: "arrhenius" | "modified_arrhenius";
  T: number[];
  lnk: number[];
  lower: number[] | null;
  upper: number[] | null;
}

/**
 * Arrhenius plot: ln k (or log₁₀ k, the reader's choice) against 1000/T, with T in K on the top
 * axis. Measured points are circles, with ±1σ bars where an uncertainty is stated; points flagged
 * as outliers are crosses (shape and colour both differ). The fitted line and its 95 % confidence
 * band come from the chosen model. `totalPoints` above `points.length` says the points were thinned
 * for drawing (the fit used all of them); `tableHref` points the text alternative at the data as a
 * table when the figure does not carry one itself.
 */
export function ArrheniusPlot({
  points,
  band,
  kUnitLabel,
  reported,
  totalPoints,
  tableHref,
  dataTableHref,
}: {
  points: PlotPoint[];
  band: PlotBand;
  kUnitLabel: string;
  /** The authors' own expression, drawn dashed over the data and the re-fit (same units as the points). */
  reported?: { T: number[]; lnk: number[] };
  totalPoints?: number;
  tableHref?: string;
  /** The page shows every point in a table of its own there: the figure links it instead of carrying a second one. */
  dataTableHref?: string;
}) {
  const [scale, scaleControl] = useKScale();
  const { ref: plotRef, tickCount } = usePlotWidth<HTMLDivElement>();
  const tableId = useId();
  const total = Math.max(totalPoints ?? 0, points.length);
  const thinned = total > points.length;
  const yOf = (lnk: number) => onKScale(lnk, scale);
  const symbol = kScaleSymbol(scale);
  const reportedLine = reported
    ? reported.T.map((t, i) => ({ x: 1000 / t, reported: yOf(reported.lnk[i]) })).filter((p) => Number.isFinite(p.reported))
    : [];
  const xs = [...points.map((p) => 1000 / p.T), ...band.T.map((t) => 1000 / t), ...reportedLine.map((p) => p.x)];
  // Fewer ticks on a narrow plot, so the labels of both x axes stay apart.
  const x = plotScale(Math.min(...xs), Math.max(...xs), Math.max(3, tickCount));
  const domain = x.domain;
  const topTicks = temperatureTicks(domain, tickCount);
  const ys = [
    ...points.flatMap((p) => (p.sigmaLnK ? [p.lnk - p.sigmaLnK, p.lnk + p.sigmaLnK] : [p.lnk])),
    ...(band.lower ?? band.lnk),
    ...(band.upper ?? band.lnk),
  ]
    .map(yOf)
    .concat(reportedLine.map((p) => p.reported))
    .filter(Number.isFinite);
  let yMin = Infinity;
  let yMax = -Infinity;
  for (const v of ys) {
    if (v < yMin) yMin = v;
    if (v > yMax) yMax = v;
  }
  const y = plotScale(yMin, yMax);
  const fit = band.T.map((t, i) => ({
    x: 1000 / t,
    fit: yOf(band.lnk[i]),
    range: band.lower && band.upper ? [yOf(band.lower[i]), yOf(band.upper[i])] : undefined,
  }));
  const drawn = (p: PlotPoint) => ({ x: 1000 / p.T, y: yOf(p.lnk), T: p.T, ...(p.sigmaLnK ? { err: yOf(p.sigmaLnK) } : {}) });
  const normal = points.filter((p) => !p.outlier).map(drawn);
  const flagged = points.filter((p) => p.outlier).map(drawn);
  const withBars = points.some((p) => p.sigmaLnK);
  // Many points: the scatter's legend entry stays, the points themselves are drawn as one path.
  const cloud = normal.length >= POINT_CLOUD_FROM;
  const fitName = band.model === "modified_arrhenius" ? "modified Arrhenius fit" : "Arrhenius fit";
  let tLow = Infinity;
  let tHigh = -Infinity;
  for (const p of points) {
    if (p.T < tLow) tLow = p.T;
    if (p.T > tHigh) tHigh = p.T;
  }
  const counted = thinned
    ? `${total.toLocaleString("en")} points (${points.length.toLocaleString("en")} of them drawn)`
    : `${points.length} points`;
  const summary = `Arrhenius plot, ${symbol} against 1000/T, of ${counted} between ${formatRange(tLow, tHigh, "K")}, ${symbol} from ${y.domain[0]} to ${y.domain[1]}, with the ${fitName}${band.lower ? " and its 95 % band" : ""}${withBars ? "; error bars show the stated ±1σ" : ""}${flagged.length ? `; ${flagged.length} point${flagged.length === 1 ? "" : "s"} flagged as outlier${flagged.length === 1 ? "" : "s"}, drawn as crosses` : ""}${reportedLine.length ? "; the expression the authors report is drawn dashed" : ""}. The fitted parameters are in the table below.`;
  const ownTable = !dataTableHref && points.length <= TABLE_LIMIT && !thinned;
  const tableLink = dataTableHref ?? (ownTable ? `#${tableId}` : tableHref);
  return (
    <figure className="space-y-2">
      <div className="flex flex-wrap items-center justify-between gap-2">
        {scaleControl}
        {thinned && (
          <p className="text-xs text-muted" data-testid="drawn-count">
            {points.length.toLocaleString("en")} of {total.toLocaleString("en")} points drawn (thinned for drawing, keeping the extremes and
            every outlier); the fit uses all {total.toLocaleString("en")}.
          </p>
        )}
      </div>
      <div ref={plotRef} className="h-96 w-full" role="img" aria-label={summary}>
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
              label={{ value: `${symbol}  (k in ${kUnitLabel})`, angle: -90, position: "insideLeft", style: { textAnchor: "middle" } }}
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
                legendType="rect"
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
              legendType="plainline"
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
            <Scatter
              xAxisId="inv"
              data={cloud ? [] : normal}
              dataKey="y"
              name={withBars ? "measured (±1σ bars)" : "measured"}
              fill="#22537a"
              shape="circle"
              legendType="circle"
              isAnimationActive={false}
            >
              {withBars && <ErrorBar dataKey="err" direction="y" stroke="#22537a" width={3} />}
            </Scatter>
            {cloud && <PointCloud points={normal} xAxisId="inv" colour="#22537a" />}
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
              >
                {withBars && <ErrorBar dataKey="err" direction="y" stroke="#a12a2a" width={3} />}
              </Scatter>
            )}
          </ComposedChart>
        </ResponsiveContainer>
      </div>
      <figcaption className="text-xs text-muted">
        {normal.length > 0 ? "Circles: points used in the fit." : ""}
        {flagged.length > 0 ? " Crosses: points flagged as outliers (still part of the fit)." : ""}
        {band.lower ? ` Shaded: 95 % confidence band of the ${fitName}.` : ""}
        {reportedLine.length ? " Dashed: the expression the authors report, over its stated range (else the data's)." : ""}
        {withBars ? " Bars: the stated ±1σ of each point." : ""}
        {tableLink && (
          <>
            {" "}
            <a href={tableLink}>
              {dataTableHref
                ? "Every point as a table, with its residual"
                : thinned
                  ? "All points, with fitted values and residuals, as a download"
                  : "The plotted points as a table"}
            </a>
            .
          </>
        )}
      </figcaption>
      {ownTable && (
        <details className="text-sm" id={tableId}>
          <summary className="cursor-pointer text-link">The plotted points as a table</summary>
          <ScrollRegion label="Plotted points" scrollClassName="max-h-80 overflow-auto">
            <table className="table">
              <thead>
                <tr>
                  <th scope="col">T (K)</th>
                  <th scope="col">1000/T (K⁻¹)</th>
                  <th scope="col">ln k</th>
                  {withBars && <th scope="col">σ(ln k)</th>}
                  <th scope="col">Flag</th>
                </tr>
              </thead>
              <tbody>
                {points.map((p, i) => (
                  <tr key={i}>
                    <td>{formatSignificant(p.T, 5)}</td>
                    <td>{formatSignificant(1000 / p.T, 5)}</td>
                    <td>{formatSignificant(p.lnk, 5)}</td>
                    {withBars && <td>{p.sigmaLnK ? formatSignificant(p.sigmaLnK, 3) : ""}</td>}
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
