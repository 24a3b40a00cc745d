"use client";

import { Area, CartesianGrid, ComposedChart, Legend, Line, ResponsiveContainer, Scatter, Tooltip, XAxis, YAxis } from "recharts";

export interface SeriesPoints {
  label: string;
  points: { T: number; lnk: number }[];
  /** Drawn hollow and grey when left out of the consensus (e.g. a suspected unit mistake). */
  excluded?: boolean;
  /** Off the consensus of the others somewhere in its range (named so in the legend). */
  off?: boolean;
  /**
   * Points of a dataset in the consensus that it does not use (outside the reader's temperature
   * window, or outliers of the dataset's own fit): drawn hollow and faded, named so in the legend.
   */
  unused?: { T: number; lnk: number }[];
  /** Why those points are not used, for the legend ("outside the window"). */
  unusedWhy?: string;
}

const shapes = ["circle", "square", "triangle", "diamond", "star", "cross", "wye"] as const;
const colours = ["#22537a", "#8f4419", "#1f6b3a", "#6b3fa0", "#8a5a00", "#0f6e73", "#7a2a4a"];

/** Every public dataset of a reaction on one Arrhenius plot, each with its own shape, and the consensus band. */
export function ConsensusPlot({
  series,
  band,
  kUnitLabel,
}: {
  series: SeriesPoints[];
  band: { T: number[]; lnk: number[]; lower: number[]; upper: number[] } | null;
  kUnitLabel: string;
}) {
  const xs = [...series.flatMap((s) => [...s.points, ...(s.unused ?? [])].map((p) => 1000 / p.T)), ...(band?.T.map((t) => 1000 / t) ?? [])];
  const unusedCount = series.reduce((n, s) => n + (s.excluded ? 0 : (s.unused?.length ?? 0)), 0);
  if (!xs.length) return null;
  const pad = (Math.max(...xs) - Math.min(...xs)) * 0.05 || 0.1;
  const domain: [number, number] = [Math.min(...xs) - pad, Math.max(...xs) + pad];
  const ticks = Array.from({ length: 6 }, (_, i) => Number((domain[0] + (i * (domain[1] - domain[0])) / 5).toPrecision(4)));
  const fit = band?.T.map((t, i) => ({ x: 1000 / t, fit: band.lnk[i], range: [band.lower[i], band.upper[i]] })) ?? [];
  return (
    <figure className="space-y-2">
      <div
        className="h-[28rem] w-full"
        role="img"
        aria-label={`Arrhenius plot of ${series.length} datasets${band ? " with the consensus fit and its 95 % band" : ""}${
          unusedCount ? `; ${unusedCount} point${unusedCount === 1 ? "" : "s"} not used in the consensus drawn hollow` : ""
        }`}
      >
        <ResponsiveContainer width="100%" height="100%">
          <ComposedChart margin={{ top: 28, right: 24, bottom: 28, left: 16 }}>
            <CartesianGrid stroke="#e6e1d6" />
            <XAxis
              xAxisId="inv"
              dataKey="x"
              type="number"
              domain={domain}
              ticks={ticks}
              allowDataOverflow
              tickFormatter={(v: number) => v.toFixed(2)}
              label={{ value: "1000 / T  (K⁻¹)", position: "bottom", offset: 8 }}
            />
            <XAxis
              xAxisId="T"
              dataKey="x"
              type="number"
              orientation="top"
              domain={domain}
              ticks={ticks}
              allowDataOverflow
              tickFormatter={(v: number) => (1000 / v).toFixed(0)}
              label={{ value: "T  (K)", position: "top", offset: 8 }}
            />
            <YAxis
              dataKey="y"
              type="number"
              domain={["auto", "auto"]}
              tickFormatter={(v: number) => v.toFixed(1)}
              width={80}
              label={{ value: `ln k  (k in ${kUnitLabel})`, angle: -90, position: "insideLeft", style: { textAnchor: "middle" } }}
            />
            <Tooltip
              formatter={(v) => (Array.isArray(v) ? v.map((x) => Number(x).toFixed(3)).join(" … ") : Number(v).toFixed(3))}
              labelFormatter={(x) => `T = ${(1000 / Number(x)).toFixed(1)} K`}
            />
            <Legend verticalAlign="bottom" wrapperStyle={{ paddingTop: 24 }} />
            {band && (
              <Area
                xAxisId="inv"
                data={fit}
                dataKey="range"
                name="consensus 95 % band"
                stroke="none"
                fill="#8f4419"
                fillOpacity={0.12}
                isAnimationActive={false}
              />
            )}
            {band && (
              <Line
                xAxisId="inv"
                data={fit}
                dataKey="fit"
                name="consensus"
                stroke="#8f4419"
                strokeWidth={2}
                dot={false}
                isAnimationActive={false}
              />
            )}
            {series.map((s, i) => (
              <Scatter
                key={s.label}
                xAxisId="inv"
                name={s.excluded ? `${s.label} (left out)` : s.off ? `${s.label} (off the others)` : s.label}
                data={(s.excluded ? [...s.points, ...(s.unused ?? [])] : s.points).map((p) => ({ x: 1000 / p.T, y: p.lnk }))}
                dataKey="y"
                shape={shapes[i % shapes.length]}
                fill={s.excluded ? "#9aa3ad" : colours[i % colours.length]}
                isAnimationActive={false}
              />
            ))}
            {series.map((s, i) =>
              !s.excluded && s.unused?.length ? (
                <Scatter
                  key={`${s.label} unused`}
                  xAxisId="inv"
                  name={`${s.label}: ${s.unused.length} point${s.unused.length === 1 ? "" : "s"} not used (${s.unusedWhy ?? "outside the window"}), hollow`}
                  data={s.unused.map((p) => ({ x: 1000 / p.T, y: p.lnk }))}
                  dataKey="y"
                  shape={shapes[i % shapes.length]}
                  fill={colours[i % colours.length]}
                  fillOpacity={0.1}
                  stroke={colours[i % colours.length]}
                  strokeOpacity={0.7}
                  strokeDasharray="2 1"
                  isAnimationActive={false}
                />
              ) : null,
            )}
          </ComposedChart>
        </ResponsiveContainer>
      </div>
      <figcaption className="text-xs text-muted">
        Each dataset has its own marker shape. Shaded: 95 % band of the consensus, including the spread between datasets, drawn only over
        the temperatures the datasets cover.
        {unusedCount > 0 &&
          " Hollow, faded markers of a dataset's shape are its points the consensus does not use: outside the chosen temperature window, or outliers of the dataset's own fit; the legend names them per dataset."}
      </figcaption>
    </figure>
  );
}
