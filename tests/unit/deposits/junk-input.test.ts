import { describe, expect, it } from "vitest";
import { EXAMPLE_DEPOSIT, parseAndValidateDeposit, validateDeposit } from "@/lib/deposits";
import { findDuplicateKeys } from "@/lib/deposits/duplicate-keys";
import { depositSchema, type SchemaNode } from "@/lib/deposits/schema";
import type { DepositDocument } from "@/lib/deposits/types";

const clone = <T>(x: T): T => structuredClone(x);
const errorsOf = (doc: unknown) => {
  const r = validateDeposit(doc);
  return r.ok ? [] : r.errors;
};
const BLANKS = ["   ", "\t\n", "\u00a0", "\u3000 "];

/** Every string node of the schema, with where it is. */
function stringNodes(node: unknown, path: string, out: [string, SchemaNode][] = []): [string, SchemaNode][] {
  if (Array.isArray(node)) node.forEach((n, i) => stringNodes(n, `${path}/${i}`, out));
  else if (node && typeof node === "object") {
    const n = node as SchemaNode;
    if (n.type === "string") out.push([path, n]);
    for (const [k, v] of Object.entries(n)) stringNodes(v, `${path}/${k}`, out);
  }
  return out;
}

describe("required text must say something", () => {
  it("every text field of the schema that may not be empty refuses text made only of spaces", () => {
    const nonEmpty = stringNodes(depositSchema, "#").filter(([, n]) => (n.minLength ?? 0) >= 1 && !n.enum && !n.format);
    expect(nonEmpty.length).toBeGreaterThan(20);
    for (const [where, n] of nonEmpty) {
      expect(n.pattern, where).toBeDefined();
      for (const blank of BLANKS) expect(new RegExp(n.pattern!, "u").test(blank), `${where} accepts ${JSON.stringify(blank)}`).toBe(false);
    }
  });

  it.each([
    ["/creators/0/name", (d: DepositDocument) => (d.creators[0].name = "   ")],
    ["/title", (d: DepositDocument) => (d.title = "      ")],
    ["/source/reference/type", (d: DepositDocument) => (d.source = { reference: { type: " ", title: "A paper" } })],
    ["/source/reference/title", (d: DepositDocument) => (d.source = { reference: { type: "article-journal", title: "\t" } })],
    ["/reaction/reactants/1/name", (d: DepositDocument) => (d.reaction.reactants[1].name = "\u00a0")],
    ["/method/technique", (d: DepositDocument) => (d.method.technique = "    ")],
    ["/points/7/note", (d: DepositDocument) => (d.points[7].note = " ")],
    ["/units/k", (d: DepositDocument) => (d.units.k = " ")],
    ["/keywords/0", (d: DepositDocument) => (d.keywords![0] = "  ")],
  ])("%s made of spaces is refused with its pointer", (pointer, spoil) => {
    const doc = clone(EXAMPLE_DEPOSIT);
    spoil(doc);
    const errors = errorsOf(doc);
    const mine = errors.filter((e) => e.pointer === pointer);
    expect(mine, JSON.stringify(errors)).toHaveLength(1);
    expect(mine[0].message).toMatch(/must contain a character other than spaces/);
  });
});

describe("uncertainties within a stated range", () => {
  it("a relative uncertainty above 1000 % is refused, saying the bound", () => {
    const doc = clone(EXAMPLE_DEPOSIT);
    doc.points[5].uncertainty = { kind: "relative", value: 9e15 };
    const errors = errorsOf(doc);
    expect(errors).toEqual([
      expect.objectContaining({
        pointer: "/points/5/uncertainty/value",
        message: expect.stringMatching(/at most 1000 %.*9000000000000000 %/),
      }),
    ]);
    doc.points[5].uncertainty = { kind: "relative", value: 1000 };
    expect(errorsOf(doc)).toEqual([]);
  });

  it("an absolute uncertainty over ten times k is refused the same way; a factor is unchanged", () => {
    const doc = clone(EXAMPLE_DEPOSIT);
    doc.points[0].uncertainty = { kind: "absolute", value: 1e300 };
    expect(errorsOf(doc)).toEqual([
      expect.objectContaining({ pointer: "/points/0/uncertainty/value", message: expect.stringMatching(/1000 %/) }),
    ]);
    doc.points[0].uncertainty = { kind: "absolute", value: 10 * doc.points[0].k };
    expect(errorsOf(doc)).toEqual([]);
  });

  it("the schema states the bound", () => {
    expect(JSON.stringify(depositSchema.$defs.uncertainty)).toMatch(/at most 1000/);
  });
});

describe("temperatures out of range say so, with their pointer", () => {
  it.each([
    [1e308, "K"],
    [1e6, "K"],
    [1e308, "degC"],
    [Number.MAX_VALUE, "K"],
  ])("T = %s %s", (T, unit) => {
    const doc = clone(EXAMPLE_DEPOSIT);
    doc.units.T = unit;
    doc.reportedFit = undefined;
    doc.points = [{ T, k: 1e-12 }, ...doc.points.slice(1).map((p) => ({ ...p, T: unit === "K" ? p.T : p.T - 273.15 }))];
    const errors = errorsOf(doc);
    expect(errors).toEqual([
      expect.objectContaining({ pointer: "/points/0/T", message: expect.stringMatching(/out of range.*at most 100 000 K/) }),
    ]);
  });

  it("a single point at 1e308 K gets the range message, not a complaint about the fit", () => {
    const r = parseAndValidateDeposit(
      JSON.stringify({
        ...EXAMPLE_DEPOSIT,
        reportedFit: undefined,
        points: [
          { T: 1e308, k: 1 },
          { T: 300, k: 1 },
        ],
      }),
    );
    expect(r.ok).toBe(false);
    const messages = r.ok ? [] : r.errors.map((e) => `${e.pointer} ${e.message}`).join("\n");
    expect(messages).toMatch(/^\/points\/0\/T .*out of range/m);
    expect(messages).not.toMatch(/too close/);
  });

  it("the reported fit's temperatures are held to the same range", () => {
    const doc = clone(EXAMPLE_DEPOSIT);
    doc.reportedFit = { ...doc.reportedFit!, Tmax: 1e9 };
    expect(errorsOf(doc)).toEqual([
      expect.objectContaining({ pointer: "/reportedFit/Tmax", message: expect.stringMatching(/out of range/) }),
    ]);
  });
});

describe("a key written twice", () => {
  it("is found with its JSON pointer, line and column, anywhere in the document", () => {
    expect(findDuplicateKeys('{"a": 1, "a": 2}')).toEqual([{ pointer: "/a", line: 1, column: 10 }]);
    expect(findDuplicateKeys('{"p": [{"T": 1}, {"T": 2,\n "T": 3}], "q": {"x~/y": 1, "x~/y": 2}}')).toEqual([
      { pointer: "/p/1/T", line: 2, column: 2 },
      { pointer: "/q/x~0~1y", line: 2, column: 29 },
    ]);
    // Escapes name the same key; equal keys in different objects and keys inside strings are not duplicates.
    expect(findDuplicateKeys('{"a": 1, "\\u0061": 2}').map((d) => d.pointer)).toEqual(["/a"]);
    expect(findDuplicateKeys('{"a": {"b": 1}, "c": {"b": 1}, "s": "\\"a\\": 1, \\"a\\": 2", "t": ["a", "a"]}')).toEqual([]);
  });

  it("refuses the document with the pointer of the repeated field", () => {
    const text = JSON.stringify(EXAMPLE_DEPOSIT).replace('"title":', '"title":"First title","title":');
    const r = parseAndValidateDeposit(text);
    expect(r).toEqual({
      ok: false,
      errors: [expect.objectContaining({ pointer: "/title", message: expect.stringMatching(/more than once/) })],
    });
    const inPoint = JSON.stringify(EXAMPLE_DEPOSIT).replace('{"T":298,', '{"T":298,"T":2980,');
    const r2 = parseAndValidateDeposit(inPoint);
    expect(r2.ok ? [] : r2.errors.map((e) => e.pointer)).toEqual(["/points/3/T"]);
    expect(parseAndValidateDeposit(JSON.stringify(EXAMPLE_DEPOSIT)).ok).toBe(true);
  });
});

describe("a reference's authors, dates and a point's k, T and uncertainty within stated bounds", () => {
  const withReference = (reference: Record<string, unknown>) => {
    const d = clone(EXAMPLE_DEPOSIT) as DepositDocument;
    d.source = { reference: { type: "article-journal", title: "A paper", ...reference } } as DepositDocument["source"];
    return d;
  };

  it.each([{ literal: "   " }, { literal: "" }, {}, { given: "A." }, { family: "\u00a0", given: "B." }, { family: "", literal: "  " }])(
    "an author %j with no family name or literal that says something is refused at its pointer",
    (author) => {
      const errors = errorsOf(withReference({ author: [{ family: "Smith", given: "J." }, author] }));
      expect(errors.map((e) => e.pointer)).toEqual(["/source/reference/author/1"]);
      expect(errors[0].message).toMatch(/Author 2 needs a family name or a literal name .* not blank/);
    },
  );

  it("a family name or a literal alone is an author", () => {
    expect(errorsOf(withReference({ author: [{ family: "Smith" }, { literal: "A working group" }] }))).toEqual([]);
  });

  it.each([1e308, 0, -5, 999, 2101])("an issued year %s is refused at its pointer", (year) => {
    const errors = errorsOf(withReference({ issued: { "date-parts": [[year, 5]] } }));
    expect(errors.map((e) => e.pointer)).toEqual(["/source/reference/issued/date-parts/0/0"]);
    expect(errors[0].message).toMatch(/year .* must be at (least 1000|most 2100)/);
  });

  it("a plausible date, and a month or day of 0, are told apart", () => {
    expect(errorsOf(withReference({ issued: { "date-parts": [[1998, 5, 31]] } }))).toEqual([]);
    expect(errorsOf(withReference({ issued: { "date-parts": [[1998, 0]] } })).map((e) => e.pointer)).toEqual([
      "/source/reference/issued/date-parts/0/1",
    ]);
  });

  it("k above 1e100 (in any unit, beyond physics) is refused at /points/i/k; 1e100 itself passes the schema", () => {
    const d = clone(EXAMPLE_DEPOSIT);
    d.points[2] = { T: 280, k: 1e308 };
    expect(errorsOf(d).map((e) => e.pointer)).toEqual(["/points/2/k"]);
    d.points[2] = { T: 280, k: 1e100 };
    expect(errorsOf(d)).toEqual([]);
  });

  it("T = 5e-324 K is refused at /points/i/T, not at the point", () => {
    const d = clone(EXAMPLE_DEPOSIT);
    d.points[1] = { ...d.points[1], T: 5e-324 };
    const errors = errorsOf(d);
    expect(errors.map((e) => e.pointer)).toEqual(["/points/1/T"]);
    expect(errors[0].message).toMatch(/at least 1e-9 K/);
    d.points[1] = { ...d.points[1], T: 2e-7 }; // ultracold, but a temperature
    expect(errorsOf(d)).toEqual([]);
  });

  it.each([
    ["absolute", 5e-324],
    ["relative", 5e-324],
    ["factor", 1 + 2 ** -52],
  ] as const)("a %s uncertainty of %s is refused at its value, in the document's own terms", (kind, value) => {
    const d = clone(EXAMPLE_DEPOSIT);
    d.points[0] = { T: 250, k: 2.09e-15, uncertainty: { kind, value } };
    const errors = errorsOf(d);
    expect(errors.map((e) => e.pointer)).toEqual(["/points/0/uncertainty/value"]);
    expect(errors[0].message).toMatch(new RegExp(`an uncertainty of .* \\(${kind}\\) is too small`));
    expect(errors[0].message).not.toMatch(/sigmaLnK/);
  });
});
