import { describe, expect, it } from "vitest";
import { decisionMail } from "@/lib/mail/templates";

describe("decision mail", () => {
  it("an acceptance names the version identifier and links the public page", () => {
    const m = decisionMail("a@b.invalid", "A", "OH + CH4", 7, "accept", "Consistent.", {
      identifier: "10.5072/arrhenia.3.v2",
      path: "/datasets/3/v2",
    });
    expect(m.subject).toBe("Decision on “OH + CH4”: accepted");
    expect(m.text).toContain("doi:10.5072/arrhenia.3.v2");
    expect(m.text).toMatch(/Open the published version: http:\/\/\S+\/datasets\/3\/v2/);
  });
  it("a return to the authors links the workspace and carries the reason", () => {
    const m = decisionMail("a@b.invalid", "A", "OH + CH4", 7, "return", "Give the bath gas.");
    expect(m.subject).toBe("Decision on “OH + CH4”: returned for revision");
    expect(m.text).toContain("The curator's reason: Give the bath gas.");
    expect(m.text).toMatch(/\/deposits\/7/);
  });
});
