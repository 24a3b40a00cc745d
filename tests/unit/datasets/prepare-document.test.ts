import { describe, expect, it } from "vitest";
import { checkAndAnalyseDocument, storedPointsFromColumns, toCanonicalColumns } from "@/lib/datasets/prepare-document";
import { EXAMPLE_DEPOSIT, normalisePoints, type DepositDocument } from "@/lib/deposits";

describe("checkAndAnalyseDocument (the worker's part of preparing a deposit)", () => {
  it("answers malformed JSON and schema problems as data with pointers", () => {
    expect(checkAndAnalyseDocument('{"title": }')).toMatchObject({ ok: false, errors: [{ pointer: "" }] });
    const bad = checkAndAnalyseDocument(
      JSON.stringify({
        ...EXAMPLE_DEPOSIT,
        points: [
          { T: "x", k: -1 },
          { T: 300, k: 1e-12 },
        ],
      }),
    );
    expect(bad.ok).toBe(false);
    if (!bad.ok) expect(bad.errors.map((e) => e.pointer)).toEqual(["/points/0/T", "/points/0/k"]);
  });

  it("returns the canonical columns, the units-sanity checks and the analysis of a valid document", () => {
    const checked = checkAndAnalyseDocument(JSON.stringify(EXAMPLE_DEPOSIT));
    expect(checked.ok).toBe(true);
    if (!checked.ok) return;
    expect(checked.columns.T).toHaveLength(EXAMPLE_DEPOSIT.points.length);
    expect(checked.analysis.ok).toBe(true);
    expect(checked.license).toBe(EXAMPLE_DEPOSIT.license ?? "CC-BY-4.0");
  });
});

describe("stored points rebuilt from the canonical columns", () => {
  it("equal the normalised points, for points with and without pressure, bath gas, note and uncertainty", () => {
    const doc: DepositDocument = structuredClone(EXAMPLE_DEPOSIT);
    doc.conditions = { ...doc.conditions, bathGas: "He" };
    doc.points[0] = { ...doc.points[0], pressure: 50, bathGas: "N2", note: "first" };
    doc.points[1] = { T: doc.points[1].T, k: doc.points[1].k };
    const normalised = normalisePoints(doc);
    const rebuilt = storedPointsFromColumns(doc, toCanonicalColumns(normalised));
    expect(rebuilt).toEqual(normalised);
    expect(rebuilt[0]).toMatchObject({ bathGas: "N2", note: "first" });
    expect(rebuilt[1].sigmaLnK).toBeUndefined();
    expect(rebuilt[2].bathGas).toBe("He");
  });
});
