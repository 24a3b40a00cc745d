import { describe, expect, it } from "vitest";
import { severityNoun, summariseFindings } from "@/lib/curation/check-summary";

describe("a version's findings in words", () => {
  it("counts each severity in plain words, most severe first, and gives the first finding of that kind", () => {
    const s = summariseFindings([
      { severity: "info", message: "Elements and charge balance." },
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

  it("never shows a severity code", () => {
    expect(["error", "warn", "info"].map((s) => severityNoun(s))).toEqual(["problem", "warning", "note"]);
  });
});
