import { describe, expect, it } from "vitest";
import { ChemError, renderSpeciesSvg } from "@/lib/chem";

describe("renderSpeciesSvg", () => {
  it("returns one inline-safe <svg> element of the asked size", async () => {
    const svg = await renderSpeciesSvg("[O][N]=O", { width: 200, height: 150 });
    expect(svg.startsWith("<svg") || svg.startsWith("<?xml")).toBe(true);
    expect(svg).toContain("</svg>");
    expect(svg.startsWith("<svg")).toBe(true); // the XML declaration is dropped for inlining
    expect(svg).toContain("width='200px'");
    expect(svg).toContain("height='150px'");
    expect(svg).not.toMatch(/<script|<foreignObject|\son[a-z]+=/i);
    expect(svg.match(/<svg/g)).toHaveLength(1);
  });

  it("draws with the default size when none is given", async () => {
    const svg = await renderSpeciesSvg("CCO");
    expect(svg).toContain("width='240px'");
    expect(svg).toContain("</svg>");
  });

  it("throws a ChemError for an unreadable SMILES or an unreasonable size", async () => {
    await expect(renderSpeciesSvg("C1CC")).rejects.toThrow(/Could not read the SMILES "C1CC" \(unclosed ring\?\)/);
    await expect(renderSpeciesSvg("C", { width: 0 })).rejects.toBeInstanceOf(ChemError);
    await expect(renderSpeciesSvg("C", { height: 1e6 })).rejects.toThrow(/from 16 to 2000/);
  });
});
