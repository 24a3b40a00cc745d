import { describe, expect, it } from "vitest";
import { linearRegression } from "simple-statistics";
import { runAnalysisOrThrow, CAUTION } from "@/lib/analyses/analyse-request";
import { buildFitCsv, buildFitJson } from "@/lib/analyses/fit-export";
import { thinForDrawing } from "@/lib/analyses/thin-points";

// Invented points on ln k = ln A − (Ea/R)/T with a small alternating scatter.
const points = [250, 280, 310, 340, 370, 400].map((T, i) => ({ T, k: 2e-12 * Math.exp(-1500 / T) * (i % 2 ? 1.03 : 0.97) }));
const response = runAnalysisOrThrow({ points, order: 2 });
const input = {
  response,
  points,
  lines: [3, 4, 5, 7, 8, 9],
  order: 2 as const,
  kUnit: "cm3 molecule-1 s-1",
  TUnit: "K",
  energyUnit: "kJ mol-1",
};

describe("fit export", () => {
  it("CSV: the caution first, parameters with units, one row per point with its pasted line", () => {
    const csv = buildFitCsv(input).trim().split("\n");
    expect(csv[0]).toBe(`# ${CAUTION}`);
    const rows = csv.filter((l) => !l.startsWith("#"));
    expect(rows[0].split(",").slice(0, 6)).toEqual(["line", "T", "k", "sigma_ln_k", "arrhenius_fitted_k", "arrhenius_residual_ln_k"]);
    expect(rows.slice(1).map((r) => Number(r.split(",")[0]))).toEqual([3, 4, 5, 7, 8, 9]);
  });

  it("JSON: Ea in the chosen unit agrees with an ordinary least-squares line of ln k on 1/T (simple-statistics)", () => {
    const body = JSON.parse(buildFitJson(input));
    expect(body.caution).toBe(CAUTION);
    const { m, b } = linearRegression(points.map((p) => [1 / p.T, Math.log(p.k)]));
    const Ea = body.parameters.find((p: { name: string }) => p.name === "arrhenius.Ea");
    // CODATA 2018 R = 8.314462618 J mol⁻¹ K⁻¹; slope = −Ea/R.
    expect(Ea.unit).toBe("kJ mol-1");
    expect(Ea.value).toBeCloseTo((-m * 8.314462618) / 1000, 6);
    const lnA = body.parameters.find((p: { name: string }) => p.name === "arrhenius.lnA");
    expect(lnA.value).toBeCloseTo(b, 6);
    // Residual = ln k − fitted ln k, and the fitted k is exp(fitted ln k) in the same unit as k.
    for (const row of body.points) {
      expect(Math.log(row.k) - Math.log(row.arrhenius_fitted_k)).toBeCloseTo(row.arrhenius_residual_ln_k, 9);
    }
  });
});

describe("thinning for drawing", () => {
  it("keeps every point below the limit, and at most the limit plus the outliers above it, with the extremes", () => {
    const many = Array.from({ length: 10_000 }, (_, index) => ({
      x: index / 1000,
      y: Math.sin(index / 300) + (index === 5000 ? 40 : 0),
      index,
    }));
    expect(thinForDrawing(many.slice(0, 50), new Set())).toHaveLength(50);
    const drawn = thinForDrawing(many, new Set([17, 4242]), 500);
    expect(drawn.length).toBeLessThanOrEqual(500);
    const kept = new Set(drawn.map((p) => p.index));
    expect(kept.has(17) && kept.has(4242)).toBe(true);
    expect(kept.has(5000)).toBe(true); // the spike: LTTB keeps a bucket's largest triangle
    expect(kept.has(0) && kept.has(9999)).toBe(true); // first and last are always kept by LTTB
  });
});
