import { describe, expect, it } from "vitest";
import { importRows } from "@/components/deposit-editor/import-rows";
import { formToDocument, blankForm } from "@/components/deposit-editor/form-model";
import { inspectTable } from "@/lib/deposits/import-table";

describe("importRows", () => {
  it("keeps an unreadable row in place, as typed, and lists its problem with row and column", () => {
    const table = inspectTable("T/K\tk\tsigma\n250\t2.09e-15\t1e-16\n265\t2.89e-15x\t2e-16\n280\t4.33e-15\t±3e-16\n");
    const { rows, errors, dropped } = importRows(table, table.guessedMapping, { uncertaintyKind: "absolute", confidence: "2sigma" });
    expect(dropped).toBe(0);
    expect(rows.map((r) => [r.T, r.k, r.u])).toEqual([
      ["250", "2.09e-15", "1e-16"],
      ["265", "2.89e-15x", "2e-16"],
      ["280", "4.33e-15", "3e-16"],
    ]);
    expect(rows[1]).toMatchObject({ uKind: "absolute", uConfidence: "2sigma" });
    expect(errors).toEqual([expect.objectContaining({ pointer: "/rows/1/k", message: expect.stringContaining('Row 2, column "k"') })]);
    // The kept row is flagged by the editor at the row's own pointer.
    const form = { ...blankForm(), points: rows };
    expect(formToDocument(form).problems.map((p) => p.pointer)).toEqual(["/points/1/k"]);
  });

  it("brings in nothing when the temperature or rate-constant column is not chosen", () => {
    const table = inspectTable("a,b\n1,2\n3,4\n");
    const { rows, errors } = importRows(table, { T: 0 });
    expect(rows).toEqual([]);
    expect(errors.map((e) => e.pointer)).toEqual(["/mapping/k"]);
  });

  it("gives rows without an uncertainty the chosen kind, for values typed in later", () => {
    const table = inspectTable("300,1e-12\n400,2e-12\n");
    const { rows } = importRows(table, table.guessedMapping, { uncertaintyKind: "relative" });
    expect(rows.map((r) => [r.T, r.k, r.u, r.uKind])).toEqual([
      ["300", "1e-12", "", "relative"],
      ["400", "2e-12", "", "relative"],
    ]);
  });
});
