import { describe, expect, it } from "vitest";
import { findingsOnly, passedCheckWords, severityNoun, summariseFindings } from "@/lib/curation/check-summary";

describe("a version's findings in words", () => {
  it("counts each severity in plain words, most severe first, and gives the first finding of that kind", () => {
    const s = summariseFindings([
      { severity: "info", message: "Product yields not stated." },
      { severity: "warn", message: "Point 3 lies 4.1 σ from the fit." },
      { severity: "info", message: "Range 230–400 K." },
      { severity: "warn", message: "The data curve." },
    ]);
    expect(s.words).toBe("2 warnings, 2 notes");
    expect(s.worst).toBe("warn");
    expect(s.first?.message).toBe("Point 3 lies 4.1 σ from the fit.");
    expect(s.counts).toEqual({ error: 0, warn: 2, info: 2 });
  });

  it("says a problem in the singular and nothing found as such", () => {
    expect(summariseFindings([{ severity: "error", message: "Not balanced." }]).words).toBe("1 problem");
    expect(summariseFindings([])).toMatchObject({ words: "no findings", worst: "none", first: null });
  });

  it("never counts or lists a passed check (elements and charge balanced) as a finding", () => {
    const balanced = { code: "balanced", severity: "info", message: "Elements and charge balance." };
    const narrow = { code: "narrow_range", severity: "warn", message: "The measured range is narrow." };
    expect(summariseFindings([balanced])).toMatchObject({ words: "no findings", worst: "none", first: null, counts: { info: 0 } });
    expect(summariseFindings([balanced, narrow]).words).toBe("1 warning");
    expect(findingsOnly([balanced, narrow])).toEqual([narrow]);
    // Said plainly where it is useful, without a severity.
    expect(passedCheckWords([balanced, narrow, balanced])).toEqual(["Balanced: elements and charge"]);
    // An unbalanced reaction stays a finding.
    expect(summariseFindings([{ code: "unbalanced", severity: "error", message: "Not balanced: H 4 → 3." }]).words).toBe("1 problem");
  });

  it("never shows a severity code", () => {
    expect(["error", "warn", "info"].map((s) => severityNoun(s))).toEqual(["problem", "warning", "note"]);
  });
});
