import { afterEach, describe, expect, it } from "vitest";
import { DEFAULT_DOI_PREFIX, doiPrefix, isDoiSyntax, seriesIdentifier, versionIdentifier } from "@/lib/identifiers/mint";

describe("identifier syntax", () => {
  const saved = process.env.DOI_PREFIX;
  afterEach(() => {
    if (saved === undefined) delete process.env.DOI_PREFIX;
    else process.env.DOI_PREFIX = saved;
  });

  it("mints version and series identifiers in DOI syntax under the test prefix by default", () => {
    delete process.env.DOI_PREFIX;
    expect(doiPrefix()).toBe(DEFAULT_DOI_PREFIX);
    expect(versionIdentifier(12, 3)).toBe("10.5072/arrhenia.12.v3");
    expect(seriesIdentifier(12)).toBe("10.5072/arrhenia.12");
    expect(isDoiSyntax(versionIdentifier(12, 3))).toBe(true);
    expect(isDoiSyntax(seriesIdentifier(12))).toBe(true);
  });

  it("uses the configured prefix", () => {
    process.env.DOI_PREFIX = "10.99999";
    expect(versionIdentifier(1, 1)).toBe("10.99999/arrhenia.1.v1");
    expect(seriesIdentifier(1)).toBe("10.99999/arrhenia.1");
  });

  it("gives every version its own identifier, distinct from the series", () => {
    const ids = new Set([
      seriesIdentifier(5),
      versionIdentifier(5, 1),
      versionIdentifier(5, 2),
      versionIdentifier(51, 1),
      seriesIdentifier(51),
    ]);
    expect(ids.size).toBe(5);
  });

  // DOI syntax per the DOI Handbook, section 2.2: "10." + registrant code, "/", any suffix.
  it.each([
    ["10.1000/182", true],
    ["10.5072/arrhenia.1.v1", true],
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
