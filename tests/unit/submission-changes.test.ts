import { describe, expect, it } from "vitest";
import { fieldLabel } from "@/components/submission-changes";

describe("fieldLabel", () => {
  it("names a changed field with the editor's words, list positions as written (from 1)", () => {
    expect(fieldLabel("description")).toBe("Title and summary, description");
    expect(fieldLabel("keywords › 1")).toBe("Title and summary, keyword 1");
    expect(fieldLabel("creators › 3 › orcid")).toBe("People, grants and links, person 3, ORCID");
    expect(fieldLabel("reportedFit › Tmin")).toBe("The authors' expression, valid from");
  });
});
