import { describe, expect, it } from "vitest";
import { comparisonCell, otherSideOf, pointsUsedWords, uncheckedWords } from "@/components/consensus-report";
import type { ConsensusMember, ConsensusResult } from "@/lib/kinetics";

/** A constructed member that is off at one comparison temperature by the given log10 ratio. */
const member = (log10Ratio: number) =>
  ({
    included: true,
    leftOut: null,
    disagreement: { range: { Tmin: 250, Tmax: 400 }, off: true, points: [{ T: 300.2, z: -4.2, log10Ratio, agrees: false }] },
  }) as unknown as ConsensusMember;

describe("comparisonCell", () => {
  it("writes the factor with true signs and exponents, never ×1.00", () => {
    // The engine's factorSize (lib/format.ts): 10^0.5 = 3.162…, 10^5.35 = 2.239e5 (common arithmetic).
    expect(comparisonCell(member(-0.5))).toBe("off: ×3.16 below at 300 K");
    expect(comparisonCell(member(0.001))).toBe("off: the same to three digits at 300 K");
    expect(comparisonCell(member(5.35))).toBe("off: ×2.24e5 above at 300 K");
    expect(comparisonCell(member(-400.35))).toBe("off: ×2.24e400 below at 300 K");
  });

  it("says a dataset that agrees only within a wide spread between the others is no plain agreement", () => {
    const within = (spread: { tau2: number; offOthers: string[] } | null) =>
      ({
        included: true,
        leftOut: null,
        disagreement: {
          range: { Tmin: 250, Tmax: 400 },
          off: false,
          agreesOnlyWithinSpread: spread !== null,
          points: [{ T: 300, z: 1.1, log10Ratio: 0.93, agrees: true }],
        },
      }) as unknown as ConsensusMember;
    expect(comparisonCell(within({ tau2: 2, offOthers: [] }))).toBe("only within a wide spread: ×8.51 above at 300 K");
    expect(comparisonCell(within(null))).toBe("agrees");
  });
});

describe("otherSideOf: what a dataset's k is divided by in its table", () => {
  const m = (id: string, comparedWith: number | null, included = true) =>
    ({ id, included, disagreement: comparedWith === null ? null : { comparedWith } }) as unknown as ConsensusMember;
  const labels = new Map([
    ["1", "“first” (dataset 1)"],
    ["2", "“second” (dataset 2)"],
  ]);

  it("names the one other dataset (its own fit) when only one other is in the consensus", () => {
    const result = { members: [m("1", 1), m("2", 1)] } as unknown as ConsensusResult;
    expect(otherSideOf(result, result.members[0], labels)).toEqual({ single: "“second” (dataset 2)" });
    expect(otherSideOf(result, result.members[1], labels)).toEqual({ single: "“first” (dataset 1)" });
  });

  it("names the one included dataset for a dataset left out of a consensus of one", () => {
    const result = { members: [m("1", 1), m("2", 1, false)] } as unknown as ConsensusResult;
    expect(otherSideOf(result, result.members[1], labels)).toEqual({ single: "“first” (dataset 1)" });
  });

  it("speaks of the others' consensus with two or more others", () => {
    const result = { members: [m("1", 2), m("2", 2), m("3", 2)] } as unknown as ConsensusResult;
    expect(otherSideOf(result, result.members[0], labels)).toEqual({ single: null });
  });
});

describe("pointsUsedWords and uncheckedWords: what a dataset's comparison rests on", () => {
  it("counts only the points its summary uses, and says why the rest are left out", () => {
    expect(pointsUsedWords({ n: 12, pointsGiven: 12, outliers: [] })).toBe("12 points");
    expect(pointsUsedWords({ n: 16, pointsGiven: 17, outliers: [4] })).toBe("16 of 17 points used (1 outlier of its own fit left out)");
    expect(pointsUsedWords({ n: 10, pointsGiven: 14, outliers: [1, 2] })).toBe(
      "10 of 14 points used (2 outliers of its own fit and 2 outside the temperatures chosen left out)",
    );
  });

  it("names the part of a dataset's range that the others do not cover", () => {
    const m = (Tmin: number, Tmax: number, range: { Tmin: number; Tmax: number } | null) =>
      ({ Tmin, Tmax, disagreement: range === null ? null : { range } }) as unknown as ConsensusMember;
    expect(uncheckedWords(m(200, 2000, { Tmin: 220, Tmax: 420 }))).toBe(
      "Compared only over 220–420 K, where the others have data: its part over 200–220 K and 420–2000 K is checked against nothing.",
    );
    expect(uncheckedWords(m(250, 400, { Tmin: 250, Tmax: 400 }))).toBeNull();
    expect(uncheckedWords(m(250, 400, { Tmin: 250.2, Tmax: 400 }))).toBeNull();
    expect(uncheckedWords(m(250, 400, null))).toBeNull();
  });
});
