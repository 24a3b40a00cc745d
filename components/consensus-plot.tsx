"use client";

import { formatRange } from "@/lib/format";
import { kScaleSymbol, onKScale, useKScale } from "./k-scale";
import { plotScale, temperatureTicks } from "./plot-scales";
import { usePlotWidth } from "./plot-width";
import { formatSignificant } from "@/lib/format";
import { Area, CartesianGrid, ComposedChart, ErrorBar, Line, ResponsiveContainer, Scatter, Symbols, Tooltip, XAxis, YAxis } from "recharts";

/** One point of a dataset: T in K, ln k, and the stated standard uncertainty of ln k when there is one. */
export interface SeriesPoint {
  T: number;
  lnk: number;
  sigmaLnK?: number;
}

export interface SeriesPoints {
  /** How the page names the dataset (the tooltip and a legend of few datasets). */
  label: string;
  /** A short name of the same dataset ("dataset 12"), which a legend of many datasets lists by marker. */
  shortLabel?: string;
  points: SeriesPoint[];
  /** Drawn grey when left out of the consensus (e.g. a suspected unit mistake). */
  excluded?: boolean;
  /** Off the consensus of the others somewhere in its range (named so in the legend). */
  off?: boolean;
  /** Why it is left out or off, in the consensus report's words (shown when its point is hovered). */
  note?: string;
  /**
   * Points of a dataset in the consensus that it does not use (outside the reader's temperature
   * window, or outliers of the dataset's own fit): drawn faded with a dashed outline, named so in the legend.
   */
  unused?: SeriesPoint[];
  /** Why those points are not used, for the legend ("outside the window"). */
  unusedWhy?: string;
}

const shapes = ["circle", "square", "triangle", "diamond", "star", "cross", "wye"] as const;
// Dataset colours; none is the consensus's ink, and the shape (then filled or hollow) tells datasets apart without colour.
const colours = ["#22537a", "#b5541c", "#1f6b3a", "#6b3fa0", "#8a5a00", "#0f6e73", "#a3365f"];
const CONSENSUS_INK = "#1b2430";
const LEFT_OUT_GREY = "#8a939e";
const BAND_GREY = "#9aa3ad";

/** The marker of the i-th dataset: shape, colour, and hollow from the eighth on, so 14 datasets look different in grey too. */
function markerOf(i: number) {
  return { shape: shapes[i % shapes.length], colour: colours[i % colours.length], hollow: Math.floor(i / shapes.length) % 2 === 1 };
}

/** How one kind of mark is painted: the plot's markers and the legend's icons are drawn from the same object. */
export interface MarkStyle {
  shape: (typeof shapes)[number];
  fill: string;
  fillOpacity: number;
  stroke: string;
  strokeOpacity: number;
  strokeWidth: number;
  strokeDasharray?: string;
}

/** The marks of the i-th dataset: its own points (grey when left out), and the points of it the consensus does not use (faded, with a dashed outline). */
export function markStyles(i: number, excluded: boolean): { points: MarkStyle; unused: MarkStyle } {
  const m = markerOf(i);
  const colour = excluded ? LEFT_OUT_GREY : m.colour;
  return {
    points: {
      shape: m.shape,
      fill: m.hollow ? "#ffffff" : colour,
      fillOpacity: 1,
      stroke: colour,
      strokeOpacity: 1,
      strokeWidth: m.hollow ? 1.5 : 0,
    },
    unused: {
      shape: m.shape,
      fill: m.colour,
      fillOpacity: 0.1,
      stroke: m.colour,
      strokeOpacity: 0.7,
      strokeWidth: 1,
      strokeDasharray: "2 1",
    },
  };
}

/** Scatter's default symbol area (recharts' ZAxis range [64, 64]): legend icons are drawn at the plot's own size. */
const MARK_AREA = 64;

/** One legend icon: the mark as the plot draws it (same shape, fill, opacity, outline, dash). */
export function MarkIcon({ style }: { style: MarkStyle }) {
  return (
    <svg width="16" height="16" viewBox="-8 -8 16 16" aria-hidden="true" className="shrink-0" data-mark={style.shape}>
      <Symbols
        cx={0}
        cy={0}
        type={style.shape}
        size={MARK_AREA}
        fill={style.fill}
        fillOpacity={style.fillOpacity}
        stroke={style.stroke}
        strokeOpacity={style.strokeOpacity}
        strokeWidth={style.strokeWidth}
        strokeDasharray={style.strokeDasharray}
      />
    </svg>
  );
}

type LegendEntry = { label: string } & ({ kind: "band" } | { kind: "line" } | { kind: "mark"; style: MarkStyle });

/** The legend under the plot, in HTML (it wraps at any width) with icons drawn as the plot draws each mark. */
function PlotLegend({ entries }: { entries: LegendEntry[] }) {
  return (
    <ul className="flex flex-wrap gap-x-4 gap-y-1 text-xs" aria-label="Legend of the plot" data-testid="plot-legend">
      {entries.map((e) => (
        <li key={`${e.kind} ${e.label}`} className="flex items-center gap-1.5">
          {e.kind === "mark" ? (
            <MarkIcon style={e.style} />
          ) : e.kind === "band" ? (
            <svg width="16" height="16" aria-hidden="true" className="shrink-0">
              <rect x="0" y="3" width="16" height="10" fill={BAND_GREY} fillOpacity={0.3} />
            </svg>
          ) : (
            <svg width="24" height="16" aria-hidden="true" className="shrink-0">
              <line x1="0" y1="8" x2="24" y2="8" stroke={CONSENSUS_INK} strokeWidth={2.5} strokeDasharray="8 4" />
            </svg>
          )}
          <span>{e.label}</span>
        </li>
      ))}
    </ul>
  );
}

/** Every public dataset of a reaction on one Arrhenius plot, each with its own shape, and the consensus band. */
export function ConsensusPlot({
  series,
  band,
  kUnitLabel,
  tableHref,
}: {
  series: SeriesPoints[];
  band: { T: number[]; lnk: number[]; lower: number[]; upper: number[] } | null;
  kUnitLabel: string;
  /** Where the same data are given as a table (the text alternative links to it). */
  tableHref?: string;
}) {
  const [scale, scaleControl] = useKScale();
  const { ref: plotRef, tickCount } = usePlotWidth<HTMLDivElement>();
  const yOf = (lnk: number) => onKScale(lnk, scale);
  const symbol = kScaleSymbol(scale);
  const xs = [...series.flatMap((s) => [...s.points, ...(s.unused ?? [])].map((p) => 1000 / p.T)), ...(band?.T.map((t) => 1000 / t) ?? [])];
  const unusedCount = series.reduce((n, s) => n + (s.excluded ? 0 : (s.unused?.length ?? 0)), 0);
  if (!xs.length) return null;
  // Fewer ticks on a narrow plot, so the labels of both x axes stay apart.
  const x = plotScale(Math.min(...xs), Math.max(...xs), Math.max(3, tickCount));
  const domain = x.domain;
  const topTicks = temperatureTicks(domain, tickCount);
  const ys = [
    ...series.flatMap((s) =>
      [...s.points, ...(s.unused ?? [])].flatMap((p) => (p.sigmaLnK ? [p.lnk - p.sigmaLnK, p.lnk + p.sigmaLnK] : [p.lnk])),
    ),
    ...(band ? [...band.lower, ...band.upper] : []),
  ]
    .map(yOf)
    .filter(Number.isFinite);
  const y = plotScale(Math.min(...ys), Math.max(...ys));
  const withBars = series.some((s) => [...s.points, ...(s.unused ?? [])].some((p) => p.sigmaLnK));
  const Ts = series.flatMap((s) => [...s.points, ...(s.unused ?? [])].map((p) => p.T));
  const summary = `Arrhenius plot, ${symbol} against 1000/T, of ${series.length} dataset${series.length === 1 ? "" : "s"} between ${formatRange(
    Math.min(...Ts),
    Math.max(...Ts),
    "K",
  )}${band ? ", with the consensus as a dashed line and its 95 % band" : ", without a consensus line"}${withBars ? "; error bars show the stated ±1σ" : ""}${
    unusedCount ? `; ${unusedCount} point${unusedCount === 1 ? "" : "s"} not used in the consensus drawn faded` : ""
  }.`;
  // What a hovered or focused point tells: its dataset, T and k (and the error bar's size).
  const drawn = (s: SeriesPoints, p: SeriesPoint) => ({
    x: 1000 / p.T,
    y: yOf(p.lnk),
    T: p.T,
    k: Math.exp(p.lnk),
    dataset: s.label,
    note: s.note,
    ...(p.sigmaLnK ? { err: yOf(p.sigmaLnK) } : {}),
  });
  const fit = band?.T.map((t, i) => ({ x: 1000 / t, fit: yOf(band.lnk[i]), range: [yOf(band.lower[i]), yOf(band.upper[i])] })) ?? [];
  return (
    <figure className="space-y-2">
      {scaleControl}
      <div ref={plotRef} className="h-[36rem] w-full sm:h-[28rem]" role="img" aria-label={summary}>
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
              tickFormatter={(v: number) => v.toFixed(x.decimals)}
              label={{ value: "1000 / T  (K⁻¹)", position: "bottom", offset: 8 }}
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
              width={72}
              label={{ value: `${symbol}  (k in ${kUnitLabel})`, angle: -90, position: "insideLeft", style: { textAnchor: "middle" } }}
            />
            <Tooltip content={<PointTip kUnitLabel={kUnitLabel} />} />
            {band && (
              <Area
                xAxisId="inv"
                data={fit}
                dataKey="range"
                name={BAND_NAME}
                stroke="none"
                fill={BAND_GREY}
                fillOpacity={0.3}
                legendType="none"
                isAnimationActive={false}
              />
            )}
            {band && (
              <Line
                xAxisId="inv"
                data={fit}
                dataKey="fit"
                name={LINE_NAME}
                stroke={CONSENSUS_INK}
                strokeWidth={2.5}
                strokeDasharray="8 4"
                legendType="none"
                dot={false}
                isAnimationActive={false}
              />
            )}
            {series.map((s, i) => {
              const style = markStyles(i, Boolean(s.excluded)).points;
              return (
                <Scatter
                  key={s.label}
                  xAxisId="inv"
                  name={seriesName(s)}
                  data={(s.excluded ? [...s.points, ...(s.unused ?? [])] : s.points).map((p) => drawn(s, p))}
                  dataKey="y"
                  legendType="none"
                  {...style}
                  isAnimationActive={false}
                >
                  {withBars && <ErrorBar dataKey="err" direction="y" stroke={style.stroke} width={3} />}
                </Scatter>
              );
            })}
            {series.map((s, i) => {
              if (s.excluded || !s.unused?.length) return null;
              const style = markStyles(i, false).unused;
              return (
                <Scatter
                  key={`${s.label} unused`}
                  xAxisId="inv"
                  name={unusedName(s)}
                  data={s.unused.map((p) => drawn(s, p))}
                  dataKey="y"
                  legendType="none"
                  {...style}
                  isAnimationActive={false}
                >
                  {withBars && <ErrorBar dataKey="err" direction="y" stroke={style.stroke} strokeOpacity={style.strokeOpacity} width={3} />}
                </Scatter>
              );
            })}
          </ComposedChart>
        </ResponsiveContainer>
      </div>
      <PlotLegend entries={legendEntries(series, Boolean(band))} />
      <figcaption className="text-xs text-muted">
        Each dataset has its own marker shape{series.length > shapes.length ? " (filled, then hollow)" : ""}.
        {band
          ? " Dashed dark line: the consensus; shaded: its 95 % band, including the spread between datasets, drawn only over the temperatures the datasets cover."
          : " No consensus line: this choice of data gives no consensus."}
        {withBars && " Bars: the stated ±1σ of each point where its authors give one."}
        {unusedCount > 0 &&
          " Faded markers with a dashed outline, in a dataset's shape, are its points the consensus does not use: outside the chosen temperature window, or outliers of the dataset's own fit; the legend names them per dataset."}
        {tableHref && (
          <>
            {" "}
            <a href={tableHref}>The same datasets as a table</a>.
          </>
        )}
      </figcaption>
    </figure>
  );
}

const BAND_NAME = "consensus 95 % band";
const LINE_NAME = "consensus (dashed)";
const seriesName = (s: SeriesPoints) => (s.excluded ? `${s.label} (left out)` : s.off ? `${s.label} (off the others)` : s.label);
const unusedName = (s: SeriesPoints) =>
  `${s.label}: ${s.unused?.length ?? 0} point${s.unused?.length === 1 ? "" : "s"} not used (${s.unusedWhy ?? "outside the window"}), drawn faded`;

/**
 * Above this many datasets the legend lists datasets by marker (one icon for each shape, colour and
 * state, followed by the datasets drawn so) instead of one icon per dataset: a reaction with hundreds
 * of datasets kept hundreds of icons, a third of its page.
 */
export const LEGEND_BY_MARKER_ABOVE = 2 * shapes.length;

/** The legend's entries in the order the plot draws them, each mark with the style it is drawn in. */
export function legendEntries(series: SeriesPoints[], withBand: boolean): LegendEntry[] {
  const bands: LegendEntry[] = withBand
    ? [
        { kind: "band" as const, label: BAND_NAME },
        { kind: "line" as const, label: LINE_NAME },
      ]
    : [];
  if (series.length > LEGEND_BY_MARKER_ABOVE) return [...bands, ...legendByMarker(series)];
  return [
    ...bands,
    ...series.map((s, i) => ({ kind: "mark" as const, label: seriesName(s), style: markStyles(i, Boolean(s.excluded)).points })),
    ...series.flatMap((s, i) =>
      !s.excluded && s.unused?.length ? [{ kind: "mark" as const, label: unusedName(s), style: markStyles(i, false).unused }] : [],
    ),
  ];
}

/** One entry per way of drawing (marker style and state), naming the datasets drawn that way, in the plot's order. */
function legendByMarker(series: SeriesPoints[]): LegendEntry[] {
  const groups = new Map<string, { style: MarkStyle; what: string; names: string[]; order: number }>();
  const add = (style: MarkStyle, what: string, name: string, order: number) => {
    const key = `${what}|${JSON.stringify(style)}`;
    const g = groups.get(key);
    if (g) g.names.push(name);
    else groups.set(key, { style, what, names: [name], order });
  };
  series.forEach((s, i) => {
    const name = s.shortLabel ?? s.label;
    const what = s.excluded ? "left out" : s.off ? "off the others" : "";
    add(markStyles(i, Boolean(s.excluded)).points, what, name, s.excluded ? 2 : s.off ? 1 : 0);
  });
  series.forEach((s, i) => {
    if (s.excluded || !s.unused?.length) return;
    add(markStyles(i, false).unused, `points not used (${s.unusedWhy ?? "outside the window"}), drawn faded`, s.shortLabel ?? s.label, 3);
  });
  return [...groups.values()]
    .sort((a, b) => a.order - b.order)
    .map((g) => ({ kind: "mark" as const, label: `${g.names.join(", ")}${g.what ? `: ${g.what}` : ""}`, style: g.style }));
}

/** The hovered (or keyboard-focused) point: its dataset, T and k; the consensus line's value elsewhere. */
function PointTip({
  active,
  payload,
  kUnitLabel,
}: {
  active?: boolean;
  payload?: readonly { name?: unknown; value?: unknown; payload?: Record<string, unknown> }[];
  kUnitLabel: string;
}) {
  if (!active || !payload?.length) return null;
  const point = payload.find((p) => typeof p.payload?.dataset === "string")?.payload;
  const body = point ? (
    <>
      <p className="font-medium">{String(point.dataset)}</p>
      <p>T = {formatSignificant(Number(point.T), 5)} K</p>
      <p>
        k = {formatSignificant(Number(point.k), 4)} {kUnitLabel}
      </p>
      {typeof point.err === "number" && <p>error bar ±{formatSignificant(Number(point.err), 2)} on the axis</p>}
      {typeof point.note === "string" && <p className="text-muted">{point.note}</p>}
    </>
  ) : (
    <p>T = {formatSignificant(1000 / Number(payload[0]?.payload?.x), 4)} K (consensus)</p>
  );
  return <div className="rounded-md border border-line bg-panel px-3 py-2 text-xs shadow-xs">{body}</div>;
}
