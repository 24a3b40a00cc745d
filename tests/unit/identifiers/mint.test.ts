import { afterEach, describe, expect, it } from "vitest";
import { DEFAULT_DOI_PREFIX, doiPrefix, isDoiSyntax, mintSeriesIdentifier, versionIdentifier } from "@/lib/identifiers/mint";
import { parseIdentifier } from "@/lib/identifiers/series-code";

describe("identifier syntax", () => {
  const saved = process.env.DOI_PREFIX;
  afterEach(() => {
    if (saved === undefined) delete process.env.DOI_PREFIX;
    else process.env.DOI_PREFIX = saved;
  });

  it("mints series and version identifiers in DOI syntax under the test prefix by default", () => {
    delete process.env.DOI_PREFIX;
    expect(doiPrefix()).toBe(DEFAULT_DOI_PREFIX);
    const series = mintSeriesIdentifier();
    expect(series).toMatch(/^10\.5072\/ARH-[0-9A-HJKMNP-TV-Z]{4}-[0-9A-HJKMNP-TV-Z]{3}[0-9A-HJKMNP-TV-Z*~$=U]$/);
    expect(versionIdentifier(series, 3)).toBe(`${series}/3`);
    expect(isDoiSyntax(series)).toBe(true);
    expect(isDoiSyntax(versionIdentifier(series, 3))).toBe(true);
    expect(parseIdentifier(series)).toMatchObject({ ok: true, kind: "series", identifier: series });
  });

  it("uses the configured prefix", () => {
    process.env.DOI_PREFIX = "10.99999";
    expect(mintSeriesIdentifier()).toMatch(/^10\.99999\/ARH-/);
  });

  it("draws a new code for every series, none telling how many datasets exist", () => {
    const codes = new Set(Array.from({ length: 200 }, () => mintSeriesIdentifier()));
    expect(codes.size).toBe(200);
  });

  it("keeps the form of a series minted before the codes for its later versions", () => {
    expect(versionIdentifier("10.5072/arrhenia.12", 3)).toBe("10.5072/arrhenia.12.v3");
  });

  // DOI syntax per the DOI Handbook, section 2.2: "10." + registrant code, "/", any suffix.
  it.each([
    ["10.1000/182", true],
    ["10.5072/ARH-4F7K-9QX3/1", true],
    ["10.1000.10/abc", true],
    ["10.12/abc", false],
    ["11.1000/abc", false],
    ["10.1000/", false],
    ["10.1000/has space", false],
    ["doi:10.1000/182", false],
  ])("isDoiSyntax(%s) = %s", (value, expected) => {
    expect(isDoiSyntax(value)).toBe(expected);
  });
});
