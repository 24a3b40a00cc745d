import { describe, expect, it } from "vitest";
import { resolvedIdentifierPath, seriesPath, versionPath } from "@/lib/identifiers/paths";

describe("identifier paths", () => {
  it("a version resolves to its own page, a series to the dataset's", () => {
    expect(versionPath(41, 2)).toBe("/datasets/41/v2");
    expect(seriesPath(41)).toBe("/datasets/41");
    expect(resolvedIdentifierPath({ kind: "version", datasetId: 41, versionNumber: 2 })).toBe("/datasets/41/v2");
    expect(resolvedIdentifierPath({ kind: "series", datasetId: 41 })).toBe("/datasets/41");
  });
});
