import { describe, expect, it } from "vitest";
import {
  describeComparison,
  describeFactor,
  describeOffFactor,
  factorSize,
  describeSlope,
  middleBend,
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
  it("writes factors through the site's formatter: three significant digits, the exponent form for unit-size factors", () => {
    expect(describeFactor(Math.log10(1.04))).toBe("a factor 1.04 above");
    expect(describeFactor(-Math.log10(4.8))).toBe("a factor 4.80 below");
    // One rule on both sides of 2 and of 10: three significant digits.
    expect([1.994, 1.996, 2.004, 12.34].map((f) => describeFactor(Math.log10(f)))).toEqual([
      "a factor 1.99 above",
      "a factor 2.00 above",
      "a factor 2.00 above",
      "a factor 12.3 above",
    ]);
    // 10^23.78 = 6.0256e23 (common arithmetic), in lib/format.ts's exponent form with a true minus nowhere needed.
    expect(describeFactor(23.78)).toBe("a factor 6.03e23 above");
    expect(describeFactor(-400.35)).toBe("a factor 2.24e400 below");
    expect(factorSize(Math.log10(1.004))).toBe("1.00");
    // A factor that rounds to 1.00 reads as agreement, never "a factor 1.00 below".
    for (const l of [0, 0.0009, -0.0009]) expect(describeFactor(l)).toBe("the same to three digits");
    // Where a dataset is off by less than that, the difference is given in percent with its direction.
    expect(describeOffFactor(Math.log10(0.9977))).toBe("0.23 % below");
    expect(describeOffFactor(Math.log10(4.8))).toBe("a factor 4.80 above");
    // No number in the words is written by toPrecision/toFixed or as "10^x".
    for (const l of [0.5, 3.5, 23.78, -301.2]) expect(describeFactor(l)).not.toMatch(/\^|e\+/);
  });

  it("writes temperatures in whole kelvin above 100 K and three digits below, and lists them", () => {
    expect(describeT(298.15)).toBe("298 K");
    expect(describeT(77.355)).toBe("77.4 K");
    expect(listTemperatures([220])).toBe("220 K");
    expect(listTemperatures([220, 300])).toBe("220 and 300 K");
    expect(listTemperatures([220, 300, 420])).toBe("220, 300 and 420 K");
  });

  it("names every temperature: off ones with their factor, agreeing ones together", () => {
    expect(describeComparison(offPoints)).toBe("a factor 4.80 above at 220 K, a factor 2.00 above at 289 K; agrees at 420 K");
    expect(describeComparison(offPoints.slice(0, 2))).toBe("a factor 4.80 above at 220 K, a factor 2.00 above at 289 K");
  });

  it("says 'the other dataset's' with one other dataset and 'the others'' with several", () => {
    expect(othersPossessive(1)).toBe("the other dataset's");
    expect(othersPossessive(2)).toBe("the others'");
    expect(describeSlope({ activationEnergy: "lower", otherCount: 1, factorChanges: false })).toBe(
      "its activation energy is lower than the other dataset's",
    );
    expect(describeSlope({ activationEnergy: "higher", otherCount: 4, factorChanges: null })).toBe(
      "its activation energy is higher than the others'",
    );
  });

  it("says 'about the same factor throughout' only when off everywhere in one direction and the factor does not change", () => {
    const same = { activationEnergy: "same", otherCount: 3 } as const;
    expect(describeSlope({ ...same, factorChanges: false, offThroughout: true })).toBe(
      "about the same factor throughout: its activation energy agrees with the others'",
    );
    // The test not rejecting a constant factor is not enough when it agrees somewhere: the factors say it all.
    expect(describeSlope({ ...same, factorChanges: false, offThroughout: false })).toBe("");
    expect(describeSlope({ ...same, factorChanges: true })).toBe(
      "the factor changes along its range, though not between its ends: its curvature differs from the others'",
    );
    expect(describeSlope({ ...same, factorChanges: null, offThroughout: true })).toBe("");
    expect(describeSlope({ activationEnergy: null, otherCount: 3, factorChanges: false, offThroughout: true })).toBe("");
  });

  it("lets the curvature wording win over an end-to-end slope when the factor bends in the middle", () => {
    expect(describeSlope({ activationEnergy: "lower", otherCount: 2, factorChanges: true, bend: "higher" })).toBe(
      "its curvature differs from the others': higher in the middle of its range than at its ends",
    );
    // A bend without a significant change of factor is noise: the slope test speaks.
    expect(describeSlope({ activationEnergy: "lower", otherCount: 2, factorChanges: false, bend: "higher" })).toBe(
      "its activation energy is lower than the others'",
    );
  });

  it("finds a bend only where the middle leaves the line between the ends by more than the ends differ", () => {
    const at = (r: number[]) => [250, 308, 400, 571, 1000].map((T, i) => ({ T, log10Ratio: Math.log10(r[i]), agrees: true }));
    // Ends 1.053 and 0.966, middle up to 1.469 (a bulge): higher in the middle.
    expect(middleBend(at([1.053, 1.303, 1.469, 1.414, 0.966]))).toBe("higher");
    expect(middleBend(at([1.053, 0.8, 0.7, 0.75, 0.966]))).toBe("lower");
    // Linear in 1/T from ×5 to ×1: no bend.
    const tilt = [250, 308, 400, 571, 1000].map((T) => ({
      T,
      log10Ratio: Math.log10(5) * ((1 / T - 1 / 1000) / (1 / 250 - 1 / 1000)),
      agrees: true,
    }));
    expect(middleBend(tilt)).toBeNull();
    expect(middleBend(at([1.053, 1.303, 1.469, 1.414, 0.966]).slice(0, 2))).toBeNull();
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
      "Dataset 7 is a factor 6.31e23 above the consensus, close to a factor of N_A (molecule ↔ mol): check its units. Left out of the consensus: a likely unit mistake (a factor of N_A (molecule ↔ mol)).",
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

  it("calls the others' curve an extrapolation of a dataset where it is read outside that dataset's range", () => {
    const v = describeVerdict(input({}, { restsOn: { name: "Dataset d1", share: 0.74, T: 329, Tmin: 445, Tmax: 507, inRange: false } }));
    expect(v).toMatch(
      /^Dataset 7 agrees with the consensus of the other 3 \(which at 329 K is an extrapolation of dataset d1, measured at 445 K–507 K, with 74 % of its weight\) /,
    );
    expect(v).not.toContain("rests");
  });

  it("names the dataset the others' consensus rests on", () => {
    expect(describeVerdict(input({}, { restsOn: { name: "Dataset 3", share: 0.81 } }))).toMatch(
      /^Dataset 7 agrees with the consensus of the other 3 \(which rests 81 % on dataset 3 there\) within/,
    );
  });

  it("off, with a different activation energy", () => {
    expect(describeVerdict(input({}, { off: true, points: offPoints, activationEnergy: "lower", factorChanges: true }))).toBe(
      "Dataset 7 is off the consensus of the other 3: a factor 4.80 above at 220 K, a factor 2.00 above at 289 K; agrees at 420 K: its activation energy is lower than the others'.",
    );
  });

  it("off by a constant factor: 'about the same factor throughout', against one other dataset its own words", () => {
    const shifted = [220, 289, 420].map((T) => ({ T, log10Ratio: Math.log10(3), agrees: false }));
    expect(
      describeVerdict(input({ otherCount: 1 }, { count: 1, off: true, points: shifted, activationEnergy: "same", factorChanges: false })),
    ).toBe(
      "Dataset 7 is off the only other dataset: a factor 3.00 above at 220 K, a factor 3.00 above at 289 K, a factor 3.00 above at 420 K — about the same factor throughout: its activation energy agrees with the other dataset's.",
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
    expect(words).toMatch(/: its curvature differs from the others': lower in the middle of its range than at its ends\.$/);
  });

  it("off at one end and agreeing at the others: the factors alone, never 'about the same factor'", () => {
    const pts = [
      { T: 220, log10Ratio: Math.log10(1.339), agrees: false },
      { T: 284, log10Ratio: Math.log10(1.217), agrees: true },
      { T: 400, log10Ratio: Math.log10(1.083), agrees: true },
    ];
    expect(describeVerdict(input({}, { off: true, points: pts, activationEnergy: "same", factorChanges: false }))).toBe(
      "Dataset 7 is off the consensus of the other 3: a factor 1.34 above at 220 K; agrees at 284 and 400 K.",
    );
  });

  it("off with a bulge in the middle and ends alike: the curvature, not the activation energy", () => {
    const pts = [250, 308, 400, 571, 1000].map((T, i) => ({
      T,
      log10Ratio: Math.log10([1.053, 1.303, 1.469, 1.414, 0.966][i]),
      agrees: i === 0 || i === 4,
    }));
    expect(describeVerdict(input({}, { count: 2, off: true, points: pts, activationEnergy: "lower", factorChanges: true }))).toBe(
      "Dataset 7 is off the consensus of the other 2: a factor 1.30 above at 308 K, a factor 1.47 above at 400 K, a factor 1.41 above at 571 K; agrees at 250 and 1000 K: its curvature differs from the others': higher in the middle of its range than at its ends.",
    );
  });

  it("agreeing only within the spread between the others: says so, names the odd one out, compares with their consensus", () => {
    const pts = [
      { T: 220, log10Ratio: Math.log10(4.03), agrees: true },
      { T: 289, log10Ratio: Math.log10(1.2), agrees: true },
      { T: 420, log10Ratio: -Math.log10(1.5), agrees: true },
    ];
    const words = describeVerdict(
      input({ otherCount: 2 }, { count: 2, points: pts, activationEnergy: "lower", spread: { tau2: 0.486, offOthers: ["Dataset 3"] } }),
    );
    expect(words).toBe(
      "Dataset 7 agrees with the consensus of the other 2 at 220, 289 and 420 K (largest difference a factor 4.03 above, at 220 K) only within the wide spread between the others (τ² of the others = 0.49 in (ln k)², a factor 2.01 per standard deviation): they disagree with each other, and dataset 3 is off the consensus of the rest. Its activation energy is lower than the others' consensus.",
    );
    expect(words).not.toMatch(/within its uncertainty/);
  });

  it("off at its one temperature: no slope clause", () => {
    expect(
      describeVerdict(
        input({}, { off: true, points: [{ T: 298, log10Ratio: -0.5, agrees: false }], activationEnergy: null, factorChanges: null }),
      ),
    ).toBe("Dataset 7 is off the consensus of the other 3: a factor 3.16 below at 298 K.");
  });
});
