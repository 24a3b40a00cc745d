import Ajv2020 from "ajv/dist/2020";
import addFormats from "ajv-formats";
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { checkDepositSemantics } from "@/lib/deposits/check-semantics";
import { EXAMPLE_DEPOSIT } from "@/lib/deposits/example";
import { makeFastPointCheck } from "@/lib/deposits/fast-point-check";
import { formatCount } from "@/lib/deposits/messages";
import { depositSchema } from "@/lib/deposits/schema";
import { translateAjvErrors } from "@/lib/deposits/translate-errors";
import { MAX_VALIDATION_ERRORS, validateDeposit } from "@/lib/deposits/validate";
import type { FieldError } from "@/lib/errors";

// The reference: the whole document through one ajv validator, as validation worked before the
// points got their own path. Quadratic in the number of errors, so only small documents here.
const ajv = new Ajv2020({ allErrors: true, verbose: true, strictTuples: false, allowUnionTypes: true });
addFormats(ajv, ["uri"]);
const validateWhole = ajv.compile(depositSchema);

function referenceErrors(doc: unknown): FieldError[] {
  const ok = validateWhole(doc);
  const translated = ok ? { errors: [] as FieldError[], total: 0 } : translateAjvErrors(validateWhole.errors ?? [], MAX_VALIDATION_ERRORS);
  const errors = translated.errors;
  let total = translated.total;
  const pointers = new Set(errors.map((e) => e.pointer));
  checkDepositSemantics(doc, (error) => {
    if (pointers.has(error.pointer)) return;
    pointers.add(error.pointer);
    total++;
    if (errors.length < MAX_VALIDATION_ERRORS) errors.push(error);
  });
  if (total > errors.length) {
    errors.push({
      pointer: "",
      message: `Showing the first ${formatCount(errors.length)} of ${formatCount(total)} problems; correct these and validate again to see the rest.`,
    });
  }
  return errors;
}

function errorsOf(doc: unknown): FieldError[] {
  const result = validateDeposit(doc);
  return result.ok ? [] : result.errors;
}

// eslint-disable-next-line @typescript-eslint/no-explicit-any -- tests deliberately build invalid documents
function withPoints(points: unknown, change?: (doc: any) => void): unknown {
  const doc = structuredClone(EXAMPLE_DEPOSIT) as unknown as Record<string, unknown>;
  doc.points = points;
  change?.(doc);
  return doc;
}

const badRows: unknown[] = [
  { T: "x", k: -1 },
  { T: "300", k: 1e-12 },
  { T: 300 },
  { k: 1e-12 },
  { T: 300, k: 0 },
  { T: 300, k: 1e-12, extra: 1 },
  { T: 300, k: 1e-12, uncertainty: { kind: "factor", value: 0.5 } },
  { T: 300, k: 1e-12, uncertainty: { kind: "percent", value: 5 } },
  { T: 300, k: 1e-12, uncertainty: { value: 5 } },
  { T: 300, k: 1e-12, uncertainty: 5 },
  { T: 300, k: 1e-12, pressure: -1 },
  { T: 300, k: 1e-12, bathGas: "" },
  { T: 300, k: 1e-12, note: 7 },
  { T: -5, k: 1e-12 },
  { T: null, k: true },
  [300, 1e-12],
  "300 1e-12",
  null,
];

describe("points validated row by row give the errors the whole-document validator gave", () => {
  it.each(badRows.map((row) => [JSON.stringify(row), row]))("row %s among good rows", (_label, row) => {
    const doc = withPoints([{ T: 300, k: 1e-12 }, row, { T: 310, k: 1.1e-12 }, row]);
    const expected = referenceErrors(doc);
    expect(expected.length).toBeGreaterThan(0);
    expect(errorsOf(doc)).toEqual(expected);
  });

  it("keeps the order of errors before, inside and after the points", () => {
    const doc = withPoints(
      [
        { T: "x", k: -1 },
        { T: 300, k: 1e-12 },
      ],
      (d) => {
        d.title = "";
        d.reaction.order = 4;
        d.source.doi = "not a doi";
        d.relatedIdentifiers = [{}];
        d.units.T = "furlongs";
      },
    );
    const got = errorsOf(doc);
    expect(got.map((e) => e.pointer)).toEqual(referenceErrors(doc).map((e) => e.pointer));
    expect(got).toEqual(referenceErrors(doc));
  });

  it("gives the same minItems and type errors for short or missing point lists", () => {
    for (const points of [[], [{ T: "x", k: -1 }], "many", undefined, { T: 300, k: 1 }]) {
      const doc = withPoints(points);
      expect(errorsOf(doc)).toEqual(referenceErrors(doc));
    }
  });

  it("agrees with the reference on random rows (fast-check, 300 documents)", () => {
    const value = fc.oneof(fc.double(), fc.integer(), fc.constantFrom(0, -1, 1e-300, "x", "300", null, true, {}, []));
    const row = fc.oneof(
      fc.record({ T: value, k: value }, { requiredKeys: [] }),
      fc.record({ T: value, k: value, pressure: value, note: fc.oneof(fc.string(), value) }, { requiredKeys: ["T", "k"] }),
      fc.record({
        T: value,
        k: value,
        uncertainty: fc.record({ kind: fc.constantFrom("absolute", "relative", "factor", "other"), value }, { requiredKeys: [] }),
      }),
      value,
    );
    fc.assert(
      fc.property(fc.array(row, { minLength: 0, maxLength: 12 }), (rows) => {
        const doc = withPoints(rows);
        expect(errorsOf(doc)).toEqual(referenceErrors(doc));
      }),
      { numRuns: 300, seed: 7 },
    );
  });

  it("caps the messages but counts every problem, with the first rows' pointers", () => {
    const doc = withPoints(Array.from({ length: 2000 }, () => ({ T: "x", k: -1 })));
    const errors = errorsOf(doc);
    expect(errors).toEqual(referenceErrors(doc));
    expect(errors).toHaveLength(MAX_VALIDATION_ERRORS + 1);
    expect(errors.slice(0, 4).map((e) => e.pointer)).toEqual(["/points/0/T", "/points/0/k", "/points/1/T", "/points/1/k"]);
    expect(errors.at(-1)?.message).toBe(`Showing the first 200 of 4,000 problems; correct these and validate again to see the rest.`);
  });
});

describe("fast point check", () => {
  const check = makeFastPointCheck(depositSchema.properties!.points.items!)!;

  it("is derived from the schema and recognises plain {T, k} rows", () => {
    expect(check).toBeTypeOf("function");
    expect(check({ T: 300, k: 1e-12 })).toBe(true);
    expect(check({ T: 300, k: 1e-12, pressure: 1000 })).toBe(true);
  });

  it("never vouches for a row the schema refuses", () => {
    // T = -5 passes the schema (the semantic check refuses it), so it is not in this list.
    for (const row of badRows.filter((r) => JSON.stringify(r) !== '{"T":-5,"k":1e-12}')) expect(check(row)).toBe(false);
    // Rows with text or nested fields are left to the compiled validator.
    expect(check({ T: 300, k: 1e-12, note: "ok" })).toBe(false);
  });

  it("turns itself off for a point schema it does not understand", () => {
    expect(
      makeFastPointCheck({
        type: "object",
        additionalProperties: false,
        properties: { T: { type: "number", multipleOf: 5 } },
        required: ["T"],
      }),
    ).toBeUndefined();
    expect(makeFastPointCheck({ type: "object", properties: { T: { type: "number" } } })).toBeUndefined();
  });

  it("stays linear: 100 000 bad rows are refused in seconds, not minutes", () => {
    const doc = withPoints(Array.from({ length: 100_000 }, () => ({ T: "x", k: -1 })));
    const started = performance.now();
    const errors = errorsOf(doc);
    // Generous for a shared machine: the whole-document validator took about a minute at 20 000.
    expect(performance.now() - started).toBeLessThan(5000);
    expect(errors.at(-1)?.message).toBe("Showing the first 200 of 200,000 problems; correct these and validate again to see the rest.");
  });
});
