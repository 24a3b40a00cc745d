import { describe, expect, it } from "vitest";
import { comparisonCell } from "@/components/consensus-report";
import type { ConsensusMember } from "@/lib/kinetics";

/** A constructed member that is off at one comparison temperature by the given log10 ratio. */
const member = (log10Ratio: number) =>
  ({
    included: true,
    leftOut: null,
    disagreement: { range: { Tmin: 250, Tmax: 400 }, off: true, points: [{ T: 300.2, z: -4.2, log10Ratio, agrees: false }] },
  }) as unknown as ConsensusMember;

describe("comparisonCell", () => {
  it("writes the factor with true signs and exponents, never ×1.00", () => {
    expect(comparisonCell(member(-0.5))).toBe("off: ×3.2 below at 300 K");
    expect(comparisonCell(member(0.001))).toBe("off: the same to three digits at 300 K");
    expect(comparisonCell(member(5.35))).toBe("off: ×2.2e5 above at 300 K");
    expect(comparisonCell(member(-400.35))).toBe("off: ×2.2e400 below at 300 K");
  });
});
