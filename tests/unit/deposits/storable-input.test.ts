import { describe, expect, it } from "vitest";
import { EXAMPLE_DEPOSIT } from "@/lib/deposits/example";
import { validateDeposit } from "@/lib/deposits/validate";
import { storageRefusal } from "@/lib/errors";
import { describeUnstorableText, findUnstorableText, isStorableText } from "@/lib/storable-text";

// eslint-disable-next-line @typescript-eslint/no-explicit-any -- tests deliberately build invalid documents
const example = (): any => structuredClone(EXAMPLE_DEPOSIT);

function pointersOf(doc: unknown): string[] {
  const result = validateDeposit(doc);
  return result.ok ? [] : result.errors.map((e) => e.pointer);
}

describe("storable text", () => {
  it.each([
    ["a\u0000b", /U\+0000 \(NUL\) at character 2/],
    ["x\ud800", /lone surrogate U\+D800 .*at character 2/],
    ["\udfff y", /lone surrogate U\+DFFF .*at character 1/],
    ["\udc00\ud800", /lone surrogate U\+DC00/],
  ])("refuses %j", (text, message) => {
    expect(isStorableText(text)).toBe(false);
    expect(describeUnstorableText(text)).toMatch(message);
  });

  it.each(["", "plain", "k = 2.2×10⁻¹² cm³", "emoji 😀 (a proper pair)", "\ufffd", "tab\tnewline\n"])("accepts %j", (text) => {
    expect(isStorableText(text)).toBe(true);
    expect(describeUnstorableText(text)).toBeNull();
  });

  it("finds every offending string and property name with its JSON pointer, escaping / and ~", () => {
    const found = findUnstorableText({ a: ["ok", "b\u0000"], "c/d~": { e: "\ud800" }, "f\u0000": "fine" });
    expect(found.map((e) => e.pointer).sort()).toEqual(["/a/1", "/c~1d~0/e", "/f\u0000"]);
    expect(found.find((e) => e.pointer === "/f\u0000")?.message).toMatch(/property name/);
  });

  it("walks a deeply nested value without overflowing the stack and stops at the limit", () => {
    let deep: unknown = "\u0000";
    for (let i = 0; i < 100_000; i++) deep = [deep];
    expect(findUnstorableText(deep)).toHaveLength(1);
    expect(
      findUnstorableText(
        Array.from({ length: 500 }, () => "\u0000"),
        10,
      ),
    ).toHaveLength(10);
  });
});

describe("validateDeposit refuses what PostgreSQL cannot store", () => {
  it("points at U+0000 and lone surrogates anywhere in the document", () => {
    const doc = example();
    doc.title = "OH + CH4\u0000";
    doc.creators[1].affiliation = "Example \ud835 Institute";
    doc.points[3].note = "\udc00";
    expect(pointersOf(doc)).toEqual(expect.arrayContaining(["/title", "/creators/1/affiliation", "/points/3/note"]));
  });

  it.each([
    [5e-324, /at least 0\.5/],
    [0, /at least 0\.5/],
    [-1, /at least 0\.5/],
    [0.3, /at least 0\.5/],
    [1.3, /whole number or a half/],
    [4 / 3, /whole number or a half/],
    [20.5, /at most 20/],
    [1e308, /at most 20/],
  ])("refuses a stoichiometric coefficient of %s", (coefficient, message) => {
    const doc = example();
    doc.reaction.reactants[0].coefficient = coefficient;
    const result = validateDeposit(doc);
    const error = result.ok ? undefined : result.errors.find((e) => e.pointer === "/reaction/reactants/0/coefficient");
    expect(error?.message).toMatch(message);
  });

  it.each([0.5, 1, 1.5, 2, 20])("accepts a stoichiometric coefficient of %s", (coefficient) => {
    const doc = example();
    doc.reaction.products[0].coefficient = coefficient;
    expect(pointersOf(doc)).not.toContain("/reaction/products/0/coefficient");
  });

  it.each([
    ["/units/k", (d: ReturnType<typeof example>) => (d.units.k = " ")],
    ["/units/T", (d: ReturnType<typeof example>) => (d.units.T = "  ")],
    ["/units/pressure", (d: ReturnType<typeof example>) => (d.units.pressure = "\t")],
    ["/reportedFit/EaUnit", (d: ReturnType<typeof example>) => (d.reportedFit.EaUnit = " ")],
  ])("refuses a blank unit at %s", (pointer, breakIt) => {
    const doc = example();
    breakIt(doc);
    expect(pointersOf(doc)).toContain(pointer);
  });
});

describe("storageRefusal", () => {
  it("turns PostgreSQL's refusal of a value into a 422, also when wrapped as a cause", () => {
    expect(storageRefusal({ code: "22021", message: 'invalid byte sequence for encoding "UTF8": 0x00' })?.status).toBe(422);
    expect(storageRefusal(new Error("Failed query", { cause: { code: "22003", message: "out of range for type real" } }))?.status).toBe(
      422,
    );
    expect(storageRefusal({ code: "22P02", message: "invalid input syntax for type json" })?.errors[0].pointer).toBe("");
  });

  it("leaves every other error alone", () => {
    expect(storageRefusal({ code: "23505", message: "duplicate key" })).toBeNull();
    expect(storageRefusal({ code: "22P02", message: 'invalid input syntax for type integer: "abc"' })).toBeNull();
    expect(storageRefusal(new Error("boom"))).toBeNull();
  });
});
