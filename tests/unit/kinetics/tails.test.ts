/**
 * Exactness of the engine where doubles are hard: Student-t quantiles, upper-tail probabilities,
 * confidence limits in narrow windows, externally studentized residuals, extreme inputs.
 * Reference values: tests/fixtures/tails/reference.json, computed once with mpmath 1.3.0 at
 * 60 digits from the exact binary64 inputs it lists (its `source` field names every call).
 */
import { describe, expect, it } from "vitest";
import reference from "@/tests/fixtures/tails/reference.json";
import { quantileStudentT, survivalChiSquare, survivalF, t95, bonferroniStudentT } from "@/lib/kinetics/distributions";

function relErr(value: number | null | undefined, exact: string | number): number {
  const x = Number(exact);
  if (value === null || value === undefined || !Number.isFinite(value)) return Infinity;
  return Math.abs(value - x) / Math.abs(x);
}

describe("Student-t quantiles (reference: mpmath 1.3, 60 digits)", () => {
  it(`every fixture case (${reference.quantiles.length} of them, dof 1 … 1e6, p from 1e-300 to 1 − 1e-5 and Bonferroni levels) within 1e-13 relative`, () => {
    const worst = reference.quantiles
      .map((q) => ({ ...q, err: relErr(quantileStudentT(q.p, q.dof), q.t) }))
      .sort((a, b) => b.err - a.err)[0];
    expect(worst.err, `p = ${worst.p}, dof = ${worst.dof}`).toBeLessThan(1e-13);
  });
  it.each([
    [0.975, 903],
    [0.975, 19998],
    [0.975, 1],
    [0.975, 2],
    [0.975, 3],
    [0.975, 10],
    [0.975, 1000000],
    [1 - 1e-10, 8],
    [1 - 1e-10, 1000000],
  ])("t_{%d, %i} within 1e-14 relative", (p, dof) => {
    const ref = reference.quantiles.find((q) => q.p === p && q.dof === dof);
    expect(ref).toBeDefined();
    expect(relErr(quantileStudentT(p, dof), ref!.t)).toBeLessThan(1e-14);
  });
  it("t95 and the Bonferroni bound use the same exact quantile", () => {
    const ref = reference.quantiles.find((q) => q.p === 0.975 && q.dof === 19998)!;
    expect(relErr(t95(19998), ref.t)).toBeLessThan(1e-14);
    const bonf = reference.quantiles.find((q) => q.bonferroniN === 50 && q.dof === 7)!;
    expect(relErr(bonferroniStudentT(0.05, 50, 7), bonf.t)).toBeLessThan(1e-13);
  });
  it("is antisymmetric and 0 at the median", () => {
    expect(quantileStudentT(0.5, 4)).toBe(0);
    // 0.25 and 0.75 are each exact, so the two calls see the same tail.
    expect(quantileStudentT(0.25, 12)).toBe(-quantileStudentT(0.75, 12));
  });
});

describe("upper-tail probabilities computed directly (reference: mpmath 1.3 betainc / gammainc)", () => {
  it(`F survival, ${reference.fSurvival.length} cases down to 1e-300, within 1e-12 relative`, () => {
    for (const c of reference.fSurvival) expect(relErr(survivalF(c.f, c.d1, c.d2), c.p), `F = ${c.f}, d2 = ${c.d2}`).toBeLessThan(1e-12);
    expect(Math.min(...reference.fSurvival.map((c) => Number(c.p)))).toBeLessThan(1e-200);
  });
  it(`chi-square survival, ${reference.chiSquareSurvival.length} cases down to 1e-300, within 1e-12 relative`, () => {
    for (const c of reference.chiSquareSurvival)
      expect(relErr(survivalChiSquare(c.x, c.dof), c.p), `x = ${c.x}, dof = ${c.dof}`).toBeLessThan(1e-12);
    expect(Math.min(...reference.chiSquareSurvival.map((c) => Number(c.p)))).toBeLessThan(1e-250);
  });
});
