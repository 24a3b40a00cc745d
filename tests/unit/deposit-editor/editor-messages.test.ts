import { describe, expect, it } from "vitest";
import { plainBeside, plainFieldError, plainWhat } from "@/components/deposit-editor/editor-messages";
import { documentToForm } from "@/components/deposit-editor/form-model";
import { describeAnalysisProblem } from "@/components/deposit-editor/live-analysis";
import { groupErrors } from "@/components/deposit-editor/pointers";
import { readinessItems } from "@/components/deposit-editor/readiness";
import { analysisRequestSchema } from "@/lib/analyses/analyse-request";
import { zodToFieldErrors } from "@/lib/auth/api";
import { EXAMPLE_DEPOSIT } from "@/lib/deposits/example";
import { validateDeposit } from "@/lib/deposits/validate";

// Words of the schema and of zod that must never reach the editor: the form has rows, not points or entries.
const SCHEMA_WORDS = /\bentries\b|\bPoints?\b|Too small|Invalid input|expected array|>=/;

/** A draft in the middle of an import: one row so far, a negative k, a short title, a mistyped ORCID. */
function halfImported() {
  const doc = structuredClone(EXAMPLE_DEPOSIT) as unknown as Record<string, unknown> & {
    points: Record<string, unknown>[];
    creators: Record<string, unknown>[];
  };
  doc.points = [{ ...doc.points[0], k: -1 }];
  doc.title = "a";
  doc.creators[0] = { ...doc.creators[0], orcid: "xx" };
  const result = validateDeposit(doc);
  if (result.ok) throw new Error("expected the half-imported draft to be refused");
  return { doc, errors: result.errors };
}

describe("the editor's one translation of schema and zod messages", () => {
  it("puts every schema message of a half-imported draft into the form's words, saying the row and field, pointers kept", () => {
    const { errors } = halfImported();
    const translated = errors.map(plainFieldError);
    expect(translated.map((e) => e.pointer)).toEqual(errors.map((e) => e.pointer));
    expect(Object.fromEntries(translated.map((e) => [e.pointer, e.message]))).toEqual({
      "/title": "Title: write at least three characters.",
      "/creators/0/orcid":
        'Person 1, ORCID: must be four groups of four digits joined by hyphens, the last character a digit or X, e.g. 0000-0002-1825-0097 (got "xx").',
      "/points": "Add at least two rows (there is one).",
      "/points/0/k": "Row 1, k: must be greater than 0 (got -1).",
    });
    for (const e of translated) expect(e.message).not.toMatch(SCHEMA_WORDS);
  });

  it("shows the same words beside the inputs and in the not-ready list", () => {
    const { doc, errors } = halfImported();
    const form = documentToForm(doc);
    const beside = [...groupErrors(errors, form).byField.values()].flat();
    expect(beside).toContain("Add at least two rows (there is one).");
    expect(beside).toContain("Row 1, k: must be greater than 0 (got -1).");
    const listed = readinessItems(errors, form).map((i) => `${i.where}: ${i.message}`);
    expect(listed).toContain("Rate constants: Add at least two rows (there is one).");
    expect(listed).toContain("Rate constants, row 1, k: Must be greater than 0 (got -1).");
    for (const m of [...beside, ...listed]) expect(m).not.toMatch(SCHEMA_WORDS);
  });

  it("translates zod's answers of the live fit (POST /api/v1/analyses) the same way, with the table's row numbers", () => {
    const parsed = analysisRequestSchema.safeParse({ points: [{ T: "a", k: 1 }], order: 2 });
    if (parsed.success) throw new Error("expected zod to refuse the request");
    const errors = zodToFieldErrors(parsed.error);
    // Row 1 of the request is row 3 of the table (rows 1 and 2 are blank).
    const { details } = describeAnalysisProblem({ status: 422, title: "", errors }, [2]);
    expect(details).toEqual(["Row 3, T: write a number here.", "Add at least two rows with a temperature and a rate constant."]);
    for (const d of details) expect(d).not.toMatch(SCHEMA_WORDS);
  });

  it("keeps messages that already speak plainly, and says none instead of zero", () => {
    expect(plainWhat("/title", "Title is too short.")).toBe("Title is too short.");
    expect(plainBeside("/title", "Title is too short.")).toBe("Title is too short.");
    expect(plainWhat("/points", "Points must have at least 2 entries (it has 0).")).toBe("Add at least two rows (there are none yet).");
    expect(plainBeside("/points/2/T", '"29o" is not a number; write it like 1.2e-11.')).toBe(
      'Row 3, T: "29o" is not a number; write it like 1.2e-11.',
    );
    expect(plainWhat("/keywords", "Keywords must have at least 1 entry (it has 0).")).toBe(
      "Add at least one keyword (there are none yet).",
    );
  });
});
