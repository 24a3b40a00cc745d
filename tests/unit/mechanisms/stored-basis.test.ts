import { describe, expect, it } from "vitest";
import { comparisonBasisOf, judgeWithBasis } from "@/lib/mechanisms/judge";
import { readStoredBasis } from "@/lib/mechanisms/stored-basis";
import { GAS_CONSTANT } from "@/lib/kinetics/constants";

// Invented data: two datasets of one second-order reaction, k = 1e-12 exp(−1500 K/T), 250–400 K and 300–500 K.
const version = (versionId: number, Tmin: number, Tmax: number, factor: number) => ({
  versionId,
  datasetId: versionId,
  number: 1,
  title: `invented ${versionId}`,
  state: "published",
  versionIdentifier: null,
  payload: { method: { category: "experiment" }, reaction: { order: 2 } },
  points: Array.from({ length: 8 }, (_, i) => {
    const T = Tmin + ((Tmax - Tmin) * i) / 7;
    return { T, k: factor * 1e-12 * Math.exp(-1500 / T) * (1 + 0.02 * Math.sin(i * 1.7)), sigmaLnK: 0.05 };
  }),
  analysis: { flags: [] },
  tMin: Tmin,
  tMax: Tmax,
});
const versions = [version(1, 250, 400, 1), version(2, 300, 500, 1.03)];
const rate = { A: 1e-12, b: 0, Ea: 1500 * GAS_CONSTANT };
const window = { Tmin: 300, Tmax: 2500 };

describe("a kept comparison basis", () => {
  const basis = comparisonBasisOf({ versions, exclusions: [] });

  it("survives being stored as JSON and judges as the points do", () => {
    const stored = JSON.parse(JSON.stringify({ engine: "kinetics-test", ...basis }));
    const back = readStoredBasis(stored, "kinetics-test");
    expect(back).toEqual(basis);
    const viaBasis = judgeWithBasis({ index: 0, rate, order: 2 }, back!, window);
    const viaPoints = judgeWithBasis({ index: 0, rate, order: 2 }, comparisonBasisOf({ versions, exclusions: [] }), window);
    expect(viaBasis).toEqual(viaPoints);
    expect(viaBasis).toMatchObject({ verdict: "agrees", datasets: 2 });
    expect(viaBasis.extrapolated[0]).toMatchObject({ Tmin: 500, Tmax: 2500 });
  });

  it("is not used when another engine version wrote it or when it is not whole", () => {
    const stored = { engine: "kinetics-test", ...basis };
    expect(readStoredBasis(stored, "kinetics-other")).toBeNull();
    expect(readStoredBasis(null, "kinetics-test")).toBeNull();
    expect(readStoredBasis({ ...stored, basis: "guess" }, "kinetics-test")).toBeNull();
    expect(readStoredBasis({ ...stored, compared: [{ Tmin: "a", Tmax: 1 }] }, "kinetics-test")).toBeNull();
    expect(readStoredBasis({ ...stored, curve: { ...basis.curve, range: null } }, "kinetics-test")).toBeNull();
    expect(
      readStoredBasis(
        { ...stored, curve: { ...basis.curve!, arrhenius: { params: { lnA: 1, Ea: 1 }, band: { T: [1], lnk: ["x"], upper: [1] } } } },
        "kinetics-test",
      ),
    ).toBeNull();
  });

  it("keeps the band of the preferred model only", () => {
    const c = basis.curve!;
    const used = c.preferred === "modified_arrhenius" ? c.modifiedArrhenius!.band : c.arrhenius.band;
    expect(used.T.length).toBeGreaterThan(10);
    if (c.preferred === "arrhenius" && c.modifiedArrhenius) expect(c.modifiedArrhenius.band.T).toEqual([]);
  });

  it("says the data's order differs, without comparing", () => {
    expect(judgeWithBasis({ index: 3, rate, order: 1 }, basis, window)).toMatchObject({ verdict: "no_data", index: 3 });
  });
});
