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

describe("line numbers", () => {
  it("count header, blank, comment and carriage-return-only lines as the person sees them", () => {
    const r = parseColumns("T K\r\n\r\n# c\r300 1e-12\n\n350 x");
    expect(r.lines).toEqual([4]);
    expect(r.errors).toEqual([{ line: 6, message: "line 6: “x” in column 2 is not a number" }]);
  });
  it("skip a header line written as one quoted cell starting with # (this product's CSV downloads)", () => {
    const r = parseColumns('"# title: a, ""b"""\n300 1e-12');
    expect(r.lines).toEqual([2]);
    expect(r.errors).toEqual([]);
  });
});

describe("decimal commas", () => {
  it("are read as decimal points when semicolons or tabs separate the columns", () => {
    expect(parseColumns("298,15;2,1e-15;0,1").points).toEqual([{ T: 298.15, k: 2.1e-15, sigmaLnK: 0.1 }]);
    expect(parseColumns("250\t2,1e-15\n300\t,5").points).toEqual([
      { T: 250, k: 2.1e-15 },
      { T: 300, k: 0.5 },
    ]);
  });
  it("a cell with two commas is still not a number", () => {
    expect(parseColumns("250;2,1,5").errors).toEqual([
      {
        line: 1,
        message: 'line 1, column 2: "2,1,5" has more than one separator; write one decimal point or comma and no thousands separators',
      },
    ]);
  });
  it("a comma between two numbers still separates columns", () => {
    expect(parseColumns("250,2.1e-15").points).toEqual([{ T: 250, k: 2.1e-15 }]);
  });
});
