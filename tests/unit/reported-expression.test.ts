import { renderToStaticMarkup } from "react-dom/server";
import { createElement } from "react";
import { describe, expect, it } from "vitest";
import { ReportedExpression } from "@/components/reported-expression";
import { EXAMPLE_DEPOSIT } from "@/lib/deposits/example";
import { METHOD_CATEGORIES } from "@/lib/deposits/vocabulary";
import type { DepositDocument } from "@/lib/deposits/types";

const render = (doc: DepositDocument) => renderToStaticMarkup(createElement(ReportedExpression, { doc }));

describe("the reported expression", () => {
  it("states the formula once and the parameters as a table, with T0 stated", () => {
    const doc: DepositDocument = {
      ...structuredClone(EXAMPLE_DEPOSIT),
      reportedFit: { model: "modified_arrhenius", A: 2.45e-12, n: 1.5, Ea: 7.5, EaUnit: "kJ/mol", Tmin: 250, Tmax: 420 },
    };
    const html = render(doc);
    expect(html.match(/k\(T\) =/g)).toHaveLength(1);
    expect(html).toContain("<table");
    expect(html).toMatch(/<th scope="row"[^>]*>A<\/th><td[^>]*>2\.45e\u221212<\/td>/);
    expect(html).toMatch(/<th scope="row"[^>]*>n<\/th><td[^>]*>1\.5<\/td><td[^>]*>with T0 = 298\.15 K<\/td>/);
    expect(html).toMatch(/<th scope="row"[^>]*>Ea<\/th><td[^>]*>7\.5<\/td>/);
    expect(html).toMatch(/250–420/);
  });

  it("writes numbers as the rest of the page does: true minus, both ends of the range alike", () => {
    const doc: DepositDocument = {
      ...structuredClone(EXAMPLE_DEPOSIT),
      units: { ...EXAMPLE_DEPOSIT.units, T: "degC" },
      reportedFit: { model: "arrhenius", A: 8.3e-11, Ea: -1.25, EaUnit: "kJ/mol", Tmin: -23.15, Tmax: 126.85 },
    };
    const html = render(doc);
    expect(html).toContain("8.3e\u221211");
    expect(html).toContain("\u22121.25");
    expect(html).toContain("\u221223.2 to 126.9");
    expect(html.replace(/<[^>]*>/g, " ")).not.toMatch(/\d-\d|\de-/);
  });

  it("converts A and Ea to the units the reader chose", () => {
    const doc: DepositDocument = {
      ...structuredClone(EXAMPLE_DEPOSIT),
      reportedFit: { model: "arrhenius", A: 1e-11, Ea: 4.184, EaUnit: "kJ/mol" },
    };
    const html = createElement(ReportedExpression, { doc, kUnit: "cm3 mol-1 s-1", energyUnit: "kcal mol-1" });
    const text = renderToStaticMarkup(html);
    // 1e−11 cm³ molecule⁻¹ s⁻¹ × N_A (6.02214076e23, CODATA 2018) = 6.0221e12 cm³ mol⁻¹ s⁻¹; 4.184 kJ = 1 kcal.
    expect(text).toMatch(/>A<\/th><td[^>]*>6\.0221e12<\/td><td[^>]*>cm³ mol⁻¹ s⁻¹</);
    expect(text).toMatch(/>Ea<\/th><td[^>]*>1<\/td><td[^>]*>kcal mol⁻¹</);
  });

  it("shows nothing when the authors report no expression", () => {
    const doc = { ...structuredClone(EXAMPLE_DEPOSIT) };
    delete doc.reportedFit;
    expect(render(doc)).toBe("");
  });

  it("names method categories in our own words", () => {
    expect(METHOD_CATEGORIES.map((c) => c.label)).toEqual(["Measured", "Calculated", "Evaluated from other work"]);
  });
});
