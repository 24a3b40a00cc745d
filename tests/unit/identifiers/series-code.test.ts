import { describe, expect, it } from "vitest";
import { checkSymbol, newSeriesCode, parseIdentifier, versionIdentifierOf } from "@/lib/identifiers/series-code";

// Worked by hand from Crockford's base32 page: value = Σ digit·32^i; check = value mod 37 in
// "0123456789ABCDEFGHJKMNPQRSTVWXYZ*~$=U".
describe("series codes", () => {
  it.each([
    [0, "ARH-0000-0000"],
    [1, "ARH-0000-0011"],
    [37, "ARH-0000-0150"], // 37 mod 37 = 0
  ])("value %i encodes with its check symbol", (value, expected) => {
    expect(newSeriesCode(value)).toBe(expected);
  });

  it("uses every check symbol, the five extra ones included", () => {
    expect([32, 33, 34, 35, 36, 37].map(checkSymbol)).toEqual(["*", "~", "$", "=", "U", "0"]);
    // 32^7 − 1 = 34 359 738 367; mod 37 = 34 359 738 367 − 37·928 641 577 = 18 → "J".
    expect(newSeriesCode(32 ** 7 - 1)).toBe("ARH-ZZZZ-ZZZJ");
  });

  it("never mints a check symbol outside the 32 digits and letters, yet reads codes minted with one", () => {
    for (const value of [32, 33, 34, 35, 36]) expect(() => newSeriesCode(value)).toThrow(RangeError);
    for (let i = 0; i < 2000; i++) expect(newSeriesCode()).toMatch(/^ARH-[0-9A-Z]{4}-[0-9A-Z]{4}$/);
    expect(parseIdentifier("10.5072/ARH-0000-010*")).toMatchObject({ ok: true, identifier: "10.5072/ARH-0000-010*" });
  });

  it("reads a resolver address whose double slash a path collapsed", () => {
    expect(parseIdentifier("https:/doi.org/10.5072/ARH-0000-0011/2")).toMatchObject({ ok: true, identifier: "10.5072/ARH-0000-0011/2" });
  });

  it("refuses values outside the code space", () => {
    expect(() => newSeriesCode(32 ** 7)).toThrow(RangeError);
    expect(() => newSeriesCode(-1)).toThrow(RangeError);
  });

  it("reads back every code it mints, as typed in any case, with or without hyphens and resolver", () => {
    for (const value of [0, 1, 31, 37, 1_000_003, 32 ** 7 - 1]) {
      const series = `10.5072/${newSeriesCode(value)}`;
      expect(parseIdentifier(series)).toMatchObject({ ok: true, kind: "series", identifier: series });
      expect(parseIdentifier(`doi:${series.toLowerCase()}`)).toMatchObject({ ok: true, identifier: series });
      expect(parseIdentifier(`https://doi.org/${series.replace(/-/g, "")}/4`)).toMatchObject({
        ok: true,
        kind: "version",
        identifier: `${series}/4`,
        series,
        version: 4,
      });
    }
  });

  it("reads I and L as 1 and O as 0, as Crockford's decoding does", () => {
    const series = `10.5072/${newSeriesCode(1)}`; // ARH-0000-0011
    expect(parseIdentifier("10.5072/arh-oooo-ooil")).toMatchObject({ ok: true, identifier: series });
  });

  it("says 'mistyped' for any one changed symbol and any swap of two different neighbours, before any lookup", () => {
    const code = newSeriesCode(123_456_790).slice(4).replace("-", ""); // 8 symbols
    const symbols = "0123456789ABCDEFGHJKMNPQRSTVWXYZ";
    let tried = 0;
    for (let i = 0; i < 7; i++) {
      for (const s of symbols) {
        if (s === code[i]) continue;
        const typo = code.slice(0, i) + s + code.slice(i + 1);
        expect(parseIdentifier(`10.5072/ARH-${typo.slice(0, 4)}-${typo.slice(4)}`)).toMatchObject({ ok: false, reason: "mistyped" });
        tried++;
      }
      if (i < 6 && code[i] !== code[i + 1]) {
        const swapped = code.slice(0, i) + code[i + 1] + code[i] + code.slice(i + 2);
        expect(parseIdentifier(`10.5072/ARH-${swapped.slice(0, 4)}-${swapped.slice(4)}`)).toMatchObject({ ok: false, reason: "mistyped" });
      }
    }
    expect(tried).toBe(7 * 31);
  });

  it("keeps identifiers minted before the codes readable", () => {
    expect(parseIdentifier("doi:10.5072/arrhenia.41.v1")).toEqual({
      ok: true,
      scheme: "legacy",
      kind: "version",
      identifier: "10.5072/arrhenia.41.v1",
    });
    expect(parseIdentifier("10.5072/arrhenia.41")).toMatchObject({ ok: true, kind: "series" });
    expect(versionIdentifierOf("10.5072/arrhenia.41", 2)).toBe("10.5072/arrhenia.41.v2");
  });

  it.each([
    "",
    "ARH-4F7K-9QXM",
    "10.5072/XYZ-4F7K-9QXM",
    "10.5072/ARH-4F7K",
    "10.5072/ARH-4F7K-9QXM/0",
    "10.5072/ARH-4F7K-9QXM/v2",
    "10.5072/%E0%A4%A",
  ])("%j is not one of our identifiers", (text) => {
    expect(parseIdentifier(text)).toMatchObject({ ok: false, reason: "malformed" });
  });
});
