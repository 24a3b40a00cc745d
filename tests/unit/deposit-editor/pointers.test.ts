import { describe, expect, it } from "vitest";
import { blankForm, documentToForm } from "@/components/deposit-editor/form-model";
import {
  fieldId,
  groupErrors,
  isWithin,
  mergeProblems,
  pointRowOf,
  resolveFieldPointer,
  sectionOf,
} from "@/components/deposit-editor/pointers";
import { EXAMPLE_DEPOSIT } from "@/lib/deposits/example";

const form = documentToForm(EXAMPLE_DEPOSIT);

describe("resolveFieldPointer", () => {
  it.each([
    ["/title", "/title"],
    ["/reaction/reactants/0/smiles", "/reaction/reactants/0/smiles"],
    ["/reaction/reactants/1", "/reaction/reactants/1/smiles"],
    ["/points/3/k", "/points/3/k"],
    ["/points/3/uncertainty/value", "/points/3/uncertainty"],
    ["/points/3", "/points/3"],
    ["/keywords/2", "/keywords"],
    ["/creators/1", "/creators/1/name"],
    ["/source", "/source/doi"],
    ["/source/reference/author/0/family", "/source/reference/author"],
    ["/conditions/pressure", "/conditions/pressure"],
    ["/conditions/pressure/value", "/conditions/pressure/value"],
    ["/reportedFit/A", "/reportedFit/A"],
  ])("shows %s at %s", (pointer, field) => {
    expect(resolveFieldPointer(pointer, form)).toBe(field);
  });

  it("finds no place for the document as a whole, or for rows and fields not on the form", () => {
    expect(resolveFieldPointer("", form)).toBeNull();
    expect(resolveFieldPointer("/points/99/k", form)).toBe("/points");
    expect(resolveFieldPointer("/reaction/solvent", form)).toBeNull();
    expect(resolveFieldPointer("/$schema", form)).toBeNull();
  });

  it("shows solvent problems only when the phase is liquid, and the products' reason only when they are unknown", () => {
    const liquid = { ...form, reaction: { ...form.reaction, phase: "liquid" as const, productsUnknown: true } };
    expect(resolveFieldPointer("/reaction/solvent", liquid)).toBe("/reaction/solvent/name");
    expect(resolveFieldPointer("/reaction/productsUnknown", liquid)).toBe("/reaction/productsUnknown/reason");
    expect(resolveFieldPointer("/reaction/productsUnknown/reason", form)).toBeNull();
  });

  it("shows n of a reported expression only for the modified form", () => {
    expect(resolveFieldPointer("/reportedFit/n", form)).toBe("/reportedFit");
    const modified = { ...form, reportedFit: { ...form.reportedFit, model: "modified_arrhenius" as const } };
    expect(resolveFieldPointer("/reportedFit/n", modified)).toBe("/reportedFit/n");
    const none = blankForm();
    expect(resolveFieldPointer("/reportedFit/A", none)).toBeNull();
  });
});

describe("groupErrors", () => {
  it("puts problems beside their inputs, once per message, and the rest in the summary with their section", () => {
    const grouped = groupErrors(
      [
        { pointer: "/title", message: "Title is too short." },
        { pointer: "/title", message: "Title is too short." },
        { pointer: "/points/2/uncertainty/value", message: "must be greater than 0" },
        { pointer: "/reaction/solvent", message: "Solvent is required when the phase is liquid." },
        { pointer: "", message: "Showing the first 200 of 340 problems." },
      ],
      form,
    );
    expect(grouped.byField.get("/title")).toEqual(["Title is too short."]);
    expect(grouped.byField.get("/points/2/uncertainty")).toEqual(["Row 3, uncertainty: must be greater than 0."]);
    expect(grouped.unplaced.map((u) => [u.error.pointer, u.section])).toEqual([
      ["/reaction/solvent", "reaction"],
      ["", null],
    ]);
  });
});

describe("small helpers", () => {
  it("name inputs after their pointer", () => {
    expect(fieldId("/reaction/reactants/0/smiles")).toBe("field-reaction-reactants-0-smiles");
    expect(fieldId("/source/reference/container-title")).toBe("field-source-reference-container-title");
  });

  it("find the section and the row of a pointer", () => {
    expect(sectionOf("/units/pressure")).toBe("conditions");
    expect(sectionOf("/units/k")).toBe("data");
    expect(sectionOf("/relatedIdentifiers/0/identifier")).toBe("credit");
    expect(sectionOf("/creators/0/name")).toBe("credit");
    expect(sectionOf("/funding/1/funder")).toBe("credit");
    expect(sectionOf("/license")).toBe("about");
    expect(sectionOf("")).toBeNull();
    expect(pointRowOf("/points/12/k")).toBe(12);
    expect(pointRowOf("/points/12")).toBe(12);
    expect(pointRowOf("/points")).toBeNull();
  });

  it("tell whether a field lies inside a pointer", () => {
    expect(isWithin("/points/3/k", "/points")).toBe(true);
    expect(isWithin("/points", "/points")).toBe(true);
    expect(isWithin("/pointsX", "/points")).toBe(false);
  });
});

describe("mergeProblems", () => {
  it("shows a cell the form cannot read once: the form's words, not the server's second \"must be a number\"", () => {
    const local = [{ pointer: "/points/2/k", message: '"1.2x" is not a number; write it like 1.2e-11 or 1,2e-11.' }];
    const server = [
      { pointer: "/points/2/k", message: "Point 3: rate constant must be a number." },
      { pointer: "/points/2/uncertainty/value", message: "must be a number" },
      { pointer: "/points/3/k", message: "must be greater than 0" },
    ];
    const merged = mergeProblems(local, server, [{ pointer: "/reaction/products", message: "not balanced" }]);
    expect(merged.map((e) => e.pointer)).toEqual(["/points/2/k", "/points/2/uncertainty/value", "/points/3/k", "/reaction/products"]);
    const withinLocal = mergeProblems([{ pointer: "/points/2/uncertainty", message: "x" }], server);
    expect(withinLocal.map((e) => e.pointer)).toEqual(["/points/2/uncertainty", "/points/2/k", "/points/3/k"]);
    const grouped = groupErrors(merged, form);
    expect(grouped.byField.get("/points/2/k")).toHaveLength(1);
  });
});
