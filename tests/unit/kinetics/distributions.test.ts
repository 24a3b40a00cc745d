import { describe, expect, it } from "vitest";
import jStat from "jstat";
import { bonferroniStudentT, quantileNormal, quantileStudentT, survivalChiSquare, survivalF, t95 } from "@/lib/kinetics/distributions";

describe("distribution functions", () => {
  // Source: NIST/SEMATECH e-Handbook of Statistical Methods, §1.3.6.7.2 (critical values of
  // Student's t), §1.3.6.7.3 (upper critical values of F), §1.3.6.7.4 (chi-square), 3 decimals.
  it.each([
    [1, 12.706],
    [2, 4.303],
    [5, 2.571],
    [10, 2.228],
    [30, 2.042],
    [100, 1.984],
  ])("t_{0.975, %i} = %d (e-Handbook table)", (dof, table) => {
    expect(t95(dof)).toBeCloseTo(table, 3);
  });
  it("upper-tail F and chi-square probabilities at e-Handbook critical values", () => {
    // F_{0.05}(1, 10) = 4.965; F_{0.05}(1, 20) = 4.351.
    expect(survivalF(4.965, 1, 10)).toBeCloseTo(0.05, 4);
    expect(survivalF(4.351, 1, 20)).toBeCloseTo(0.05, 4);
    // χ²_{0.01}(10) upper critical value 23.209; χ²_{0.05}(5) = 11.070.
    expect(survivalChiSquare(23.209, 10)).toBeCloseTo(0.01, 5);
    expect(survivalChiSquare(11.07, 5)).toBeCloseTo(0.05, 4);
  });
  it("is cached, and the Bonferroni bound is the upper quantile at α/(2n)", () => {
    expect(quantileStudentT(0.99, 7)).toBe(quantileStudentT(0.99, 7));
    // Reference: jstat 1.9.6 studentt.inv, good to ~1e-9 (a general-purpose library).
    expect(quantileStudentT(0.99, 7)).toBeCloseTo(jStat.studentt.inv(0.99, 7), 8);
    expect(quantileNormal(0.975)).toBeCloseTo(1.959963984540054, 12);
    // Bonferroni: n = 10 residuals, α = 0.05 → t_{1 − 0.0025, dof}.
    expect(bonferroniStudentT(0.05, 10, 7)).toBe(quantileStudentT(1 - 0.0025, 7));
  });
  it("t_{0.975,10} to the last digits of the exact value 2.228138851986274", () => {
    // Reference value: R 4.x qt(0.975, 10) = 2.228138851986274 (Hill's algorithm 396), from memory; mpmath checks are in tails.test.ts.
    expect(Math.abs(t95(10) - 2.228138851986274)).toBeLessThan(1e-14);
  });
  it("handles degenerate arguments without NaN", () => {
    expect(survivalF(0, 1, 5)).toBe(1);
    expect(survivalF(1e300, 1, 5)).toBe(0);
    expect(survivalChiSquare(0, 3)).toBe(1);
  });
});
