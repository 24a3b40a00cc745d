import { describe, expect, it } from "vitest";
import { createElement as h } from "react";
import { renderToStaticMarkup } from "react-dom/server";
import { PointTable } from "@/components/point-table";
import type { PointRow } from "@/lib/datasets/point-table";
import { convertEntropy, energyQuantityLabel, entropyQuantityLabel, quantityLabel, unitLabel, unitText } from "@/lib/unit-labels";
import { hitInFileUnits } from "@/lib/search/hit-units";
import type { DatasetHit, ReactionHit } from "@/lib/search/types";
import { GAS_CONSTANT } from "@/lib/kinetics";

describe("one spelling of a unit per medium: ASCII ids in files, superscripts on pages", () => {
  it.each([
    ["rateConstant", "cm³ molecule⁻¹ s⁻¹", "cm3 molecule-1 s-1", "cm³ molecule⁻¹ s⁻¹"],
    ["rateConstant", "cm3/molecule/s", "cm3 molecule-1 s-1", "cm³ molecule⁻¹ s⁻¹"],
    ["rateConstant", "s⁻¹", "s-1", "s⁻¹"],
    ["rateConstant", "cm⁶ molecule⁻² s⁻¹", "cm6 molecule-2 s-1", "cm⁶ molecule⁻² s⁻¹"],
    ["energy", "kJ/mol", "kJ mol-1", "kJ mol⁻¹"],
    ["temperature", "°C", "degC", "°C"],
  ] as const)("%s %s → file %s, page %s", (kind, stored, file, page) => {
    expect(unitText(kind, stored)).toBe(file);
    expect(unitLabel(kind, file)).toBe(page);
    // Every file spelling is plain ASCII.
    expect(file).toMatch(/^[\x20-\x7e]+$/);
  });

  it("gives an unknown unit back as it is, and nothing for nothing", () => {
    expect(unitText("rateConstant", "furlongs per fortnight")).toBe("furlongs per fortnight");
    expect(unitText("rateConstant", null)).toBeNull();
  });

  it("a search hit stored with a page label comes out in the file spelling", () => {
    expect(hitInFileUnits({ aUnit: "cm³ molecule⁻¹ s⁻¹" } as DatasetHit).aUnit).toBe("cm3 molecule-1 s-1");
    const reaction = { reactionKey: "x", consensus: { aUnit: "s⁻¹" } } as ReactionHit;
    expect(hitInFileUnits(reaction).consensus?.aUnit).toBe("s-1");
  });
});

describe("unit labels", () => {
  it("names energies once, and an energy shown as a temperature as E/R", () => {
    expect(energyQuantityLabel("Ea", "kcal mol-1")).toBe("Ea (kcal mol⁻¹)");
    expect(energyQuantityLabel("Ea", "K")).toBe("Ea/R (K)");
    expect(energyQuantityLabel("ΔH‡", "K (E/R)")).toBe("ΔH‡/R (K)");
    expect(energyQuantityLabel("Ea", "eV")).toBe("Ea (eV, per molecule)");
  });

  it("writes entropies in the chosen energy unit per kelvin", () => {
    // Entropies beside kJ and kcal are written per J and per cal: −49.04, not −0.04904.
    expect(entropyQuantityLabel("ΔS‡", "kcal mol-1")).toBe("ΔS‡ (cal mol⁻¹ K⁻¹)");
    expect(entropyQuantityLabel("ΔS‡", "kJ mol-1")).toBe("ΔS‡ (J mol⁻¹ K⁻¹)");
    expect(entropyQuantityLabel("ΔS‡", "cal mol-1")).toBe("ΔS‡ (cal mol⁻¹ K⁻¹)");
    expect(entropyQuantityLabel("ΔS‡", "K")).toBe("ΔS‡/R");
    expect(entropyQuantityLabel("ΔS‡", "eV")).toBe("ΔS‡ (eV K⁻¹, per molecule)");
  });

  it("converts entropies as energies per kelvin (thermochemical calorie = 4.184 J exactly)", () => {
    expect(convertEntropy(-41.84, "cal mol-1")).toBeCloseTo(-10, 12);
    expect(convertEntropy(-41.84, "kcal mol-1")).toBeCloseTo(-10, 12);
    expect(convertEntropy(-49.04, "kJ mol-1")).toBeCloseTo(-49.04, 12);
    expect(convertEntropy(GAS_CONSTANT * 3, "K")).toBeCloseTo(3, 12);
  });

  it("writes every unit with true superscripts, whatever spelling was stored; unknown text as given", () => {
    expect(unitLabel("rateConstant", "cm3 molecule-1 s-1")).toBe("cm³ molecule⁻¹ s⁻¹");
    expect(unitLabel("rateConstant", "cm3/molecule/s")).toBe("cm³ molecule⁻¹ s⁻¹");
    expect(unitLabel("rateConstant", "cm6 molecule-2 s-1")).toBe("cm⁶ molecule⁻² s⁻¹");
    expect(unitLabel("temperature", "degC")).toBe("°C");
    expect(unitLabel("pressure", "torr")).toBe("Torr");
    expect(unitLabel("pressure", "furlongs")).toBe("furlongs");
    expect(unitLabel("pressure", null)).toBe("");
    expect(quantityLabel("k as deposited", "rateConstant", "cm3 molecule-1 s-1")).toBe("k as deposited (cm³ molecule⁻¹ s⁻¹)");
  });
});

describe("the dataset page's data table", () => {
  // Two invented points deposited in °C, cm3 molecule-1 s-1 and Torr, with an absolute uncertainty in k's unit.
  const row = (i: number): PointRow => ({
    row: i + 1,
    T: 298.15 + 10 * i,
    k: 1e-12,
    sigmaLnK: 0.1,
    pressurePa: 13332.2,
    bathGas: "He",
    note: null,
    deposited: {
      T: 25 + 10 * i,
      TUnit: "degC",
      k: 1e-12,
      kUnit: "cm3 molecule-1 s-1",
      uncertainty: { kind: "absolute", value: 1e-13 },
      pressure: 100,
      pressureUnit: "Torr",
    },
    residualLnK: null,
    residualInSigma: null,
    marks: [],
  });

  it("writes every unit of its headers and cells with the one renderer: no plain-text exponents beside superscripts", () => {
    const html = renderToStaticMarkup(
      h(PointTable, {
        rows: [row(0), row(1)],
        totalRows: 2,
        kUnitLabel: "L mol⁻¹ s⁻¹",
        convertK: (k: number) => k,
        weighted: false,
        residualModelName: null,
        id: "data-table",
        downloadsHref: "#downloads",
      }),
    );
    expect(html).toContain("T as deposited (°C)");
    expect(html).toContain("k as deposited (cm³ molecule⁻¹ s⁻¹)");
    expect(html).toContain("k (L mol⁻¹ s⁻¹)");
    expect(html).toContain("Pressure (Torr)");
    expect(html).toMatch(/± 1(\.0+)?e−13 cm³ molecule⁻¹ s⁻¹|± 1(\.0+)? × 10/);
    // No unit id with plain exponents ("cm3", "molecule-1", "s-1") or "degC" anywhere in the table.
    expect(html).not.toMatch(/cm3|molecule-1|s-1|mol-1|degC/);
  });
});
