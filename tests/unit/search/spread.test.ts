import { describe, expect, it } from "vitest";
import { GAS_CONSTANT } from "@/lib/kinetics/constants";
import { datasetSpread, preferredFitOf } from "@/lib/search/spread";

// Arithmetic of k = A (T/T0)^n exp(−Ea/RT) (the modified Arrhenius form, DESIGN's computation notes);
// the numbers are invented so that the factors come out round.

const straight = (A: number, Ea: number) => ({
  band: { model: "arrhenius" },
  arrhenius: { params: { lnA: Math.log(A), A, Ea } },
  modifiedArrhenius: null,
});
const curved = (arrheniusA: number, A: number, n: number, T0 = 300) => ({
  band: { model: "modified_arrhenius" },
  arrhenius: { params: { lnA: Math.log(arrheniusA), A: arrheniusA, Ea: 0 } },
  modifiedArrhenius: { params: { lnA: Math.log(A), A, n, Ea: 0, T0 } },
});
const on = (fit: ReturnType<typeof preferredFitOf>, tMin = 200, tMax = 600) =>
  fit ? { ...fit, aUnit: "cm³ molecule⁻¹ s⁻¹", tMin, tMax } : null;

describe("the reactions view's spread", () => {
  it("reads the fit each dataset's own analysis prefers", () => {
    expect(preferredFitOf(straight(1e-11, 1000))).toEqual({ lnA: Math.log(1e-11), n: 0, ea: 1000, t0: 298.15 });
    expect(preferredFitOf(curved(5e-11, 1e-12, 2))).toEqual({ lnA: Math.log(1e-12), n: 2, ea: 0, t0: 300 });
    // A modified fit the analysis does not prefer is not used.
    expect(preferredFitOf({ ...curved(5e-11, 1e-12, 2), band: { model: "arrhenius" } })).toMatchObject({ lnA: Math.log(5e-11), n: 0 });
    expect(preferredFitOf(null)).toBeNull();
    expect(preferredFitOf({ arrhenius: { params: { lnA: null, Ea: 1 } } })).toBeNull();
  });

  it("compares the preferred fits at the middle of the common range in 1/T", () => {
    // 1/Tmid = (1/200 + 1/600)/2 → Tmid = 300 K = T0, so the curved set gives k = 1e-12 there, not its straight line's 5e-11.
    const spread = datasetSpread([on(preferredFitOf(straight(1e-11, 0))), on(preferredFitOf(curved(5e-11, 1e-12, 2)))]);
    expect(spread).toBeCloseTo(10, 10);
    // With Ea: k ratio exp(ΔEa/(R·300)) for equal A.
    const withEa = datasetSpread([
      on(preferredFitOf(straight(1e-11, 0))),
      on(preferredFitOf(straight(1e-11, GAS_CONSTANT * 300 * Math.log(4)))),
    ]);
    expect(withEa).toBeCloseTo(4, 10);
  });

  it("needs two usable fits of one unit", () => {
    expect(datasetSpread([on(preferredFitOf(straight(1e-11, 0)))])).toBeNull();
    expect(datasetSpread([on(preferredFitOf(straight(1e-11, 0))), null])).toBeNull();
    expect(
      datasetSpread([on(preferredFitOf(straight(1e-11, 0))), { ...on(preferredFitOf(straight(1e-12, 0)))!, aUnit: "s⁻¹" }]),
    ).toBeNull();
  });
});
