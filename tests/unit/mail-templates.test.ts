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
  it("a request for changes links the workspace and carries the reason", () => {
    const m = decisionMail("a@b.invalid", "A", "OH + CH4", 7, "request_changes", "Give the bath gas.");
    expect(m.subject).toBe("Decision on “OH + CH4”: changes requested");
    expect(m.text).toContain("The curator's reason: Give the bath gas.");
    expect(m.text).toMatch(/\/deposits\/7/);
  });
});
