import { describe, expect, it } from "vitest";
import { buildAnalysisRequest, hashText, unfittableWords } from "@/components/deposit-editor/analysis-request";
import { blankPoint, type PointRow } from "@/components/deposit-editor/form-model";

const row = (T: string, k: string, extra: Partial<PointRow> = {}): PointRow => ({ ...blankPoint(), T, k, ...extra });

describe("buildAnalysisRequest", () => {
  it("posts the readable rows in the document's units and maps each back to its table row", () => {
    const built = buildAnalysisRequest([row("250", "2.09e-15"), row("", "3e-15"), row("280", "abc"), row("300", "6e-15")], 2, {
      k: "cm3 molecule-1 s-1",
      T: "K",
    });
    expect(built.body).toEqual({
      points: [
        { T: 250, k: 2.09e-15 },
        { T: 300, k: 6e-15 },
      ],
      order: 2,
      units: { k: "cm3 molecule-1 s-1", T: "K" },
    });
    expect(built.rows).toEqual([0, 3]);
    expect(built.skipped).toBe(2);
  });

  it("turns stated uncertainties into σ(ln k) as the stored analysis does: 8 % at 2σ → 0.04; factor 1.1 at 1σ → ln 1.1", () => {
    const built = buildAnalysisRequest(
      [
        row("300", "1e-12", { u: "8", uKind: "relative", uConfidence: "2sigma" }),
        row("350", "2e-12", { u: "1.1", uKind: "factor" }),
        row("400", "3e-12", { u: "0.9", uKind: "factor" }),
      ],
      2,
      { k: "cm3 molecule-1 s-1", T: "K" },
    );
    expect(built.body.points[0].sigmaLnK).toBeCloseTo(0.04, 12);
    expect(built.body.points[1].sigmaLnK).toBeCloseTo(Math.log(1.1), 12);
    // A factor below 1 is not an uncertainty; the row is fitted without a weight rather than refused.
    expect(built.body.points[2]).toEqual({ T: 400, k: 3e-12 });
  });
});

describe("rows no fit can take", () => {
  it("leaves out a temperature at or below absolute zero in its unit and a k that is not positive, and fits the rest", () => {
    const built = buildAnalysisRequest(
      [row("250", "2e-15"), row("-20", "3e-15"), row("300", "0"), row("-300", "4e-15"), row("350", "-1e-15"), row("400", "9e-15")],
      2,
      { k: "cm3 molecule-1 s-1", T: "K" },
    );
    expect(built.rows).toEqual([0, 5]);
    expect(built.unfittable).toEqual([1, 2, 3, 4]);
    expect(built.skipped).toBe(0);
    // In °C, −20 is 253.15 K and is fitted; −300 °C is below absolute zero.
    const celsius = buildAnalysisRequest([row("-20", "3e-15"), row("-300", "3e-15"), row("25", "5e-15")], 2, {
      k: "cm3 molecule-1 s-1",
      T: "degC",
    });
    expect(celsius.rows).toEqual([0, 2]);
    expect(celsius.unfittable).toEqual([1]);
  });

  it("names the rows once, as the table numbers them", () => {
    expect(unfittableWords([1])).toBe("Row 2 left out of the fit: its values cannot be fitted (the table says why).");
    expect(unfittableWords([1, 3])).toBe("Rows 2 and 4 left out of the fit: their values cannot be fitted (the table says why).");
    expect(unfittableWords([0, 1, 2, 3, 4, 5, 6])).toBe(
      "Rows 1, 2, 3, 4, 5 and 2 more left out of the fit: their values cannot be fitted (the table says why).",
    );
  });
});

describe("hashText", () => {
  it("differs for different bodies and is stable for the same one", () => {
    expect(hashText('{"a":1}')).toBe(hashText('{"a":1}'));
    expect(hashText('{"a":1}')).not.toBe(hashText('{"a":2}'));
  });
});
