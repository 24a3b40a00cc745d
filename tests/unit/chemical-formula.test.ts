import { createElement as h } from "react";
import { renderToStaticMarkup } from "react-dom/server";
import { describe, expect, it } from "vitest";
import { ChemicalFormula } from "@/components/chemical-formula";

const render = (formula: string) => renderToStaticMarkup(h(ChemicalFormula, { formula }));

describe("ChemicalFormula: counts as subscripts, charge as superscript (common practice of chemical notation)", () => {
  it("writes counts below the line and keeps the text the formula", () => {
    expect(render("CH4")).toBe("<span><span>C</span><span>H<sub>4</sub></span></span>");
    expect(render("HO")).toBe("<span><span>H</span><span>O</span></span>");
    expect(render("C2H5Cl").replace(/<[^>]+>/g, "")).toBe("C2H5Cl");
  });

  it("writes the charge as a superscript, size before sign", () => {
    expect(render("H4N+")).toContain("<sup>+</sup>");
    expect(render("O4S-2")).toContain("<sup>2-</sup>");
  });
});
