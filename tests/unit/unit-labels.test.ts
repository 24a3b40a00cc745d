import { describe, expect, it } from "vitest";
import { convertEntropy, energyQuantityLabel, entropyQuantityLabel } from "@/lib/unit-labels";
import { GAS_CONSTANT } from "@/lib/kinetics";

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
});
