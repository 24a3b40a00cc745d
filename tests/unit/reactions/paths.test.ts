import { describe, expect, it } from "vitest";
import { reactionKey } from "@/lib/chem";
import { reactionPath, reactionSegment, readReactionSegment } from "@/lib/reactions/paths";

const OH = "TUJKJAMUKRIRHC-UHFFFAOYSA-N";
const CH4 = "VNWKTOKETHGBQD-UHFFFAOYSA-N";
const H2O = "XLYOFNOQVPJJNP-UHFFFAOYSA-N";
const CH3 = "WCYWZMWISLQXQU-UHFFFAOYSA-N";

describe("the reaction page's address", () => {
  it("writes the key with ~ for >> and reads it back, from either form", () => {
    const key = reactionKey({
      reactants: [
        { inchiKey: OH, coefficient: 1 },
        { inchiKey: CH4, coefficient: 1 },
      ],
      products: [
        { inchiKey: H2O, coefficient: 1 },
        { inchiKey: CH3, coefficient: 1 },
      ],
    });
    expect(reactionPath(key)).toBe(`/reactions/${OH}+${CH4}~${CH3}+${H2O}`);
    expect(readReactionSegment(reactionSegment(key))).toEqual({ key });
    expect(readReactionSegment(key)).toEqual({ key });
    // Coefficients and an unknown product side.
    expect(readReactionSegment(`2*${CH3}~*`)).toEqual({ key: `2*${CH3}>>*` });
    expect(readReactionSegment(`0.5*${CH3}+${OH}~${H2O}`)).toEqual({ key: `0.5*${CH3}+${OH}>>${H2O}` });
  });

  it("reads a number as the id alias under the id rule, and anything else as nothing", () => {
    expect(readReactionSegment("42")).toEqual({ id: 42 });
    for (const bad of ["0", "042", "2147483648", "NOTAKEY", `${OH}`, `${OH}~`, `${OH}~${CH4}~${H2O}`, "<script>", ""]) {
      expect(readReactionSegment(bad), bad).toBeNull();
    }
  });
});
