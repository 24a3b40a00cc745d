import { describe, expect, it } from "vitest";
import { parseColumns } from "@/lib/analyses/parse-columns";

describe("parseColumns (pasted spreadsheet columns)", () => {
  it("reads tab, comma, semicolon and space separated rows, skipping a header and comments", () => {
    const r = parseColumns("T\tk\n300\t1e-12\n# note\n\n350,2e-12\n400;3.5E-12\n450  4e-12  0.1");
    expect(r.errors).toEqual([]);
    expect(r.points).toEqual([
      { T: 300, k: 1e-12 },
      { T: 350, k: 2e-12 },
      { T: 400, k: 3.5e-12 },
      { T: 450, k: 4e-12, sigmaLnK: 0.1 },
    ]);
    expect(r.lines).toEqual([2, 5, 6, 7]);
  });

  it("reports a non-numeric cell with its line and column", () => {
    const r = parseColumns("300 1e-12\n350 2e-1x\n400 3e-12");
    expect(r.errors).toEqual([{ line: 2, message: "line 2: “2e-1x” in column 2 is not a number" }]);
    expect(r.points).toHaveLength(2);
  });

  it("reports rows with too few or too many columns", () => {
    const r = parseColumns("300 1e-12\n350\n400 3e-12 0.1 9");
    expect(r.errors.map((e) => e.line)).toEqual([2, 3]);
  });
});

describe("decimal commas", () => {
  it("are refused with the corrected number shown, never split into two columns", () => {
    expect(parseColumns("250;2,1e-15").errors).toEqual([
      { line: 1, message: "line 1: “2,1e-15” has a decimal comma; write it with a point (2.1e-15)" },
    ]);
    expect(parseColumns("250\t2,1e-15").errors).toHaveLength(1);
  });
  it("a comma between two numbers still separates columns", () => {
    expect(parseColumns("250,2.1e-15").points).toEqual([{ T: 250, k: 2.1e-15 }]);
  });
});
