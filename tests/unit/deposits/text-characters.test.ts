import { describe, expect, it } from "vitest";
import { EXAMPLE_DEPOSIT } from "@/lib/deposits/example";
import { findForbiddenCharacters } from "@/lib/deposits/text-characters";
import { validateDeposit } from "@/lib/deposits/validate";
import { forbiddenCharacter } from "@/lib/text/clean";

// eslint-disable-next-line @typescript-eslint/no-explicit-any -- tests deliberately build invalid documents
const example = (): any => structuredClone(EXAMPLE_DEPOSIT);
const errorsOf = (doc: unknown) => {
  const r = validateDeposit(doc);
  return r.ok ? [] : r.errors;
};

describe("characters no deposited text may hold", () => {
  // The Unicode Standard: C0 controls U+0000–U+001F, DEL U+007F, C1 controls U+0080–U+009F; U+FFFE and
  // U+FFFF are noncharacters; a surrogate code unit alone is not a character (XML 1.0 §2.2 Char excludes them too).
  it.each([
    ["\u0001", "U+0001"],
    ["\u0007", "U+0007"],
    ["\u001F", "U+001F"],
    ["\t", "U+0009"],
    ["\n", "U+000A"],
    ["\r", "U+000D"],
    ["\u007F", "U+007F"],
    ["\u0085", "U+0085"],
    ["\u009F", "U+009F"],
    ["\uFFFE", "U+FFFE"],
    ["\uFFFF", "U+FFFF"],
    ["\uD800", "U+D800"],
    ["\uDC00", "U+DC00"],
  ])("refuses %j in a one-line field, naming it as %s", (c, label) => {
    const found = forbiddenCharacter(`ab${c}cd`, { lines: false });
    expect(found).toEqual({ character: c, index: 2 });
    const doc = example();
    doc.creators = [{ name: "Okafor, Maren" }, { name: `Tanaka${c}, Emi` }];
    const errors = errorsOf(doc);
    const error = errors.find((e) => e.pointer === "/creators/1/name");
    expect(error?.message).toContain(label);
    expect(error?.message).toMatch(/at character 7/);
    // A lone surrogate is refused first by the rule for text PostgreSQL cannot store (lib/storable-text.ts), which names the field by its pointer only.
    if (!/^[\uD800-\uDFFF]$/.test(c)) expect(error?.message).toContain("/creators/1/name");
  });

  it("allows tab and line breaks in the fields written over several lines, and nothing else there", () => {
    const doc = example();
    doc.description = "First line\nsecond\tline\r\nthird";
    doc.method = { ...doc.method, notes: "a\nb" };
    expect(validateDeposit(doc).ok).toBe(true);
    doc.description = "Bell \u0007 here";
    expect(errorsOf(doc).map((e) => e.pointer)).toEqual(["/description"]);
  });

  it("refuses a line break in a title, a unit, a point's note and a source reference field", () => {
    const doc = example();
    doc.title = "Two\nlines";
    doc.units = { ...doc.units, k: "cm3 molecule-1 s-1\u0085" };
    doc.points[3] = { ...doc.points[3], note: "x\u001B[31m" };
    doc.source = { reference: { type: "article-journal", title: "A\u00A0B fine", "container-title": "J.\u007F" } };
    const pointers = errorsOf(doc).map((e) => e.pointer);
    expect(pointers).toEqual(expect.arrayContaining(["/title", "/units/k", "/points/3/note", "/source/reference/container-title"]));
    expect(pointers).not.toContain("/source/reference/title");
  });

  // The Unicode Standard: U+2028 LINE SEPARATOR and U+2029 PARAGRAPH SEPARATOR (line breaks to a YAML 1.1
  // reader, YAML 1.1 §5.4); U+202A–U+202E and U+2066–U+2069, the embeddings, overrides and isolates of the
  // bidirectional algorithm (Unicode Standard Annex #9); U+200B ZERO WIDTH SPACE; U+FDD0–U+FDEF noncharacters (§23.7).
  it.each([
    ["\u2028", "U+2028"],
    ["\u2029", "U+2029"],
    ["\u202A", "U+202A"],
    ["\u202E", "U+202E"],
    ["\u2066", "U+2066"],
    ["\u2069", "U+2069"],
    ["\u200B", "U+200B"],
    ["\uFDD0", "U+FDD0"],
    ["\uFDEF", "U+FDEF"],
  ])("refuses %j in a one-line field (title, a creator's name, a source reference's title), naming it as %s", (c, label) => {
    const doc = example();
    doc.title = `Rates${c} of OH`;
    doc.creators = [{ name: "Okafor, Maren" }, { name: `Tanaka${c}, Emi` }];
    doc.source = { reference: { type: "article-journal", title: `A${c}B` } };
    const errors = errorsOf(doc);
    for (const [pointer, at] of [
      ["/title", 6],
      ["/creators/1/name", 7],
      ["/source/reference/title", 2],
    ] as const) {
      const error = errors.find((e) => e.pointer === pointer);
      expect(error?.message, pointer).toContain(label);
      expect(error?.message, pointer).toContain(pointer);
      expect(error?.message, pointer).toContain(`at character ${at}`);
    }
  });

  it("a field written over several lines refuses the noncharacters U+FDD0–U+FDEF but takes separators and direction controls", () => {
    const doc = example();
    doc.description = "First\u2028second \u2067\u05E9\u05DC\u05D5\u05DD\u2069 end";
    expect(validateDeposit(doc).ok).toBe(true);
    doc.description = "First \uFDD5 here";
    const [error] = errorsOf(doc);
    expect(error.pointer).toBe("/description");
    expect(error.message).toContain("U+FDD5 (not a character)");
  });

  it("accepts ordinary text: accents, Greek, sub- and superscripts, emoji pairs", () => {
    expect(findForbiddenCharacters({ a: "Émile Ångström", b: "k(T) = A·exp(−Eₐ/RT) ×10⁻¹²", c: "😀" })).toEqual([]);
  });

  it("a 100 000-point document with one bad note is found by its pointer", () => {
    const points = Array.from({ length: 100_000 }, (_, i) => ({ T: 300 + (i % 100), k: 1e-12, note: "ok", bathGas: "He" }));
    points[54_321].note = "bad\u0002";
    expect(findForbiddenCharacters({ points }).map((e) => e.pointer)).toEqual(["/points/54321/note"]);
  });
});
