import { describe, expect, it } from "vitest";
import { parseNumberText, readNumberText } from "@/lib/number-text";
import { parseColumns } from "@/lib/analyses/parse-columns";
import { formToDocument, blankForm } from "@/components/deposit-editor/form-model";

// Spellings of numbers in published tables and spreadsheets: common practice (E and D exponents,
// the typeset minus U+2212, and the decimal comma of many locales' spreadsheets).
const SPELLINGS: [string, number | null][] = [
  ["1.2e-11", 1.2e-11],
  [" 300 ", 300],
  ["1.2E-11", 1.2e-11],
  ["−5", -5],
  ["1.2D-11", 1.2e-11],
  [".5", 0.5],
  ["+3", 3],
  ["1,5e-12", 1.5e-12],
  ["298,15", 298.15],
  ["0,125", 0.125],
  [",5", 0.5],
  ["−2,5E−3", -2.5e-3],
  ["1.2e-1x", null],
  ["1,025", null],
  ["12,500", null],
  ["2,1,5", null],
  ["1.234,5", null],
  ["1 000", null],
  ["", null],
  ["abc", null],
];

describe("readNumberText: one reading of numbers for the editor, the table import and /analyse", () => {
  it.each(SPELLINGS)("%s", (text, expected) => {
    expect(parseNumberText(text)).toBe(expected);
  });

  it("says why a spelling is refused", () => {
    expect(readNumberText("1,025")).toEqual({
      ok: false,
      problem: '"1,025" could be 1.025 or 1025; write a decimal point (1.025) or no separator (1025)',
    });
    expect(readNumberText("1.234,5")).toEqual({
      ok: false,
      problem: '"1.234,5" has more than one separator; write one decimal point or comma and no thousands separators',
    });
    expect(readNumberText(" x ")).toEqual({ ok: false, problem: '"x" is not a number' });
  });

  it("reads every spelling the same way in /analyse's pasted columns (one column per tab)", () => {
    for (const [text, expected] of SPELLINGS) {
      if (text.trim() === "") continue;
      const parsed = parseColumns(`300\t${text}`);
      if (expected === null) expect(parsed.points).toEqual([]);
      else expect(parsed.points).toEqual([{ T: 300, k: expected }]);
    }
  });

  it("reads every spelling the same way in the deposit editor's cells", () => {
    for (const [text, expected] of SPELLINGS) {
      if (text.trim() === "") continue;
      const form = blankForm();
      form.points = [{ T: "300", k: text, u: "", uKind: "absolute", uConfidence: "", pressure: "", bathGas: "", note: "" }];
      const { document, problems } = formToDocument(form);
      if (expected === null) {
        expect(problems).toHaveLength(1);
        expect(problems[0].pointer).toBe("/points/0/k");
      } else {
        expect(problems).toEqual([]);
        expect(document.points[0].k).toBe(expected);
      }
    }
  });
});
