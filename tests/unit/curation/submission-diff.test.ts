import { describe, expect, it } from "vitest";
import { checkReplyOrThrow, REPLY_MAX } from "@/lib/curation/capabilities";
import { diffPoints, diffSubmissions } from "@/lib/curation/submission-diff";

const row = (T: number, k: number) => ({ T, k });

describe("diffSubmissions", () => {
  it("lists changed, added and removed fields with old and new values, points apart", () => {
    const d = diffSubmissions(
      { title: "Old", reaction: { class: "bond-fission", order: 2 }, source: { doi: "10.1/x" }, points: [row(300, 1)] },
      { title: "New", reaction: { class: "bond-fission", order: 2 }, method: { kind: "measured" }, points: [row(300, 1)] },
    );
    expect(d.fields).toEqual([
      { kind: "changed", path: "title", before: "Old", after: "New" },
      { kind: "added", path: "method › kind", after: "measured" },
      { kind: "removed", path: "source › doi", before: "10.1/x" },
    ]);
    expect(d.points).toEqual([]);
  });

  it("names list positions from 1", () => {
    const d = diffSubmissions({ creators: [{ name: "A" }, { name: "B" }] }, { creators: [{ name: "A" }, { name: "C" }] });
    expect(d.fields).toEqual([{ kind: "changed", path: "creators › 2 › name", before: "B", after: "C" }]);
  });
});

describe("diffPoints", () => {
  const before = [row(300, 1), row(350, 2), row(400, 3), row(450, 4)];

  it("shows one deleted row as one removed row, not a shifted table", () => {
    const out = diffPoints(before, [row(300, 1), row(400, 3), row(450, 4)]);
    expect(out).toEqual([
      {
        kind: "removed",
        rowBefore: 2,
        rowAfter: undefined,
        values: [
          { column: "T", before: "350" },
          { column: "k", before: "2" },
        ],
      },
    ]);
  });

  it("pairs an edited row as changed, with only the values that differ", () => {
    const out = diffPoints(before, [row(300, 1), row(350, 2.5), row(400, 3), row(450, 4), row(500, 5)]);
    expect(out).toEqual([
      { kind: "changed", rowBefore: 2, rowAfter: 2, values: [{ column: "k", before: "2", after: "2.5" }] },
      {
        kind: "added",
        rowBefore: undefined,
        rowAfter: 5,
        values: [
          { column: "T", after: "500" },
          { column: "k", after: "5" },
        ],
      },
    ]);
  });

  it("finds nothing between equal tables", () => {
    expect(
      diffPoints(
        before,
        before.map((p) => ({ ...p })),
      ),
    ).toEqual([]);
  });
});

describe("checkReplyOrThrow", () => {
  it("requires a reply when a returned version is submitted again", () => {
    expect(() => checkReplyOrThrow("returned", "submit", undefined)).toThrow(/reply to the curator is required/);
    expect(() => checkReplyOrThrow("returned", "submit", "  ")).toThrow(/required/);
    expect(checkReplyOrThrow("returned", "submit", "  Fixed the units.  ")).toBe("Fixed the units.");
  });

  it("bounds its length and refuses text that cannot be stored", () => {
    expect(() => checkReplyOrThrow("returned", "submit", "x".repeat(REPLY_MAX + 1))).toThrow(/keep it under 2000/);
    expect(() => checkReplyOrThrow("returned", "submit", "Fixed\u0000")).toThrow(/U\+0000/);
  });

  it("refuses a reply anywhere else, and needs none for a first submission", () => {
    expect(checkReplyOrThrow("draft", "submit", undefined)).toBeUndefined();
    expect(() => checkReplyOrThrow("draft", "submit", "hello")).toThrow(/only with a resubmission/);
  });
});

describe("diffSubmissions: point values with their units", () => {
  it("writes T, k, pressure and each kind of uncertainty with the unit the document states", () => {
    const units = { T: "K", k: "cm3 molecule-1 s-1", pressure: "Torr" };
    const before = {
      units,
      points: [
        { T: 300, k: 1e-12, uncertainty: { kind: "absolute", value: 1e-13 } },
        { T: 350, k: 2e-12, uncertainty: { kind: "relative", value: 5 }, pressure: 10 },
      ],
    };
    const after = {
      units,
      points: [
        { T: 300, k: 1e-12, uncertainty: { kind: "absolute", value: 2e-13 } },
        { T: 350, k: 2e-12, uncertainty: { kind: "factor", value: 1.2 }, pressure: 20 },
      ],
    };
    const d = diffSubmissions(before, after);
    expect(d.points[0].values).toEqual([
      { column: "uncertainty › value", before: "1e-13 cm³ molecule⁻¹ s⁻¹", after: "2e-13 cm³ molecule⁻¹ s⁻¹" },
    ]);
    expect(d.points[1].values).toEqual([
      { column: "uncertainty › kind", before: "relative", after: "factor" },
      { column: "uncertainty › value", before: "5 %", after: "1.2" },
      { column: "pressure", before: "10 Torr", after: "20 Torr" },
    ]);
  });

  it("writes the pressure condition with its unit, so a change of unit shows on the pressure itself", () => {
    const doc = (value: number, unit: string) => ({
      units: { T: "K", k: "s-1", pressure: unit },
      conditions: { pressure: { value } },
      points: [],
    });
    expect(diffSubmissions(doc(100, "Torr"), doc(100, "bar")).fields).toEqual([
      { kind: "changed", path: "units › pressure", before: "Torr", after: "bar" },
      { kind: "changed", path: "conditions › pressure › value", before: "100 Torr", after: "100 bar" },
    ]);
    expect(diffSubmissions(doc(100, "Torr"), doc(50, "Torr")).fields).toEqual([
      { kind: "changed", path: "conditions › pressure › value", before: "100 Torr", after: "50 Torr" },
    ]);
  });

  it("names an uncertainty's coverage as the editor does (1σ, 2σ), never by its stored code", () => {
    const point = (confidence: string) => ({
      units: { T: "K", k: "s-1" },
      points: [{ T: 300, k: 1, uncertainty: { kind: "relative", value: 5, confidence } }],
    });
    expect(diffSubmissions(point("1sigma"), point("2sigma")).points[0].values).toEqual([
      { column: "uncertainty › confidence", before: "1σ (about 68 %)", after: "2σ (about 95 %)" },
    ]);
  });
});
