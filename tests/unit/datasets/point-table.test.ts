import Papa from "papaparse";
import { describe, expect, it } from "vitest";
import { citationLine } from "@/lib/citation/citation-line";
import { buildPointsCsv, buildPointsJson, type PointsAbout } from "@/lib/datasets/point-export";
import { buildPointRows, uncertaintyText, type StoredPointRow } from "@/lib/datasets/point-table";
import { EXAMPLE_DEPOSIT } from "@/lib/deposits/example";
import { normalisePoints, toAnalysisInput } from "@/lib/deposits/normalise";
import type { DepositDocument } from "@/lib/deposits/types";
import { analyseDataset } from "@/lib/kinetics";

/** The example deposit with one point four times too high (invented), so the analysis flags it as an outlier. */
function withOutlier(): DepositDocument {
  const doc = structuredClone(EXAMPLE_DEPOSIT) as DepositDocument;
  doc.points[4] = { ...doc.points[4], k: doc.points[4].k * 4 };
  return doc;
}

function rowsOf(doc: DepositDocument) {
  const stored: StoredPointRow[] = normalisePoints(doc).map((p) => ({
    T: p.T,
    k: p.k,
    sigmaLnK: p.sigmaLnK ?? null,
    pressurePa: p.pressurePa ?? null,
    bathGas: p.bathGas ?? null,
    note: p.note ?? null,
    original: p.original,
  }));
  const analysis = analyseDataset(toAnalysisInput(doc));
  return { rows: buildPointRows(doc, stored, analysis), analysis };
}

const about: PointsAbout = {
  versionIdentifier: "10.5072/ARH-4F7K-9QXM/2",
  title: "A title\nover two lines",
  versionNumber: 2,
  state: "published",
  retraction: null,
  licence: "CC-BY-4.0",
  citation: "Okafor, Maren (2026). A title. Version 2. Arrhenia. doi:10.5072/ARH-4F7K-9QXM/2",
  landingPage: "http://127.0.0.1:3000/datasets/1/v2",
  caution: "The caution sentence.",
  canonicalUnits: { T: "K", k: "cm3 molecule-1 s-1", pressure: "Pa" },
  residuals: { model: "arrhenius", weighted: true, engineVersion: "kinetics-4" },
};

describe("a version's point rows", () => {
  it("keep each point's own pressure, bath gas and note over the dataset's, and the deposited uncertainty", () => {
    const { rows } = rowsOf(structuredClone(EXAMPLE_DEPOSIT) as DepositDocument);
    expect(rows).toHaveLength(10);
    expect(rows[0].deposited).toMatchObject({ T: 250, TUnit: "K", k: 2.09e-15, pressure: 50, pressureUnit: "Torr" });
    expect(rows[7].deposited.pressure).toBe(100);
    expect(rows[7].note).toMatch(/100 Torr/);
    expect(rows[9].bathGas).toBe("N2");
    expect(rows[0].bathGas).toBe("He");
    expect(uncertaintyText(rows[0].deposited.uncertainty, "cm3 molecule-1 s-1")).toBe("± 1.7e−16 cm3 molecule-1 s-1 (2σ)");
    expect(uncertaintyText(rows[5].deposited.uncertainty, "s-1")).toBe("± 8 % (2σ)");
    expect(uncertaintyText(rows[8].deposited.uncertainty, "s-1")).toBe("×/÷ 1.1 (1σ)");
  });

  it("carry the residual of the drawn fit and, on a weighted fit, that residual over σ(ln k)", () => {
    const { rows, analysis } = rowsOf(structuredClone(EXAMPLE_DEPOSIT) as DepositDocument);
    expect(analysis.weighted).toBe(true);
    const fit = analysis.band.model === "modified_arrhenius" ? analysis.modifiedArrhenius! : analysis.arrhenius;
    rows.forEach((r, i) => {
      expect(r.residualLnK).toBe(fit.residuals[i]);
      expect(r.residualInSigma).toBeCloseTo(fit.residuals[i] / r.sigmaLnK!, 12);
    });
  });

  it("mark an outlier with its distance from the line in plain words and the bound it passes", () => {
    const { rows, analysis } = rowsOf(withOutlier());
    const flagged = analysis.flags.find((f) => f.code === "outlier")?.points ?? [];
    expect(flagged).toContain(4);
    const mark = rows[4].marks.find((m) => m.code === "outlier")!;
    expect(mark.word).toBe("outlier");
    expect(mark.reason).toMatch(
      /^\d+(\.\d+)? times the typical scatter away from the line through the other points; the limit for any point of this set is \d+(\.\d+)?$/,
    );
    expect(rows.filter((r, i) => !flagged.includes(i)).every((r) => !r.marks.some((m) => m.code === "outlier"))).toBe(true);
  });
});

describe("point downloads", () => {
  /** A CSV read by an RFC 4180 parser (papaparse): the header block's cells and the table after it. */
  function readCsv(text: string) {
    const records = Papa.parse<string[]>(text, { delimiter: ",", skipEmptyLines: true }).data;
    const head = records.filter((r) => r[0].startsWith("#"));
    const body = records.filter((r) => !r[0].startsWith("#"));
    return { head, comments: head.map((r) => r[0]), body };
  }

  it("CSV: every header line is one cell starting with #, whatever commas and quotes its text holds; no cell starts a formula", () => {
    const { rows } = rowsOf(structuredClone(EXAMPLE_DEPOSIT) as DepositDocument);
    for (const title of ["Probe,=1+1,@SUM(1;2), -3+3 zorbium", 'Rate constants,"=1+2",measured', '","=HYPERLINK(""x"")', "\t=1"]) {
      const text = buildPointsCsv({ ...about, title, citation: 'Doe, +J. (2026), "-2+3"' }, rows);
      const { head, comments } = readCsv(text);
      // Common practice (OWASP "CSV injection"): no text cell a spreadsheet shows may start with = + - @ (a number may be negative).
      for (const record of Papa.parse<string[]>(text, { delimiter: ",", skipEmptyLines: true }).data)
        for (const cell of record) if (!Number.isFinite(Number(cell))) expect(cell, title).not.toMatch(/^[=+\-@\t\r]/);
      for (const record of head) expect(record, title).toHaveLength(1);
      expect(comments, title).toContain(`# title: ${title}`);
      expect(comments, title).toContain('# cite as: Doe, +J. (2026), "-2+3"');
    }
  });
  it("CSV: one comment line per header entry even when a text holds a newline, formula-like text neutralised, every row parses", () => {
    const doc = structuredClone(EXAMPLE_DEPOSIT) as DepositDocument;
    doc.points[9] = { ...doc.points[9], bathGas: "=HYPERLINK(1)" };
    const { rows } = rowsOf(doc);
    const text = buildPointsCsv(about, rows);
    const { comments, body } = readCsv(text);
    expect(text.split("\r\n")[0]).toBe('"# version identifier: doi:10.5072/ARH-4F7K-9QXM/2"');
    expect(comments[0]).toBe("# version identifier: doi:10.5072/ARH-4F7K-9QXM/2");
    expect(comments).toContain("# title: A title over two lines");
    expect(comments).toContain("# cite as: " + about.citation);
    expect(comments).toContain("# caution: The caution sentence.");
    const table = Papa.parse<Record<string, string>>(Papa.unparse(body, { newline: "\n" }), {
      header: true,
      skipEmptyLines: true,
    });
    expect(table.errors).toEqual([]);
    expect(table.data).toHaveLength(10);
    expect(table.data[9].bath_gas).toBe("'=HYPERLINK(1)");
    // Numbers keep every digit (String of a double round-trips).
    expect(Number(table.data[0]["k_cm3_molecule-1_s-1"])).toBe(rows[0].k);
  });

  it("JSON: the about object and one entry per point with its findings", () => {
    const { rows } = rowsOf(withOutlier());
    const body = buildPointsJson(about, rows);
    expect(body.about).toMatchObject({
      versionIdentifier: about.versionIdentifier,
      licence: "CC-BY-4.0",
      caution: "The caution sentence.",
    });
    expect(body.about.residuals?.definition).toMatch(/^ln k − fitted ln k of the Arrhenius re-fit \(engine kinetics-4\)/);
    expect(body.points[4].findings.map((f) => f.code)).toContain("outlier");
  });
});

describe("citationLine", () => {
  const url = "https://arrhenia.test/datasets/3/v2";
  it("creators, year, title, version, publisher and identifier, once each", () => {
    expect(
      citationLine({
        kind: "version",
        creators: ["Okafor, Maren", "Tomas Lindqvist"],
        publishedAt: new Date("2026-03-04T10:00:00Z"),
        title: "OH + CH4 rate constants",
        versionNumber: 2,
        identifier: "10.5072/ARH-4F7K-9QXM/2",
        url,
      }),
    ).toBe("Okafor, Maren; Lindqvist, Tomas (2026). OH + CH4 rate constants. Version 2. Arrhenia. doi:10.5072/ARH-4F7K-9QXM/2");
    expect(
      citationLine({ kind: "version", creators: [], publishedAt: null, title: "Done.", versionNumber: 1, identifier: null, url }),
    ).toBe("Anonymous (n.d.). Done. Version 1. Arrhenia.");
  });
});
