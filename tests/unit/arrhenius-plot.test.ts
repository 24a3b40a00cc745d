import { createElement as h } from "react";
import { renderToStaticMarkup } from "react-dom/server";
import { describe, expect, it } from "vitest";
import { ArrheniusPlot } from "@/components/arrhenius-plot";

// Constructed points (invented): k = e^(−1000 K / T), the third flagged.
const points = [250, 300, 350].map((T, i) => ({ T, lnk: -1000 / T, outlier: i === 2 }));
const band = { model: "arrhenius" as const, T: [250, 350], lnk: [-4, -1000 / 350], lower: null, upper: null };

describe("ArrheniusPlot text alternative", () => {
  it("summarises the plot in words and carries its points as a table", () => {
    const html = renderToStaticMarkup(h(ArrheniusPlot, { points, band, kUnitLabel: "s⁻¹" }));
    expect(html).toContain("Arrhenius plot, ln k against 1000/T, of 3 points between 250–350 K");
    expect(html).toContain("1 point flagged as outlier, drawn as crosses");
    expect(html).toContain("The plotted points as a table");
    expect(html).toContain("<td>3.3333</td>"); // 1000/300 K
    expect(html).toContain("<td>outlier</td>");
  });

  it("mentions a band only when there is one", () => {
    const without = renderToStaticMarkup(h(ArrheniusPlot, { points, band, kUnitLabel: "s⁻¹" }));
    expect(without).not.toContain("Shaded");
    const withBand = renderToStaticMarkup(
      h(ArrheniusPlot, { points, band: { ...band, lower: [-4.1, -2.9], upper: [-3.9, -2.8] }, kUnitLabel: "s⁻¹" }),
    );
    expect(withBand).toContain("Shaded: 95 % confidence band of the Arrhenius fit.");
  });
});
