import { describe, expect, it } from "vitest";
import { formatSignificant } from "@/lib/format";

describe("formatSignificant", () => {
  it.each([
    [6.343733432497232e-15, 4, "6.344e-15"],
    [12.47169392722986, 4, "12.47"],
    [123456, 3, "1.23e+5"],
    [0, 4, "0"],
    [null, 4, "—"],
    [Number.NaN, 4, "—"],
    [-0.5, 2, "-0.50"],
  ] as const)("%s to %i digits → %s", (v, d, out) => expect(formatSignificant(v, d)).toBe(out));
});
