import { createElement as h } from "react";
import { renderToStaticMarkup } from "react-dom/server";
import { describe, expect, it } from "vitest";
import { ConsensusPlot, LEGEND_BY_MARKER_ABOVE, legendEntries, markStyles, type SeriesPoints } from "@/components/consensus-plot";
import {
  betweenDatasetWords,
  readerVerdict,
  CONSENSUS_COMPUTATION_WORDS,
  CONSENSUS_METHOD_WORDS,
  ConsensusComparisons,
  ConsensusSummary,
} from "@/components/consensus-report";
import { consensus } from "@/lib/kinetics";

// Invented datasets on k = 2e-12 exp(−1800 K / T) with a little scatter: eight of them, so the eighth is drawn hollow.
const truth = (T: number, wobble: number) => 2e-12 * Math.exp(-1800 / T) * Math.exp(0.04 * Math.sin(wobble));
const series = (n: number): SeriesPoints[] =>
  Array.from({ length: n }, (_, i) => ({
    label: `dataset ${i + 1}`,
    points: [250, 300, 350, 400].map((T, j) => ({ T, lnk: Math.log(truth(T, i + j)) })),
    ...(i === 1 ? { unused: [{ T: 450, lnk: Math.log(truth(450, 3)) }], unusedWhy: "outside the window" } : {}),
    ...(i === 2 ? { excluded: true } : {}),
  }));

/** The attributes of each legend icon's mark, in order. */
function legendMarks(html: string) {
  const legend = html.slice(html.indexOf('data-testid="plot-legend"'));
  return [...legend.matchAll(/<path[^>]*>/g)].map((m) => {
    const attr = (name: string) => new RegExp(`${name}="([^"]*)"`).exec(m[0])?.[1];
    return {
      fill: attr("fill"),
      fillOpacity: attr("fill-opacity"),
      stroke: attr("stroke"),
      strokeOpacity: attr("stroke-opacity"),
      strokeWidth: attr("stroke-width"),
      strokeDasharray: attr("stroke-dasharray"),
    };
  });
}

describe("the reaction page's plot legend", () => {
  it("draws every legend mark exactly as the plot draws it: hollow stays hollow, faded stays faded and dashed", () => {
    const s = series(8);
    const html = renderToStaticMarkup(h(ConsensusPlot, { series: s, band: null, kUnitLabel: "cm³ molecule⁻¹ s⁻¹" }));
    const entries = legendEntries(s, false);
    const marks = legendMarks(html);
    expect(marks).toHaveLength(entries.length);
    entries.forEach((e, i) => {
      if (e.kind !== "mark") return;
      expect(marks[i], e.label).toEqual({
        fill: e.style.fill,
        fillOpacity: String(e.style.fillOpacity),
        stroke: e.style.stroke,
        strokeOpacity: String(e.style.strokeOpacity),
        strokeWidth: String(e.style.strokeWidth),
        strokeDasharray: e.style.strokeDasharray,
      });
    });
    // The eighth dataset is hollow on the plot, so in the legend: a white inside and a coloured outline.
    const hollow = marks[entries.findIndex((e) => e.label === "dataset 8")];
    expect(hollow.fill).toBe("#ffffff");
    expect(Number(hollow.strokeWidth)).toBeGreaterThan(0);
    // The points the consensus does not use: faded fill, dashed outline, in the legend too.
    const unused = marks[entries.findIndex((e) => e.label.startsWith("dataset 2: 1 point not used"))];
    expect(unused).toMatchObject({ fillOpacity: "0.1", strokeDasharray: "2 1" });
    // The same objects paint the plot's markers (markStyles), so the two cannot drift apart.
    expect(markStyles(7, false).points.fill).toBe("#ffffff");
    expect(markStyles(2, true).points.stroke).toBe("#8a939e");
  });
});

describe("the legend of a reaction with many datasets", () => {
  it("lists the datasets drawn with each marker beside one icon, not one icon per dataset", () => {
    const n = 200;
    const s = series(n).map((x, i) => ({
      ...x,
      label: `“title ${i + 1}” (dataset ${i + 1})`,
      shortLabel: `dataset ${i + 1}`,
      ...(i === 5 ? { off: true } : {}),
    }));
    expect(n).toBeGreaterThan(LEGEND_BY_MARKER_ABOVE);
    const entries = legendEntries(s, true);
    // The band and the line, 14 markers (7 shapes filled then hollow), one of them also for the dataset off the others,
    // the left-out dataset in grey, the unused points of dataset 2.
    expect(entries.length).toBeLessThanOrEqual(2 + 14 + 3);
    const labels = entries.map((e) => e.label);
    expect(labels[2].startsWith("dataset 1, dataset 15, dataset 29, ")).toBe(true);
    expect(labels).toContain("dataset 3: left out");
    expect(labels).toContain("dataset 6: off the others");
    expect(labels).toContain("dataset 2: points not used (outside the window), drawn faded");
    // Every dataset is named exactly once among the markers of its own points.
    const named = entries
      .filter((e) => e.kind === "mark" && !e.label.includes("points not used"))
      .flatMap((e) => e.label.replace(/: .*$/, "").split(", "));
    expect(named.sort()).toEqual(s.map((x) => x.shortLabel).sort());
    // Each group is drawn in the style of the datasets it names (dataset 8 is the first hollow one).
    const hollow = entries.find((e) => e.label.startsWith("dataset 8, "));
    expect(hollow?.kind === "mark" && hollow.style).toEqual(markStyles(7, false).points);
    const html = renderToStaticMarkup(h(ConsensusPlot, { series: s, band: null, kUnitLabel: "cm³ molecule⁻¹ s⁻¹" }));
    expect(legendMarks(html)).toHaveLength(legendEntries(s, false).length);
  });
});

describe("the words under the reaction page's plot", () => {
  const sets = series(3).map((s, i) => ({
    id: String(i + 1),
    order: 2 as const,
    points: s.points.map((p) => ({ T: p.T, k: Math.exp(p.lnk) })),
  }));
  const result = consensus(sets);
  const labels = new Map(sets.map((d) => [d.id, `dataset ${d.id}`]));

  it("never write k with a combining hat (Chromium sets it beside the k) and say the method in plain words, technical names in brackets", () => {
    const html =
      renderToStaticMarkup(h(ConsensusSummary, { result, kUnitLabel: "cm³ molecule⁻¹ s⁻¹", labels, caution: "Caution." })) +
      renderToStaticMarkup(h(ConsensusComparisons, { result, labels }));
    expect(html).not.toMatch(/\u0302/);
    expect(html).toContain(CONSENSUS_METHOD_WORDS.replace(/'/g, "&#x27;"));
    // The engine's terse sentence stays in the API, not on the page.
    expect(html).not.toContain(result.method);
    // The sentence a reader reads has no statistics' names; the "How this is computed" note keeps them.
    expect(CONSENSUS_METHOD_WORDS).not.toMatch(/GLS|V_j|Q − dof|support temperatures|τ²|DerSimonian|least squares|I²/);
    expect(CONSENSUS_COMPUTATION_WORDS).toMatch(/between-dataset variance τ², estimated by the DerSimonian–Laird method/);
    expect(html).toContain("How this is computed");
  });

  it("say the between-dataset spread as a factor and a share, with τ² and I² only in the technical note", () => {
    // exp(√0.25) = exp(0.5) = 1.6487 (any table of e^x).
    expect(betweenDatasetWords({ tau2: 0.25, i2: 0.6 })).toBe(
      "Between-dataset spread: the datasets differ from one another by about a factor 1.65 (one standard deviation) beyond their own uncertainties; 60 % of their disagreement comes from this spread rather than from the uncertainties they state.",
    );
    expect(betweenDatasetWords({ tau2: 0, i2: 0 })).toMatch(/none beyond their own uncertainties/);
    expect(
      readerVerdict(
        "Set B agrees with the others' consensus at 300 K (×1.2) only within the wide spread between the others (τ² of the others = 0.41 in (ln k)², a factor 1.9 per standard deviation): they disagree with each other.",
      ),
    ).toBe(
      "Set B agrees with the others' consensus at 300 K (×1.2) only within the wide spread between the others (a factor 1.9 per standard deviation): they disagree with each other.",
    );
  });
});
