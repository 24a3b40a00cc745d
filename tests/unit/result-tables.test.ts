import { createElement as h } from "react";
import { renderToStaticMarkup } from "react-dom/server";
import { describe, expect, it } from "vitest";
import { ResultTables } from "@/components/result-tables";
import { drawableFit } from "@/lib/datasets/version-json";
import { formatSignificant } from "@/lib/format";
import { analyseDataset, convertEnergy, fromCanonicalRateConstant, GAS_CONSTANT, type AnalysisResult } from "@/lib/kinetics";

// Invented points at 1000–2000 K on a curved line (n = 2.5), so k(298.15 K) is an extrapolation and the curvature flag is raised.
const points = Array.from({ length: 10 }, (_, i) => {
  const T = 1000 + (1000 * i) / 9;
  return { T, k: 1e-14 * (T / 298.15) ** 2.5 * Math.exp(-5000 / (GAS_CONSTANT * T) + 0.01 * Math.sin(3 * i)) };
});

function render(analysis: AnalysisResult, energyUnit: string, temperatureUnit?: string) {
  return renderToStaticMarkup(
    h(ResultTables, {
      analysis,
      order: 2,
      kUnit: "cm3 molecule-1 s-1",
      kLabel: "cm³ molecule⁻¹ s⁻¹",
      energyUnit,
      convertK: (k: number) => fromCanonicalRateConstant(k, "cm3 molecule-1 s-1", 2),
      convertE: (e: number) => convertEnergy(e, "J mol-1", energyUnit),
      temperatureUnit,
      lineOf: (i: number) => i + 1,
    }),
  );
}

describe("ResultTables", () => {
  const analysis = analyseDataset({ points, order: 2 });

  it("marks k(298.15 K) as extrapolated, says how far, and shows k at mid-range beside it", () => {
    const html = render(analysis, "kJ mol-1");
    expect(analysis.arrhenius.k298.extrapolated).toBe(true);
    expect(html).toContain("(extrapolated)");
    expect(html).toContain("extrapolated: 702 K below the lowest measured temperature");
    expect(html).toContain("k(1333 K), middle of the range in 1/T");
    expect(html).toContain("SD of ln k residuals");
    expect(html).toContain("F (1, 7) / p");
  });

  it("writes the checks in the chosen energy and temperature units", () => {
    const flag = analysis.flags.find((f) => f.code === "curvature")!;
    const kcal = Number((flag.quantities!.eaLow.value / 4184).toPrecision(4));
    const html = render(analysis, "kcal mol-1", "degC");
    expect(html).toContain(`Ea(T) = Ea + nRT = ${kcal} kcal mol⁻¹ at 726.9 °C`);
    expect(html).not.toContain("kJ mol⁻¹ at");
  });

  it("draws an analysis stored by the previous engine (no kMid, no extrapolation, no quantities)", () => {
    const stored = JSON.parse(JSON.stringify(analysis));
    delete stored.arrhenius.kMid;
    delete stored.arrhenius.k298.extrapolated;
    delete stored.arrhenius.k298.extrapolation;
    delete stored.arrhenius.scaleFactor;
    delete stored.arrhenius.residualSDLnK;
    delete stored.curvature.dfNum;
    delete stored.curvature.dfDenom;
    for (const f of stored.flags) {
      delete f.quantities;
      f.message = "The Arrhenius plot is curved (F = 12, p = < 0.0001).";
    }
    const html = render(drawableFit(stored)!, "kcal mol-1");
    expect(html).toContain("(extrapolated)");
    expect(html).toContain("middle of the range in 1/T");
    expect(html).toContain("The Arrhenius plot is curved (F = 12, p &lt; 0.0001).");
  });
});

describe("ResultTables labels", () => {
  const analysis = analyseDataset({ points, order: 2 });

  it("names Ea as E/R when energies are shown in kelvin, never as 'K (E/R)' inside parentheses", () => {
    const html = render(analysis, "K");
    expect(html).toContain("Ea/R (K)");
    expect(html).toContain("ΔH‡/R (K)");
    expect(html).toContain("ΔS‡/R");
    expect(html).not.toContain("(E/R))");
  });

  it("writes ΔS‡ in the chosen energy unit per mol per K (thermochemical calorie, 4.184 J)", () => {
    const dS = analysis.eyring!.params.dS!;
    const html = render(analysis, "cal mol-1");
    expect(html).toContain("ΔS‡ (cal mol⁻¹ K⁻¹)");
    expect(html).not.toContain("J mol⁻¹ K⁻¹");
    expect(html).toContain(`<td>${formatSignificant(dS / 4.184, 4)}</td>`);
  });
});

describe("ResultTables residual spread", () => {
  // Invented points with stated σ(ln k) = 0.05, so the fit is weighted.
  const weighted = analyseDataset({ points: points.map((p) => ({ ...p, sigmaLnK: 0.2 })), order: 2 });

  it("names the weighted √(χ²/dof) as dimensionless and the SD of ln k residuals apart from it", () => {
    const html = render(weighted, "kJ mol-1");
    expect(weighted.weighted).toBe(true);
    // Plain words first, the technical name after: the unweighted SD is said to be unweighted.
    expect(html).toMatch(
      new RegExp(
        `Typical distance of a point from the line, unweighted <span[^>]*>\\(SD of ln k residuals\\)</span></td><td colSpan="2">${formatSignificant(weighted.arrhenius.residualSDLnK, 3)}<`,
      ),
    );
    expect(html).toMatch(/Scatter compared with the stated uncertainties <span[^>]*>\(√\(χ²\/dof\)\)<\/span>/);
    expect(html).toContain("dimensionless");
    expect(html).toContain(`data-testid="scale-factor">${formatSignificant(weighted.arrhenius.scaleFactor, 3)}<`);
  });

  it("shows no weighted quantity on an unweighted fit", () => {
    const html = render(analyseDataset({ points, order: 2 }), "kJ mol-1");
    expect(html).toMatch(/Typical distance of a point from the line <span[^>]*>\(SD of ln k residuals\)<\/span><\/td>/);
    expect(html).not.toContain("unweighted");
    expect(html).not.toContain("χ²/dof");
  });

  it("says under each weighted fit how its standard errors were made, and nothing for an unweighted fit", () => {
    // The same invented points with a stated 20 % (χ²/dof far below 1) and 0.2 % (far above).
    const loose = analyseDataset({ points: points.map((p) => ({ ...p, sigmaLnK: 0.2 })), order: 2 });
    expect(loose.arrhenius.scaleFactor!).toBeLessThan(1);
    expect(render(loose, "kJ mol-1")).toContain("The points scatter less than their stated uncertainties allow (√(χ²/dof) = ");
    const tight = analyseDataset({ points: points.map((p) => ({ ...p, sigmaLnK: 0.002 })), order: 2 });
    expect(tight.arrhenius.scaleFactor!).toBeGreaterThan(1);
    expect(render(tight, "kJ mol-1")).toContain("The points scatter more than their stated uncertainties allow (√(χ²/dof) = ");
    expect(render(analyseDataset({ points, order: 2 }), "kJ mol-1")).not.toContain("than their stated uncertainties allow");
  });
});

describe("ResultTables with no degrees of freedom", () => {
  it("says why the errors are missing when the line passes through both points", () => {
    const two = analyseDataset({ points: points.slice(0, 2), order: 2 });
    expect(two.arrhenius.dof).toBe(0);
    expect(render(two, "kJ mol-1")).toContain("the two parameters are fitted to two points");
    expect(render(analyseDataset({ points, order: 2 }), "kJ mol-1")).not.toContain("fitted to two points");
  });
});
