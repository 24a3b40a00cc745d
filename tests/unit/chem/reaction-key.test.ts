import { describe, expect, it } from "vitest";
import { ChemError, reactionKey } from "@/lib/chem";

// Standard InChIKeys (from memory; describe-species.test.ts checks them against RDKit).
const OH = "TUJKJAMUKRIRHC-UHFFFAOYSA-N";
const CH4 = "VNWKTOKETHGBQD-UHFFFAOYSA-N";
const H2O = "XLYOFNOQVPJJNP-UHFFFAOYSA-N";
const CH3 = "WCYWZMWISLQXQU-UHFFFAOYSA-N";
const O2 = "MYMOFIZGZYHOMD-UHFFFAOYSA-N";
const H2 = "UFHFLCQGNIYNRP-UHFFFAOYSA-N";

const one = (inchiKey: string, coefficient = 1) => ({ inchiKey, coefficient });

describe("reactionKey", () => {
  it("sorts InChIKeys on each side and joins the sides with >>", () => {
    expect(reactionKey({ reactants: [one(OH), one(CH4)], products: [one(H2O), one(CH3)] })).toBe(`${OH}+${CH4}>>${CH3}+${H2O}`);
  });

  it("gives the same key whatever order the species are listed in", () => {
    const reactants = [one(OH), one(CH4), one(O2, 2)];
    const products = [one(H2O), one(CH3), one(H2, 0.5)];
    const expected = reactionKey({ reactants, products });
    const permutations = [
      [reactants, products],
      [[...reactants].reverse(), products],
      [reactants, [...products].reverse()],
      [
        [reactants[1], reactants[2], reactants[0]],
        [products[2], products[0], products[1]],
      ],
    ];
    for (const [r, p] of permutations) expect(reactionKey({ reactants: r, products: p })).toBe(expected);
  });

  it("writes an undetermined product side as * only when the products are declared unknown", () => {
    expect(reactionKey({ reactants: [one(CH4), one(OH)], products: [] }, { productsUnknown: true })).toBe(`${OH}+${CH4}>>*`);
    expect(() => reactionKey({ reactants: [one(OH), one(CH4)], products: [] })).toThrow(/at least one species among its products/);
    const known = reactionKey({ reactants: [one(OH), one(CH4)], products: [one(H2O), one(CH3)] }, { productsUnknown: true });
    expect(known).toBe(`${OH}+${CH4}>>${CH3}+${H2O}`);
  });

  it("keeps direction: A + B → C and C → A + B are different reactions", () => {
    const forward = reactionKey({ reactants: [one(OH), one(CH4)], products: [one(H2O), one(CH3)] });
    const reverse = reactionKey({ reactants: [one(H2O), one(CH3)], products: [one(OH), one(CH4)] });
    expect(forward).not.toBe(reverse);
  });

  it("writes coefficients other than 1 and merges a species listed twice on one side", () => {
    const written = reactionKey({ reactants: [one(H2, 2), one(O2)], products: [one(H2O, 2)] });
    expect(written).toBe(`${O2}+2*${H2}>>2*${H2O}`);
    expect(reactionKey({ reactants: [one(H2), one(O2), one(H2)], products: [one(H2O), one(H2O)] })).toBe(written);
    expect(reactionKey({ reactants: [one(H2), one(O2, 0.5)], products: [one(H2O)] })).toBe(`0.5*${O2}+${H2}>>${H2O}`);
    // Floating-point dust from summing fractions does not change the key.
    expect(reactionKey({ reactants: [one(O2, 0.1), one(O2, 0.2)], products: [one(H2O)] })).toBe(`0.3*${O2}>>${H2O}`);
  });

  it("tells 2 A → B from A → B", () => {
    expect(reactionKey({ reactants: [one(CH3, 2)], products: [one(H2)] })).not.toBe(
      reactionKey({ reactants: [one(CH3)], products: [one(H2)] }),
    );
  });

  it.each([
    [{ reactants: [], products: [one(H2O)] }, "reactants", /at least one species among its reactants/],
    [{ reactants: [one(OH)], products: [] }, "products", /at least one species among its products/],
    [{ reactants: [one("not-a-key")], products: [one(H2O)] }, "reactants", /"not-a-key" among the reactants is not an InChIKey/],
    [{ reactants: [one(OH, 0)], products: [one(H2O)] }, "reactants", /must be a positive number, not 0/],
    [{ reactants: [one(OH)], products: [one(H2O, Number.NaN)] }, "products", /positive number, not NaN/],
  ])("rejects %j", (reaction, field, message) => {
    let caught: unknown;
    try {
      reactionKey(reaction);
    } catch (error) {
      caught = error;
    }
    expect(caught).toBeInstanceOf(ChemError);
    expect((caught as ChemError).code).toBe("invalid_reaction");
    expect((caught as ChemError).field).toBe(field);
    expect((caught as ChemError).message).toMatch(message);
  });
});
