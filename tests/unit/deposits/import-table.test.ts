import { readFileSync } from "node:fs";
import { describe, expect, it } from "vitest";
import {
  MAX_UPLOAD_BYTES,
  applyMapping,
  assertUploadSize,
  checkUploadSize,
  guessColumnRole,
  inspectTable,
  rowRuns,
} from "@/lib/deposits/import-table";
import { EXAMPLE_DEPOSIT } from "@/lib/deposits/example";
import { validateDeposit } from "@/lib/deposits/validate";
import { AppError } from "@/lib/errors";

function fixture(name: string): string {
  return readFileSync(new URL(`../../fixtures/deposits/${name}`, import.meta.url), "utf8");
}

const MIB = 1024 * 1024;

describe("inspectTable", () => {
  it("reads a CSV file, skips comments and guesses every column and unit from the header", () => {
    const table = inspectTable(fixture("points.csv"), { filename: "points.csv" });
    expect(table.format).toBe("csv");
    expect(table.delimiter).toBe(",");
    expect(table.hasHeader).toBe(true);
    expect(table.columns).toEqual(["T/K", "k / cm3 molecule-1 s-1", "sigma", "p/Torr", "bath gas", "note"]);
    expect(table.rows).toHaveLength(3);
    expect(table.rows[2]).toEqual(["375", "2.17e-14", "1.7e-15", "100", "N2", "checked, twice"]);
    expect(table.preview).toEqual(table.rows);
    expect(table.guessedMapping).toEqual({ T: 0, k: 1, uncertainty: 2, pressure: 3, bathGas: 4, note: 5 });
    expect(table.guessedUnits).toEqual({ T: "K", k: "cm3 molecule-1 s-1", pressure: "Torr" });
  });

  it("skips header lines written as one quoted cell starting with # (as this product's CSV downloads write them)", () => {
    const text = '\uFEFF"# title: Rate constants, ""=1+2"", measured"\r\n"# caution: invented"\r\nT/K,k\r\n300,1e-12\r\n400,2e-12\r\n';
    const table = inspectTable(text, { filename: "points.csv" });
    expect(table.columns).toEqual(["T/K", "k"]);
    expect(table.rows).toEqual([
      ["300", "1e-12"],
      ["400", "2e-12"],
    ]);
  });

  it("says when a header names a unit it does not know, and nothing when every unit is read", () => {
    const table = inspectTable("T (°F)\tk (ft3 lbmol-1 h-1)\n250\t2.082e-15\n300\t4.1e-15\n");
    expect(table.guessedUnits).toEqual({});
    expect(table.notices).toHaveLength(2);
    expect(table.notices[0]).toMatch(/“T \(°F\)” names the unit “°F”, which is not a temperature unit this form knows/);
    expect(table.notices[1]).toMatch(/“ft3 lbmol-1 h-1”, which is not a rate constant unit/);
    expect(inspectTable(fixture("points.csv"), { filename: "points.csv" }).notices).toEqual([]);
  });

  it("says which rows have more cells than the header, and suggests a decimal comma in a comma-separated table", () => {
    const table = inspectTable("T (K),k (cm3 molecule-1 s-1)\n300,1.0e-14\n325,1,025e-14\n350,1.2e-14\n");
    expect(table.notices).toEqual([
      expect.stringMatching(/^Row 2 has more cells than the header has columns \(2\); the extra cells are not used\. .*decimal comma/),
    ]);
    const tabs = inspectTable("T (K)\tk (cm3 molecule-1 s-1)\n300\t1e-14\tx\n325\t1e-14\ty\n");
    expect(tabs.notices).toEqual([expect.stringMatching(/^Rows 1, 2 have more cells .* not used\.$/)]);
  });

  it("reads a TSV file", () => {
    const table = inspectTable(fixture("points.tsv"), { filename: "points.tsv" });
    expect(table.format).toBe("tsv");
    expect(table.delimiter).toBe("\t");
    expect(table.columns).toEqual(["Temperature (K)", "k(T)", "±"]);
    expect(table.guessedMapping).toEqual({ T: 0, k: 1, uncertainty: 2 });
    expect(table.guessedUnits).toEqual({ T: "K" });
  });

  it("detects tabs and semicolons without a file name", () => {
    expect(inspectTable("T\tk\n300\t1e-12\n400\t2e-12\n").delimiter).toBe("\t");
    const semi = inspectTable("T (K);k;note\n300;1e-12;a\n400;2e-12;b\n");
    expect(semi.delimiter).toBe(";");
    expect(semi.guessedMapping).toEqual({ T: 0, k: 1, note: 2 });
  });

  it("reads a JSON array of objects", () => {
    const table = inspectTable(fixture("points.json"), { filename: "points.json" });
    expect(table.format).toBe("json");
    expect(table.delimiter).toBe("");
    expect(table.columns).toEqual(["T", "k", "err", "note"]);
    expect(table.rows).toEqual([
      ["250", "2.09e-15", "1.7e-16", ""],
      ["298", "5.89e-15", "4.7e-16", ""],
      ["420", "3.28e-14", "", "highest temperature"],
    ]);
    expect(table.guessedMapping).toEqual({ T: 0, k: 1, uncertainty: 2, note: 3 });
  });

  it("reads a JSON array of arrays with a header row, and units from it", () => {
    const table = inspectTable(fixture("points-arrays.json"));
    expect(table.format).toBe("json");
    expect(table.hasHeader).toBe(true);
    expect(table.rows).toEqual([
      ["25", "1500"],
      ["50", "4100"],
    ]);
    expect(table.guessedUnits).toEqual({ T: "degC", k: "s-1" });
  });

  it("without a header, names the columns and assumes T, k, uncertainty", () => {
    const table = inspectTable("250,2.09e-15,1e-16\n300,6e-15,3e-16\n");
    expect(table.hasHeader).toBe(false);
    expect(table.columns).toEqual(["Column 1", "Column 2", "Column 3"]);
    expect(table.guessedMapping).toEqual({ T: 0, k: 1, uncertainty: 2 });
  });

  it("keeps the first ten rows as the preview", () => {
    const text = `T,k\n${Array.from({ length: 25 }, (_, i) => `${300 + i},1e-12`).join("\n")}`;
    const table = inspectTable(text, { filename: "many.csv" });
    expect(table.rows).toHaveLength(25);
    expect(table.preview).toHaveLength(10);
    expect(table.preview[9]).toEqual(["309", "1e-12"]);
  });

  it("refuses malformed JSON and JSON that is not a table, with a message", () => {
    expect(() => inspectTable('[{"T": 300,}]', { filename: "x.json" })).toThrow(
      /^The file is not valid JSON: unexpected "}"; a trailing comma is not allowed \(line 1, column 12\)\.$/,
    );
    expect(() => inspectTable('{"T": [300]}', { filename: "x.json" })).toThrow("A JSON table must be a list of rows");
    expect(() => inspectTable("   ", { filename: "x.csv" })).toThrow("The file is empty.");
  });

  it("refuses text over 25 MB before parsing it", () => {
    const big = "1".repeat(MAX_UPLOAD_BYTES + 1);
    try {
      inspectTable(big);
      expect.unreachable();
    } catch (e) {
      expect(e).toBeInstanceOf(AppError);
      expect((e as AppError).status).toBe(413);
      expect((e as AppError).message).toBe("The file is 25.0 MB; the limit is 25 MB.");
    }
  });
});

describe("guessColumnRole", () => {
  it.each([
    ["T", "T"],
    ["T/K", "T"],
    ["Temperature (K)", "T"],
    ["temp [°C]", "T"],
    ["k", "k"],
    ["k / cm3 molecule-1 s-1", "k"],
    ["k(T) (cm^3 s^-1)", "k"],
    ["rate constant", "k"],
    ["sigma", "uncertainty"],
    ["±", "uncertainty"],
    ["err", "uncertainty"],
    ["k error", "uncertainty"],
    ["σ(k)", "uncertainty"],
    ["P", "pressure"],
    ["p/Torr", "pressure"],
    ["Pressure (mbar)", "pressure"],
    ["bath gas", "bathGas"],
    ["Comment", "note"],
    ["time", undefined],
    ["kelvin", undefined],
  ])("%s → %s", (header, role) => {
    expect(guessColumnRole(header)).toBe(role);
  });
});

describe("rowRuns", () => {
  it("writes row numbers as runs", () => {
    expect(rowRuns([1])).toBe("1");
    expect(rowRuns([3, 4, 5, 9, 11, 12])).toBe("3–5, 9, 11, 12");
  });
});

describe("applyMapping", () => {
  it("turns rows into points with uncertainties, pressures, bath gases and notes", () => {
    const table = inspectTable(fixture("points.csv"), { filename: "points.csv" });
    const { points, errors } = applyMapping(table, table.guessedMapping, { confidence: "2sigma" });
    expect(errors).toEqual([]);
    expect(points).toEqual([
      { T: 250, k: 2.09e-15, uncertainty: { kind: "absolute", value: 1.7e-16, confidence: "2sigma" }, pressure: 50, bathGas: "He" },
      {
        T: 298,
        k: 5.89e-15,
        uncertainty: { kind: "absolute", value: 4.7e-16, confidence: "2sigma" },
        pressure: 50,
        bathGas: "He",
        note: "room temperature",
      },
      {
        T: 375,
        k: 2.17e-14,
        uncertainty: { kind: "absolute", value: 1.7e-15, confidence: "2sigma" },
        pressure: 100,
        bathGas: "N2",
        note: "checked, twice",
      },
    ]);
    // The imported points make a valid deposit with the units read from the header.
    const doc = {
      ...structuredClone(EXAMPLE_DEPOSIT),
      points,
      units: { k: table.guessedUnits.k!, T: table.guessedUnits.T!, pressure: table.guessedUnits.pressure },
    };
    expect(validateDeposit(doc).ok).toBe(true);
  });

  it("reads ± signs and percent signs in uncertainty cells", () => {
    const table = inspectTable("T,k,± %\n300,1e-12,±8 %\n400,2e-12,10%\n");
    expect(table.guessedUncertaintyKind).toBe("relative");
    const { points, errors } = applyMapping(table, table.guessedMapping, { uncertaintyKind: table.guessedUncertaintyKind });
    expect(errors).toEqual([]);
    expect(points.map((p) => p.uncertainty)).toEqual([
      { kind: "relative", value: 8 },
      { kind: "relative", value: 10 },
    ]);
  });

  it("names the row and column of a non-numeric cell", () => {
    const rows = Array.from({ length: 8 }, (_, i) => [String(250 + 10 * i), "1.2e-14"]);
    rows[6][1] = "1.2e-1x";
    rows[2][0] = "";
    const { points, errors } = applyMapping({ columns: ["T/K", "k"], rows }, { T: 0, k: 1 });
    expect(points).toHaveLength(6);
    expect(errors).toEqual([
      { pointer: "/rows/2/T~1K", value: "", message: 'Row 3, column "T/K" is empty.' },
      { pointer: "/rows/6/k", value: "1.2e-1x", message: 'Row 7, column "k": "1.2e-1x" is not a number.' },
    ]);
  });

  it("refuses k ≤ 0, non-positive uncertainties and factors not above 1, row by row", () => {
    const table = {
      columns: ["T", "k", "f", "p"],
      rows: [
        ["300", "0", "1.2", "10"],
        ["310", "1e-12", "1", "10"],
        ["320", "1e-12", "1.5", "-3"],
      ],
    };
    const { points, errors } = applyMapping(table, { T: 0, k: 1, uncertainty: 2, pressure: 3 }, { uncertaintyKind: "factor" });
    expect(points).toEqual([]);
    expect(errors.map((e) => e.message)).toEqual([
      'Row 1, column "k": a rate constant must be greater than 0 (got 0).',
      'Row 2, column "f": an uncertainty factor must be greater than 1 (got 1).',
      'Row 3, column "p": a pressure must be greater than 0 (got -3).',
    ]);
  });

  it("refuses a temperature at or below absolute zero in the column's unit, listed like every other refusal", () => {
    const rows = [
      ["-5", "1e-12"],
      ["0", "1e-12"],
      ["300", "1e-12"],
    ];
    const inKelvin = applyMapping({ columns: ["T", "k"], rows }, { T: 0, k: 1 });
    expect(inKelvin.points).toEqual([{ T: 300, k: 1e-12 }]);
    expect(inKelvin.errors).toEqual([
      { pointer: "/rows/0/T", value: "-5", message: 'Row 1, column "T": a temperature must be above absolute zero (got -5 K).' },
      { pointer: "/rows/1/T", value: "0", message: 'Row 2, column "T": a temperature must be above absolute zero (got 0 K).' },
    ]);
    // In °C, −5 is a fine temperature (268.15 K); −300 °C is not (−26.85 K, 0 K = −273.15 °C: CODATA/SI definition).
    const inCelsius = applyMapping({ columns: ["T", "k"], rows: [...rows, ["-300", "1e-12"]] }, { T: 0, k: 1 }, { temperatureUnit: "°C" });
    expect(inCelsius.points.map((p) => p.T)).toEqual([-5, 0, 300]);
    expect(inCelsius.errors.map((e) => e.message)).toEqual([
      'Row 4, column "T": a temperature must be above absolute zero (got -300 °C, which is -26.85 K).',
    ]);
  });

  it("reads decimal commas in cells (a semicolon- or tab-separated table) as the editor and /analyse do", () => {
    const table = inspectTable("T;k\n298,15;1,5e-12\n350;2,1E-12\n400;1,025\n", { filename: "x.csv" });
    const { points, errors } = applyMapping(table, table.guessedMapping);
    expect(points).toEqual([
      { T: 298.15, k: 1.5e-12 },
      { T: 350, k: 2.1e-12 },
    ]);
    expect(errors.map((e) => e.message)).toEqual([
      'Row 3, column "k": "1,025" could be 1.025 or 1025; write a decimal point (1.025) or no separator (1025).',
    ]);
  });

  it("asks for the T and k columns when they are not mapped", () => {
    const { errors } = applyMapping({ columns: ["a", "b"], rows: [["1", "2"]] }, { k: 1 });
    expect(errors).toEqual([{ pointer: "/mapping/T", message: "Choose the column that holds the temperature." }]);
  });

  it("refuses 100 001 rows with a specific message", () => {
    const rows = Array.from({ length: 100_001 }, () => ["300", "1e-12"]);
    const { points, errors } = applyMapping({ columns: ["T", "k"], rows }, { T: 0, k: 1 });
    expect(points).toEqual([]);
    expect(errors).toEqual([
      {
        pointer: "/rows",
        value: 100_001,
        message:
          "The table has 100,001 rows; a dataset can hold at most 100,000 points. Split the file into several datasets, for example by temperature range or bath gas.",
      },
    ]);
  });

  it("caps row errors at 200 plus a summary", () => {
    const rows = Array.from({ length: 500 }, () => ["x", "1e-12"]);
    const { errors } = applyMapping({ columns: ["T", "k"], rows }, { T: 0, k: 1 });
    expect(errors).toHaveLength(201);
    expect(errors[200].message).toBe("Showing the first 200 of 500 problems in the table.");
  });
});

describe("upload size limit", () => {
  it("says how big the file is and what the limit is", () => {
    expect(checkUploadSize(30 * MIB)).toEqual({ pointer: "", value: 30 * MIB, message: "The file is 30.0 MB; the limit is 25 MB." });
    expect(checkUploadSize(MAX_UPLOAD_BYTES)).toBeNull();
    expect(checkUploadSize(1234)).toBeNull();
  });

  it("assertUploadSize throws a 413 AppError carrying the field error", () => {
    expect(() => assertUploadSize(MAX_UPLOAD_BYTES)).not.toThrow();
    try {
      assertUploadSize(30 * MIB);
      expect.unreachable();
    } catch (e) {
      expect(e).toBeInstanceOf(AppError);
      expect((e as AppError).code).toBe("payload_too_large");
      expect((e as AppError).status).toBe(413);
      expect((e as AppError).errors).toEqual([{ pointer: "", value: 30 * MIB, message: "The file is 30.0 MB; the limit is 25 MB." }]);
    }
  });
});
