/**
 * Eyring ΔH‡ and ΔS‡ in microkelvin windows, where ln k changes by 1e-8 across the data. Reference:
 * tests/fixtures/eyring-microkelvin/reference.json, mpmath 1.3.0 at 50 digits on the same binary64
 * ln k the engine forms (its `source` names the call). ΔH‡ must also equal Ea − R·T_mid.
 */
import { describe, expect, it } from "vitest";
import reference from "@/tests/fixtures/eyring-microkelvin/reference.json";
import { analyseDataset } from "@/lib/kinetics/analyse-dataset";
import { GAS_CONSTANT } from "@/lib/kinetics/constants";

const rel = (v: number, exact: string) => Math.abs(v - Number(exact)) / Math.abs(Number(exact));

describe.each(reference.cases.map((c) => [c.name, c] as const))("Eyring fit, %s (mpmath 1.3 reference)", (_name, c) => {
  const r = analyseDataset({ order: 2, points: c.points });
  it("forms the same ln k doubles as the reference", () => {
    expect(c.points.map((p) => Math.log(p.k))).toEqual(c.lnk);
  });
  it("ΔH‡ and ΔS‡ to 1e-12 relative, as exact as the Arrhenius Ea", () => {
    expect(rel(r.arrhenius.params.Ea, c.arrheniusEa)).toBeLessThan(1e-13);
    expect(rel(r.eyring!.params.dH, c.eyring.dH)).toBeLessThan(1e-12);
    expect(rel(r.eyring!.params.dS, c.eyring.dS)).toBeLessThan(1e-12);
  });
  it("ΔH‡ = Ea − R·T_mid for a window this narrow", () => {
    const Tmid = (c.points[0].T + c.points[c.points.length - 1].T) / 2;
    expect(rel(r.eyring!.params.dH, String(r.arrhenius.params.Ea - GAS_CONSTANT * Tmid))).toBeLessThan(1e-9);
  });
});
