import { describe, expect, it } from "vitest";
import { ChemError, checkBalance, describeSpecies } from "@/lib/chem";

const species = (elements: Record<string, number>, charge = 0, coefficient = 1) => ({ elements, charge, coefficient });

describe("checkBalance with species read by describeSpecies", () => {
  it("finds OH + CH4 → H2O + CH3 balanced", async () => {
    const [oh, ch4, h2o, ch3] = await Promise.all(["[OH]", "C", "O", "[CH3]"].map((smiles) => describeSpecies({ smiles })));
    const withCoefficient = (s: typeof oh) => ({ ...s, coefficient: 1 });
    const result = checkBalance({ reactants: [oh, ch4].map(withCoefficient), products: [h2o, ch3].map(withCoefficient) });
    expect(result).toEqual({
      balanced: true,
      elementDifferences: {},
      chargeDifference: 0,
      message: "Balanced: every element and the net charge agree on both sides.",
    });
  });

  it("finds OH + CH4 → H2O + CH4 off by one H", async () => {
    const [oh, ch4, h2o] = await Promise.all(["[OH]", "C", "O"].map((smiles) => describeSpecies({ smiles })));
    const result = checkBalance({
      reactants: [oh, ch4].map((s) => ({ ...s, coefficient: 1 })),
      products: [h2o, ch4].map((s) => ({ ...s, coefficient: 1 })),
    });
    expect(result.balanced).toBe(false);
    expect(result.elementDifferences).toEqual({ H: 1 });
    expect(result.message).toBe("Unbalanced: products have 1 more H than reactants");
  });
});

describe("checkBalance", () => {
  it("reports more and fewer atoms, products minus reactants", () => {
    // H2O → 2 H2: products have 4 H against 2, and no O against 1.
    const result = checkBalance({ reactants: [species({ H: 2, O: 1 })], products: [species({ H: 2 }, 0, 2)] });
    expect(result.balanced).toBe(false);
    expect(result.elementDifferences).toEqual({ H: 2, O: -1 });
    expect(result.chargeDifference).toBe(0);
    expect(result.message).toBe("Unbalanced: products have 2 more H and 1 fewer O than reactants");
  });

  it("lists elements in Hill order and charge last", () => {
    // CH4 + O2 → CO2 + H2O⁺: carbon balances; H, O and charge do not.
    const result = checkBalance({
      reactants: [species({ C: 1, H: 4 }), species({ O: 2 })],
      products: [species({ C: 1, O: 2 }), species({ H: 2, O: 1 }, 1)],
    });
    expect(result.elementDifferences).toEqual({ H: -2, O: 1 });
    expect(result.chargeDifference).toBe(1);
    expect(result.message).toBe("Unbalanced: products have 2 fewer H, 1 more O and a net charge 1 higher than reactants");
  });

  it("checks charge: OH⁻ + H⁺ → H2O balances, OH⁻ → OH does not", () => {
    expect(
      checkBalance({ reactants: [species({ H: 1, O: 1 }, -1), species({ H: 1 }, 1)], products: [species({ H: 2, O: 1 })] }).balanced,
    ).toBe(true);
    const result = checkBalance({ reactants: [species({ H: 1, O: 1 }, -1)], products: [species({ H: 1, O: 1 })] });
    expect(result.balanced).toBe(false);
    expect(result.elementDifferences).toEqual({});
    expect(result.chargeDifference).toBe(1);
    expect(result.message).toBe("Unbalanced: products have a net charge 1 higher than reactants");
  });

  it("weights by coefficients, fractional ones included", () => {
    // 2 H2 + O2 → 2 H2O and CO + ½ O2 → CO2.
    expect(
      checkBalance({ reactants: [species({ H: 2 }, 0, 2), species({ O: 2 })], products: [species({ H: 2, O: 1 }, 0, 2)] }).balanced,
    ).toBe(true);
    expect(
      checkBalance({ reactants: [species({ C: 1, O: 1 }), species({ O: 2 }, 0, 0.5)], products: [species({ C: 1, O: 2 })] }).balanced,
    ).toBe(true);
    // 0.1 + 0.2 of O2 against 0.3 of O2 is balanced despite floating point.
    expect(
      checkBalance({ reactants: [species({ O: 2 }, 0, 0.1), species({ O: 2 }, 0, 0.2)], products: [species({ O: 2 }, 0, 0.3)] }).balanced,
    ).toBe(true);
  });

  it("rejects a non-positive coefficient or a negative count", () => {
    expect(() => checkBalance({ reactants: [species({ H: 2 }, 0, 0)], products: [species({ H: 2 })] })).toThrow(ChemError);
    expect(() => checkBalance({ reactants: [species({ H: 2 })], products: [species({ H: -2 })] })).toThrow(/invalid count of H/);
  });
});
