import { describe, expect, it } from "vitest";
import { conflictFields, mergeDocuments } from "@/components/deposit-editor/conflict";
import { blankPoint, documentToForm, formToDocument } from "@/components/deposit-editor/form-model";
import { describeWhere, readinessItems } from "@/components/deposit-editor/readiness";
import { validityRangeWarning } from "@/components/deposit-editor/validity-range";
import { blockingChecks, checkPointer } from "@/components/deposit-editor/words";
import { EXAMPLE_DEPOSIT } from "@/lib/deposits/example";

const example = () => structuredClone(EXAMPLE_DEPOSIT) as unknown as Record<string, unknown>;

describe("readinessItems", () => {
  it("names where each problem is, links its input, and keeps the order of the form", () => {
    const form = documentToForm(EXAMPLE_DEPOSIT);
    const items = readinessItems(
      [
        { pointer: "/points/1/k", message: "k must be above zero." },
        { pointer: "/reaction/reactants/0/smiles", message: "Not a SMILES." },
        { pointer: "", message: "Something about the whole document." },
        { pointer: "/points/1/k", message: "k must be above zero." },
      ],
      form,
    );
    expect(items.map((i) => [i.where, i.targetId, i.row])).toEqual([
      ["The document as a whole", null, null],
      ["Reaction, reactant 1, SMILES", "field-reaction-reactants-0-smiles", null],
      ["Rate constants, row 2, k", "field-points-1-k", 1],
    ]);
  });

  it("lists a stored check that stops submission beside the reaction's species (balance)", () => {
    const form = documentToForm(EXAMPLE_DEPOSIT);
    const checks = [
      { code: "unbalanced", severity: "error", message: "Unbalanced: products have 1 more H than reactants" },
      { code: "balanced", severity: "info", message: "Balanced" },
    ];
    const errors = blockingChecks(checks).map((c) => ({ pointer: checkPointer(c.code), message: c.message }));
    expect(readinessItems(errors, form).map((i) => [i.where, i.message, i.targetId])).toEqual([
      ["Reaction, products", "Unbalanced: products have 1 more H than reactants.", "field-reaction-products"],
    ]);
  });

  it("puts the schema's length rules in plain words", () => {
    const form = documentToForm(EXAMPLE_DEPOSIT);
    const items = readinessItems(
      [
        { pointer: "/method/technique", message: 'Technique must be at least 2 characters long (got "").' },
        { pointer: "/points", message: "Points must have at least 2 entries (it has 0)." },
      ],
      form,
    );
    expect(items.map((i) => `${i.where}: ${i.message}`)).toEqual([
      "How k was obtained, technique: Write at least two characters.",
      "Rate constants: Add at least two rows (there are none yet).",
    ]);
    expect(describeWhere("/keywords/0")).toBe("Title and summary, keyword 1");
  });

  it("says where list items and nested fields are", () => {
    expect(describeWhere("/creators/2/orcid")).toBe("People, grants and links, person 3, ORCID");
    expect(describeWhere("/reportedFit/Tmin")).toBe("The authors' expression, valid from");
    expect(describeWhere("/source/reference/container-title")).toBe("Where the numbers were published, reference, journal");
  });

  it("loads an incomplete draft (most of it missing) into the form without throwing", () => {
    const form = documentToForm({ title: "Half done", points: [{ T: "29o", k: 1e-12 }] });
    expect(form.title).toBe("Half done");
    expect(form.points[0].T).toBe("29o");
    expect(formToDocument(form).problems.map((p) => p.pointer)).toEqual(["/points/0/T"]);
  });
});

describe("conflictFields and mergeDocuments", () => {
  it("lists the fields where the drafts differ, proposing theirs only where I left the field as it was", () => {
    const base = example();
    const mine = example();
    const theirs = example();
    mine.title = "My title";
    (mine.points as { k: number }[])[0].k = 1.5e-12;
    (theirs.points as { k: number }[])[1].k = 9.9e-13;
    (theirs.method as Record<string, unknown>).technique = "Their technique";
    const fields = conflictFields(base, mine, theirs);
    expect(fields.map((f) => [f.pointer, f.proposed, f.changedBy])).toEqual([
      ["/title", "mine", "me"],
      ["/method/technique", "theirs", "them"],
      ["/points/0", "mine", "me"],
      ["/points/1", "theirs", "them"],
    ]);
    const merged = mergeDocuments(mine, theirs, fields, {});
    expect(merged.title).toBe("My title");
    expect((merged.method as Record<string, unknown>).technique).toBe("Their technique");
    expect((merged.points as { k: number }[]).slice(0, 2).map((p) => p.k)).toEqual([1.5e-12, 9.9e-13]);
    // Taking theirs everywhere still keeps what only I changed; the rest is theirs.
    const all = Object.fromEntries(fields.map((f) => [f.pointer, "theirs" as const]));
    expect(mergeDocuments(mine, theirs, fields, all)).toEqual({ ...theirs, title: "My title", points: merged.points });
  });

  it("lists a field both changed with mine proposed, and takes theirs there only when chosen", () => {
    const base = example();
    const mine = example();
    const theirs = example();
    mine.description = "Mine";
    theirs.description = "Theirs";
    const fields = conflictFields(base, mine, theirs);
    expect(fields.map((f) => [f.pointer, f.proposed, f.changedBy])).toEqual([["/description", "mine", "both"]]);
    expect(mergeDocuments(mine, theirs, fields, {}).description).toBe("Mine");
    expect(mergeDocuments(mine, theirs, fields, { "/description": "theirs" }).description).toBe("Theirs");
  });

  it("compares against the form as it is at merge time: a field typed after the conflict is kept", () => {
    // The co-editor changed the keywords; I sent a description, then typed a title while the panel was open.
    const base = example();
    const theirs = example();
    theirs.keywords = ["theirs"];
    const sent = example();
    sent.description = "My description";
    const now = { ...structuredClone(sent), title: "My later title" };
    const fields = conflictFields(base, now, theirs);
    expect(fields.map((f) => [f.pointer, f.changedBy])).toEqual(
      expect.arrayContaining([
        ["/title", "me"],
        ["/description", "me"],
      ]),
    );
    const merged = mergeDocuments(now, theirs, fields, Object.fromEntries(fields.map((f) => [f.pointer, "theirs" as const])));
    expect(merged.title).toBe("My later title");
    expect(merged.description).toBe("My description");
    expect(merged.keywords).toEqual(["theirs"]);
  });

  it("keeps rows I added and drops rows I removed when I choose mine; an optional part I added appears", () => {
    const base = example();
    const mine = example();
    const theirs = example();
    const rows = mine.points as unknown[];
    rows.splice(0, 1);
    rows.push({ T: 500, k: 4e-12 });
    mine.keywords = ["added"];
    const fields = conflictFields(base, mine, theirs);
    const merged = mergeDocuments(mine, theirs, fields, Object.fromEntries(fields.map((f) => [f.pointer, "mine" as const])));
    expect(merged).toEqual(mine);
  });
});

describe("validityRangeWarning", () => {
  const withRange = (Tmin: string, Tmax: string, rangeUnit: string) => {
    const form = documentToForm(EXAMPLE_DEPOSIT);
    return { ...form, reportedFit: { ...form.reportedFit, Tmin, Tmax, rangeUnit } };
  };

  it("is silent when the range meets the data", () => {
    expect(validityRangeWarning(withRange("250", "420", "K"))).toBeNull();
  });

  it("says a range below the data in kelvin would cover it in °C (0 °C = 273.15 K, CODATA/SI definition)", () => {
    const warning = validityRangeWarning(withRange("25", "150", "K"));
    expect(warning).toMatch(/lies wholly below the measured temperatures/);
    expect(warning).toMatch(/Read in °C the same numbers would match the data much better/);
    // One end only: written as a reader writes it, no trailing zeros.
    expect(validityRangeWarning(withRange("", "127", "K"))).toMatch(/\(up to 127 K\)/);
  });

  // The example's data run 250–420 K. The rule: an end beyond T/1.5 or 1.5·T of the data, or less
  // than half of the range within the data (our own thresholds, REACH_FACTOR and MIN_COVERED).
  it("flags a range reaching well beyond the data, and is silent for one a little wider", () => {
    const celsius = validityRangeWarning(withRange("20", "300", "degC")); // 293.15–573.15 K: 45 % within the data
    expect(celsius).toMatch(/reaches well beyond the measured temperatures \(250–420 K\)/);
    expect(celsius).not.toMatch(/Read in/);
    expect(validityRangeWarning(withRange("250", "1000", "K"))).toMatch(/reaches well beyond/); // 1000 > 1.5 × 420
    expect(validityRangeWarning(withRange("200", "500", "K"))).toBeNull();
  });

  it("flags a range above the data, and waits until there are rows", () => {
    expect(validityRangeWarning(withRange("2000", "3000", "K"))).toMatch(/wholly above/);
    const empty = withRange("2000", "3000", "K");
    expect(validityRangeWarning({ ...empty, points: [blankPoint()] })).toBeNull();
  });
});
