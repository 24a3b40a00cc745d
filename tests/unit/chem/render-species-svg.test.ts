import { describe, expect, it } from "vitest";
import { ChemError, renderSpeciesSvg } from "@/lib/chem";
import { drawingCacheStats } from "@/lib/chem/render-species-svg";

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

  it("draws a species once per size: the same SMILES and size again is answered from memory; a refusal is not kept", async () => {
    const first = await renderSpeciesSvg("OC(=O)CCl", { width: 140, height: 100 });
    const { hits, misses } = drawingCacheStats;
    expect(await renderSpeciesSvg("OC(=O)CCl", { width: 140, height: 100 })).toBe(first);
    expect(drawingCacheStats.hits).toBe(hits + 1);
    const larger = await renderSpeciesSvg("OC(=O)CCl", { width: 240, height: 180 });
    expect(drawingCacheStats.misses).toBe(misses + 1);
    expect(larger).toContain("width='240px'");
    await expect(renderSpeciesSvg("C1CC")).rejects.toBeInstanceOf(ChemError);
    const entries = drawingCacheStats.entries;
    await expect(renderSpeciesSvg("C1CC")).rejects.toBeInstanceOf(ChemError);
    expect(drawingCacheStats.entries).toBe(entries);
  });
});
