import { createElement as h } from "react";
import { renderToStaticMarkup } from "react-dom/server";
import { describe, expect, it } from "vitest";
import { ConsensusPlot } from "@/components/consensus-plot";
import { plotPoints } from "@/lib/reactions/consensus-selection";
import { inFormWords } from "@/app/reactions/[id]/form-words";

// Constructed points (invented): ten temperatures, k = e^(−1000 K / T).
const points = [200, 220, 240, 260, 280, 300, 320, 340, 360, 380].map((T) => ({ T, k: Math.exp(-1000 / T) }));

describe("plotPoints: which points of a dataset the consensus uses", () => {
  it("splits off the points outside the window and the outliers of its own fit, saying why", () => {
    // Window 240–340 K keeps points 3–8; the engine's 2nd of those (point 4, 260 K) is an outlier.
    const out = plotPoints({ points }, { pointNumbers: [3, 4, 5, 6, 7, 8] }, { outliers: [1] });
    expect(out.points.map((p) => p.T)).toEqual([240, 280, 300, 320, 340]);
    expect(out.unused.map((p) => p.T)).toEqual([200, 220, 260, 360, 380]);
    expect(out.unusedWhy).toBe("outside the window or an outlier of its own fit");
    expect(out.points[0].lnk).toBeCloseTo(-1000 / 240, 12);
    expect(plotPoints({ points }, { pointNumbers: [1, 2, 3, 4, 5, 6, 7, 8, 9, 10] }, { outliers: [] })).toEqual({
      points: points.map((p) => ({ T: p.T, lnk: Math.log(p.k) })),
      unused: [],
      unusedWhy: "",
    });
    // A dataset the engine never saw is drawn whole.
    expect(plotPoints({ points }, undefined, undefined).unused).toEqual([]);
  });
});

describe("ConsensusPlot", () => {
  const series = (unused: { T: number; lnk: number }[], excluded = false) => [
    { label: "v1 · a", points: [{ T: 300, lnk: -3 }], unused, unusedWhy: "outside the window", excluded },
  ];

  it("says in words, not by colour alone, that faded points are not used", () => {
    const html = renderToStaticMarkup(h(ConsensusPlot, { series: series([{ T: 200, lnk: -5 }]), band: null, kUnitLabel: "s⁻¹" }));
    expect(html).toContain("1 point not used in the consensus drawn faded");
    expect(html).toContain("Faded markers with a dashed outline, in a dataset&#x27;s shape, are its points the consensus does not use");
  });

  it("says nothing of unused points when there are none, or when the whole dataset is left out", () => {
    for (const s of [series([]), series([{ T: 200, lnk: -5 }], true)]) {
      const html = renderToStaticMarkup(h(ConsensusPlot, { series: s, band: null, kUnitLabel: "s⁻¹" }));
      expect(html).not.toContain("not used in the consensus");
      expect(html).not.toContain("Faded markers");
    }
  });

  it("mentions a consensus line and band only when there is one", () => {
    const without = renderToStaticMarkup(h(ConsensusPlot, { series: series([]), band: null, kUnitLabel: "s⁻¹" }));
    expect(without).not.toContain("Shaded");
    expect(without).not.toContain("95 % band");
    expect(without).toContain("No consensus line");
    const band = { T: [250, 300, 350], lnk: [-4, -3, -2.5], lower: [-4.2, -3.1, -2.7], upper: [-3.8, -2.9, -2.3] };
    const withBand = renderToStaticMarkup(h(ConsensusPlot, { series: series([]), band, kUnitLabel: "s⁻¹", tableHref: "#list" }));
    expect(withBand).toContain("Dashed dark line: the consensus; shaded: its 95 % band");
    expect(withBand).toContain("with the consensus as a dashed line and its 95 % band");
    expect(withBand).toContain('href="#list"');
  });
});

describe("ConsensusChoiceForm words", () => {
  it("names the window's fields as the form labels them, not by their query names", () => {
    expect(inFormWords("Tmax (300 K) must be above Tmin (350 K)")).toBe("“To (K)” (300 K) must be above “From (K)” (350 K)");
    expect(inFormWords("Tmin must be a temperature in kelvin above zero")).toBe("“From (K)” must be a temperature in kelvin above zero");
  });
});

describe("ConsensusPlot error bars", () => {
  it("carries each point's stated uncertainty and says the bars are ±1σ only when some point has one", () => {
    const withSigma = plotPoints({ points: [{ T: 300, k: Math.exp(-3), sigmaLnK: 0.1 }] }, undefined, undefined);
    expect(withSigma.points[0]).toEqual({ T: 300, lnk: -3, sigmaLnK: 0.1 });
    const html = renderToStaticMarkup(
      h(ConsensusPlot, { series: [{ label: "v1 · a", points: withSigma.points }], band: null, kUnitLabel: "s⁻¹" }),
    );
    expect(html).toContain("error bars show the stated ±1σ");
    expect(html).toContain("Bars: the stated ±1σ of each point where its authors give one.");
    const plain = renderToStaticMarkup(
      h(ConsensusPlot, { series: [{ label: "v1 · a", points: [{ T: 300, lnk: -3 }] }], band: null, kUnitLabel: "s⁻¹" }),
    );
    expect(plain).not.toContain("±1σ");
  });
});
