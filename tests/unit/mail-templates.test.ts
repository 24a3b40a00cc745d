import { describe, expect, it } from "vitest";
import { decisionMail, orcidVerificationMail } from "@/lib/mail/templates";

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

describe("confirmation mail of an ORCID sign-up", () => {
  it("names the iD and says what to do when it was not the reader", () => {
    const m = orcidVerificationMail("a@b.invalid", "A", "0009-0003-4172-518X", "secret-1");
    expect(m.text).toContain("ORCID iD 0009-0003-4172-518X (https://orcid.org/0009-0003-4172-518X)");
    expect(m.text).toContain("same browser");
    expect(m.text).toContain('"This was not me"');
    expect(m.text).toMatch(/\/verify\?token=secret-1/);
  });
  it("a name with line breaks stays on its greeting line", () => {
    const m = orcidVerificationMail("a@b.invalid", "Mallory\r\n\r\nClick here: http://elsewhere.invalid", "0009-0003-4172-518X", "s");
    expect(m.text.split("\n")[0]).toBe("Hello Mallory Click here: http://elsewhere.invalid,");
    expect(m.text.split("\n")[1]).toBe("");
  });
});
