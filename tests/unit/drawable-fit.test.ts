import { describe, expect, it } from "vitest";
import { drawableFit } from "@/lib/datasets/version-json";
import { analyseDataset } from "@/lib/kinetics";

describe("drawableFit: pages draw a stored analysis only when it holds a fit and its band", () => {
  it("keeps a full result of the engine", () => {
    // Invented points following E/R = 1500 K.
    const points = [250, 300, 350, 400].map((T) => ({ T, k: 1e-11 * Math.exp(-1500 / T) }));
    const result = analyseDataset({ points, order: 2 });
    expect(drawableFit(JSON.parse(JSON.stringify(result)))).not.toBeNull();
  });

  it("fills the fields an analysis stored before kinetics-2 lacks, so pages built for them still draw it", () => {
    // Invented points at 1000–2000 K (so k(298.15 K) is an extrapolation), weighted, with some scatter.
    const points = [1000, 1150, 1300, 1500, 1700, 2000].map((T, i) => ({
      T,
      k: 1e-11 * Math.exp(-15000 / T + 0.05 * Math.sin(i)),
      sigmaLnK: 0.05,
    }));
    const fresh = analyseDataset({ points, order: 1 });
    const stored = JSON.parse(JSON.stringify(fresh));
    for (const fit of [stored.arrhenius, stored.modifiedArrhenius]) {
      for (const key of ["scaleFactor", "residualSDLnK", "residuals", "fitted"]) delete fit[key];
    }
    delete stored.arrhenius.kMid;
    delete stored.arrhenius.k298.extrapolated;
    delete stored.arrhenius.k298.extrapolation;
    delete stored.curvature.dfNum;
    delete stored.curvature.dfDenom;
    for (const f of stored.flags) delete f.quantities;

    const drawn = drawableFit(stored)!;
    expect(drawn.arrhenius.k298).toEqual(fresh.arrhenius.k298);
    expect(drawn.arrhenius.kMid.T).toBe(fresh.arrhenius.kMid.T);
    for (const key of ["value", "lower", "upper"] as const)
      expect(drawn.arrhenius.kMid[key]! / fresh.arrhenius.kMid[key]!).toBeCloseTo(1, 9);
    expect(drawn.arrhenius.scaleFactor).toBe(fresh.arrhenius.scaleFactor);
    expect(drawn.arrhenius.residualSDLnK).toBeNull(); // not derivable from a weighted fit's stored numbers
    expect(drawn.arrhenius.residuals).toEqual([]);
    expect(drawn.modifiedArrhenius!.scaleFactor).toBe(fresh.modifiedArrhenius!.scaleFactor);
    expect(drawn.curvature).toEqual(fresh.curvature);
    // A current result passes unchanged.
    expect(drawableFit(JSON.parse(JSON.stringify(fresh)))).toEqual(JSON.parse(JSON.stringify(fresh)));
  });

  it.each([
    ["nothing", null],
    ["an empty object", {}],
    ["flags only", { flags: [] }],
    ["a fit without its band", { arrhenius: { params: { A: 1, Ea: 1 } } }],
  ])("refuses %s", (_what, stored) => {
    expect(drawableFit(stored)).toBeNull();
  });
});
