import { describe, expect, it } from "vitest";
import { formatFixed, formatNumber, formatTenTo, formatRange, formatSignificant, formatWaiting } from "@/lib/format";

describe("formatSignificant", () => {
  it.each([
    [6.343733432497232e-15, 4, "6.344e\u221215"],
    [12.47169392722986, 4, "12.47"],
    [123456, 3, "1.23e5"],
    [190, 2, "190"],
    [2760, 3, "2760"],
    [0.04904, 4, "0.04904"],
    [1.001, 3, "1.00"],
    [-4.08e-7, 3, "\u22124.08e\u22127"],
    [0, 4, "0"],
    [null, 4, "—"],
    [Number.NaN, 4, "—"],
    [-0.5, 2, "\u22120.50"],
  ] as const)("%s to %i digits → %s", (v, d, out) => expect(formatSignificant(v, d)).toBe(out));
});

describe("formatRange", () => {
  it.each([
    // 25 K and 175.0 K in °C: both ends with the decimals of the larger one, a true minus, "to".
    [25 - 273.15, 175 - 273.15, "°C", "\u2212248.2 to \u221298.2 °C"],
    [-23.15, 126.85, "°C", "\u221223.2 to 126.9 °C"],
    [250, 400, "K", "250–400 K"],
    [298.15, 1500, "K", "298–1500 K"],
    [2.5, 12.25, "K", "2.50–12.25 K"],
    [300, 300.0001, "K", "300 K"],
    [null, 300, "K", "—"],
    [-0.04, 0.3, "°C", "\u22120.04 to 0.30 °C"],
  ] as const)("%s … %s %s → %s", (lo, hi, unit, out) => expect(formatRange(lo, hi, unit)).toBe(out));
});

describe("formatNumber", () => {
  it.each([
    [8.3e-11, "8.3e\u221211"],
    [8.174e-11, "8.174e\u221211"],
    [7.5, "7.5"],
    [298.15, "298.15"],
    [-23.15, "\u221223.15"],
    [250, "250"],
    [2.5e6, "2.5e6"],
    [0, "0"],
  ] as const)("%s → %s", (v, out) => expect(formatNumber(v)).toBe(out));
});

describe("formatFixed", () => {
  it.each([
    [-0.04, 1, "0.0"],
    [-1.44, 1, "\u22121.4"],
    [2.26, 2, "2.26"],
    [Number.NaN, 1, "—"],
  ] as const)("%s to %i decimals → %s", (v, d, out) => expect(formatFixed(v, d)).toBe(out));
});

describe("formatTenTo", () => {
  it.each([
    [2, 3, "100"],
    [-2, 3, "0.0100"],
    [5.35, 3, "2.24e5"],
    [-400.65, 3, "2.24e\u2212401"],
    [400.35, 2, "2.2e400"],
  ] as const)("10^%s to %i digits → %s", (v, d, out) => expect(formatTenTo(v, d)).toBe(out));
});

describe("formatWaiting", () => {
  const h = 3_600_000;
  it("says hours under a day, days and hours after, days alone from ten days on", () => {
    expect(formatWaiting(20 * 60_000)).toBe("under 1 h");
    expect(formatWaiting(3 * h + 59 * 60_000)).toBe("3 h");
    expect(formatWaiting(24 * h)).toBe("1 d");
    expect(formatWaiting(52 * h)).toBe("2 d 4 h");
    expect(formatWaiting(12 * 24 * h + 5 * h)).toBe("12 d");
  });
});
