/**
 * Eyring parameters and the extrapolation distance of k(298.15 K) for datasets spanning 1 µK to
 * 1 K at 300 K. Reference values: tests/fixtures/narrow-window/reference.json, computed once with
 * mpmath 1.3.0 at 60 digits from the exact binary64 inputs it lists (its `source` names every call).
 */
import { describe, expect, it } from "vitest";
import reference from "@/tests/fixtures/narrow-window/reference.json";
import { analyseDataset } from "@/lib/kinetics/analyse-dataset";
import { extrapolationOf } from "@/lib/kinetics/extrapolation";

function relErr(value: number | null | undefined, exact: string): number {
  if (value === null || value === undefined || !Number.isFinite(value)) return Infinity;
  return Math.abs(value - Number(exact)) / Math.abs(Number(exact));
}

describe.each(reference.cases.map((c) => [c.width, c.order, c] as const))("window of %d K at 300 K, order %d", (_w, order, c) => {
  const r = analyseDataset({ order: order as 1 | 2, points: c.points });
  it("k(298.15 K) distance in 1/T widths to 1e-15 (differences of temperatures, not of reciprocals)", () => {
    expect(r.arrhenius.k298.extrapolated).toBe(true);
    expect(relErr(r.arrhenius.k298.extrapolation!.inverseTWidths, c.k298InverseTWidths)).toBeLessThan(1e-15);
  });
  it("Eyring ΔH‡ and ΔS‡ to the precision the data allow", () => {
    // Noise-free data (order 1 here): the slope is exact to rounding, 1e-14. With 1 % scatter in a
    // 1 mK window the slope is scatter over a 1e-11 span of 1/T, and 1e-12 is its own conditioning.
    const tol = order === 1 ? 1e-14 : 2e-12;
    expect(relErr(r.eyring!.params.dH, c.eyring.dH)).toBeLessThan(tol);
    expect(relErr(r.eyring!.params.dS, c.eyring.dS)).toBeLessThan(tol);
    if (order === 2) {
      // Standard errors only with real scatter: for noise-free data they are rounding noise.
      expect(relErr(r.eyring!.se.dH, c.eyring.seDH)).toBeLessThan(1e-12);
      expect(relErr(r.eyring!.se.dS, c.eyring.seDS)).toBeLessThan(1e-12);
    }
  });
});

describe("extrapolationOf", () => {
  it("is exact by construction for a 1 µK range: 2 K below a range [300, 300 + 2⁻²⁰] K", () => {
    // 1/298 − 1/300 = 2/(298·300); 1/300 − 1/(300 + δ) = δ/(300·(300 + δ)); δ = 2⁻²⁰ is exact.
    const d = 2 ** -20;
    const x = extrapolationOf(298, 300, 300 + d);
    const exact = (2 / (298 * 300)) * ((300 * (300 + d)) / d);
    expect(Math.abs(x.extrapolation!.inverseTWidths - exact) / exact).toBeLessThan(4e-16);
    expect(x.extrapolation!.kelvin).toBe(2);
  });
});
