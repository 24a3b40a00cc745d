import { describe, expect, it } from "vitest";
import { readerFlagMessage, technicalFlagNote } from "@/lib/flag-words";
import { analyseDataset } from "@/lib/kinetics";
import type { Flag } from "@/lib/kinetics/types";

// Invented points on an Arrhenius line (A = 1e-10 cm³ molecule⁻¹ s⁻¹, Ea = 10 kJ mol⁻¹; R from CODATA 2018)
// with one point a factor 3 high: the engine flags it as an outlier.
function flagsOf(): Flag[] {
  const R = 8.314462618;
  const points = Array.from({ length: 12 }, (_, i) => {
    const T = 250 + 25 * i;
    const k = 1e-10 * Math.exp(-10000 / (R * T)) * (1 + 0.02 * Math.sin(i * 7)) * (i === 5 ? 3 : 1);
    return { T, k };
  });
  return analyseDataset({ points, order: 2 }).flags;
}

describe("readerFlagMessage: a flag in a reader's words", () => {
  it("says an outlier in plain words; the test's name only in the technical note", () => {
    const outlier = flagsOf().find((f) => f.code === "outlier");
    expect(outlier, "the factor-3 point is flagged").toBeDefined();
    const plain = readerFlagMessage(outlier!);
    expect(plain).toMatch(/^Point 6 lies much farther from the (modified )?Arrhenius fit than the scatter of the other points allows/);
    expect(plain).not.toMatch(/studentized|Cook|Bonferroni|Student/);
    expect(technicalFlagNote(outlier!)).toMatch(/externally studentized residual/);
  });

  it("says an influential point plainly and keeps Cook's distance for the note", () => {
    const flag: Flag = {
      code: "influential_point",
      severity: "warn",
      message: "Point 3 weighs heavily … Cook's distance 1.2 …",
      points: [2],
      quantities: { coefficients: { kind: "count", value: 2 } },
    } as Flag;
    expect(readerFlagMessage(flag)).toBe(
      "Point 3 pulls the Arrhenius fit more than any other point should and lies off the line of the others: without it the fitted parameters would change noticeably.",
    );
    expect(technicalFlagNote(flag)).not.toBeNull();
  });

  it("leaves every other flag in the engine's own words, with no second note", () => {
    const flag = { code: "narrow_range", severity: "warn", message: "The range is narrow." } as Flag;
    expect(readerFlagMessage(flag)).toBe("The range is narrow.");
    expect(technicalFlagNote(flag)).toBeNull();
  });
});
