import { describe, expect, it } from "vitest";
import {
  describeComparison,
  describeFactor,
  describeSlope,
  describeT,
  describeVerdict,
  listTemperatures,
  lowerFirst,
  othersPossessive,
  type VerdictInput,
} from "@/lib/kinetics/consensus-words";

/** A comparison with three others, agreeing everywhere, to be varied per template. */
function input(over: Partial<VerdictInput> = {}, comparison: Partial<NonNullable<VerdictInput["comparison"]>> = {}): VerdictInput {
  return {
    name: "Dataset 7",
    own: { Tmin: 220, Tmax: 420 },
    leftOut: null,
    otherCount: 3,
    unitSuspect: null,
    comparison: {
      count: 3,
      othersRange: { Tmin: 200, Tmax: 2000 },
      restsOn: null,
      range: { Tmin: 220, Tmax: 420 },
      points: [
        { T: 220, log10Ratio: 0.02, agrees: true },
        { T: 289, log10Ratio: -0.01, agrees: true },
        { T: 420, log10Ratio: 0.03, agrees: true },
      ],
      off: false,
      activationEnergy: "same",
      factorChanges: false,
      meanOffsetLog10: 0.013,
      ...comparison,
    },
    ...over,
  };
}

const offPoints = [
  { T: 220, log10Ratio: Math.log10(4.8), agrees: false },
  { T: 289, log10Ratio: Math.log10(2), agrees: false },
  { T: 420, log10Ratio: 0.01, agrees: true },
];

describe("consensus words: the small parts", () => {
  it("writes factors with three digits below 2, two above, powers of ten for unit-size factors", () => {
    expect(describeFactor(Math.log10(1.04))).toBe("a factor 1.04 above");
    expect(describeFactor(-Math.log10(4.8))).toBe("a factor 4.8 below");
    expect(describeFactor(23.78)).toBe("a factor 10^23.78 above");
    expect(describeFactor(0)).toBe("a factor 1.00 above");
  });

  it("writes temperatures in whole kelvin above 100 K and three digits below, and lists them", () => {
    expect(describeT(298.15)).toBe("298 K");
    expect(describeT(77.355)).toBe("77.4 K");
    expect(listTemperatures([220])).toBe("220 K");
    expect(listTemperatures([220, 300])).toBe("220 and 300 K");
    expect(listTemperatures([220, 300, 420])).toBe("220, 300 and 420 K");
  });

  it("names every temperature: off ones with their factor, agreeing ones together", () => {
    expect(describeComparison(offPoints)).toBe("a factor 4.8 above at 220 K, a factor 2.0 above at 289 K; agrees at 420 K");
    expect(describeComparison(offPoints.slice(0, 2))).toBe("a factor 4.8 above at 220 K, a factor 2.0 above at 289 K");
  });

  it("says 'the other dataset's' with one other dataset and 'the others'' with several", () => {
    expect(othersPossessive(1)).toBe("the other dataset's");
    expect(othersPossessive(2)).toBe("the others'");
    expect(describeSlope("lower", 1)).toBe("its activation energy is lower than the other dataset's");
    expect(describeSlope("higher", 4)).toBe("its activation energy is higher than the others'");
  });

  it("says 'about the same factor throughout' only when the factor does not change along the range", () => {
    expect(describeSlope("same", 3, false)).toBe("about the same factor throughout: its activation energy agrees with the others'");
    expect(describeSlope("same", 3, true)).toBe(
      "the factor changes along its range, though not between its ends: its curvature differs from the others'",
    );
    expect(describeSlope("same", 3, null)).toBe("");
    expect(describeSlope(null, 3, false)).toBe("");
  });

  it("lowers only the default label inside a sentence", () => {
    expect(lowerFirst("Dataset 12")).toBe("dataset 12");
    expect(lowerFirst("“OH + CH4” (dataset 3)")).toBe("“OH + CH4” (dataset 3)");
  });
});

describe("consensus words: every verdict template under its condition", () => {
  it("no points inside the window", () => {
    expect(describeVerdict(input({ own: null, comparison: null }))).toBe("Dataset 7 has no points inside the temperature window.");
  });

  it("the only dataset in the consensus, and others at one temperature", () => {
    expect(describeVerdict(input({ otherCount: 0, comparison: null }))).toBe(
      "Dataset 7 is the only dataset in the consensus: there is nothing to compare it with.",
    );
    expect(describeVerdict(input({ otherCount: 2, comparison: null, leftOut: "by a curator (old calibration)" }))).toBe(
      "The other datasets alone cover a single temperature, so dataset 7 cannot be compared with them. Left out of the consensus: by a curator (old calibration).",
    );
  });

  it("a unit mistake, against the consensus it is left out of", () => {
    expect(
      describeVerdict(
        input(
          { unitSuspect: "a factor of N_A (molecule ↔ mol)", leftOut: "a likely unit mistake (a factor of N_A (molecule ↔ mol))" },
          { meanOffsetLog10: 23.8 },
        ),
      ),
    ).toBe(
      "Dataset 7 is a factor 10^23.80 above the consensus, close to a factor of N_A (molecule ↔ mol): check its units. Left out of the consensus: a likely unit mistake (a factor of N_A (molecule ↔ mol)).",
    );
  });

  it("no overlap: not compared, with both ranges", () => {
    expect(
      describeVerdict(input({ own: { Tmin: 800, Tmax: 1200 } }, { range: null, points: [], othersRange: { Tmin: 220, Tmax: 420 } })),
    ).toBe("Dataset 7 (800 K–1200 K) lies outside the temperatures of the consensus of the other 3 (220 K–420 K): not compared.");
  });

  it("agrees, with the largest difference; with a slope clause only when the slope test says so", () => {
    expect(describeVerdict(input())).toBe(
      "Dataset 7 agrees with the consensus of the other 3 within its uncertainty at 220, 289 and 420 K (largest difference a factor 1.07 above, at 420 K).",
    );
    expect(describeVerdict(input({ otherCount: 1 }, { count: 1, activationEnergy: "lower" }))).toBe(
      "Dataset 7 agrees with the only other dataset within its uncertainty at 220, 289 and 420 K (largest difference a factor 1.07 above, at 420 K), though its activation energy is lower than the other dataset's.",
    );
  });

  it("names the dataset the others' consensus rests on", () => {
    expect(describeVerdict(input({}, { restsOn: { name: "Dataset 3", share: 0.81 } }))).toMatch(
      /^Dataset 7 agrees with the consensus of the other 3 \(which rests 81 % on dataset 3 there\) within/,
    );
  });

  it("off, with a different activation energy", () => {
    expect(describeVerdict(input({}, { off: true, points: offPoints, activationEnergy: "lower", factorChanges: true }))).toBe(
      "Dataset 7 is off the consensus of the other 3: a factor 4.8 above at 220 K, a factor 2.0 above at 289 K; agrees at 420 K: its activation energy is lower than the others'.",
    );
  });

  it("off by a constant factor: 'about the same factor throughout', against one other dataset its own words", () => {
    const shifted = [220, 289, 420].map((T) => ({ T, log10Ratio: Math.log10(3), agrees: false }));
    expect(
      describeVerdict(input({ otherCount: 1 }, { count: 1, off: true, points: shifted, activationEnergy: "same", factorChanges: false })),
    ).toBe(
      "Dataset 7 is off the only other dataset: a factor 3.0 above at 220 K, a factor 3.0 above at 289 K, a factor 3.0 above at 420 K — about the same factor throughout: its activation energy agrees with the other dataset's.",
    );
  });

  it("off with the ends alike but the factor changing between them: never 'about the same factor'", () => {
    const bent = [
      { T: 220, log10Ratio: 0.3, agrees: false },
      { T: 289, log10Ratio: -0.2, agrees: false },
      { T: 420, log10Ratio: 0.3, agrees: false },
    ];
    const words = describeVerdict(input({}, { off: true, points: bent, activationEnergy: "same", factorChanges: true }));
    expect(words).not.toMatch(/same factor/);
    expect(words).toMatch(/ — the factor changes along its range, though not between its ends: its curvature differs from the others'\.$/);
  });

  it("off at its one temperature: no slope clause", () => {
    expect(
      describeVerdict(
        input({}, { off: true, points: [{ T: 298, log10Ratio: -0.5, agrees: false }], activationEnergy: null, factorChanges: null }),
      ),
    ).toBe("Dataset 7 is off the consensus of the other 3: a factor 3.2 below at 298 K.");
  });
});
