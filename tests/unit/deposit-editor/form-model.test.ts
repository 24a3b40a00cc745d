import { describe, expect, it } from "vitest";
import { blankForm, documentToForm, formToDocument, pointToRow } from "@/components/deposit-editor/form-model";
import { resolveFieldPointer } from "@/components/deposit-editor/pointers";
import { EXAMPLE_DEPOSIT } from "@/lib/deposits/example";
import type { DepositDocument } from "@/lib/deposits/types";
import { validateDeposit } from "@/lib/deposits/validate";

const person = { name: "Okafor, Maren", orcid: "0000-0002-1825-0097", affiliation: "Example Institute of Physical Chemistry" };

describe("blankForm", () => {
  it("starts a gas-phase, second-order deposit in K and cm3 molecule-1 s-1 under CC-BY-4.0, with the signed-in person as first creator", () => {
    const form = blankForm(person);
    expect(form.units).toMatchObject({ k: "cm3 molecule-1 s-1", T: "K" });
    expect(form.reaction).toMatchObject({ order: 2, phase: "gas" });
    expect(form.license).toBe("CC-BY-4.0");
    expect(form.creators).toEqual([person]);
    expect(form.points).toEqual([]);
  });

  it("leaves ORCID and affiliation empty when the person has none", () => {
    expect(blankForm({ name: "Lindqvist, Tomas", orcid: null, affiliation: null }).creators).toEqual([
      { name: "Lindqvist, Tomas", orcid: "", affiliation: "" },
    ]);
  });

  it("gives a document the server refuses with a pointer per missing field, each of which the editor shows beside an input", () => {
    const form = blankForm(person);
    const { document, problems } = formToDocument(form);
    expect(problems).toEqual([]);
    const result = validateDeposit(document);
    expect(result.ok).toBe(false);
    if (result.ok) return;
    const pointers = result.errors.map((e) => e.pointer);
    expect(pointers).toEqual(expect.arrayContaining(["/title", "/description", "/reaction/class", "/method/technique", "/points"]));
    for (const e of result.errors) {
      if (e.pointer === "") continue;
      expect({ pointer: e.pointer, field: resolveFieldPointer(e.pointer, form) }).not.toEqual({ pointer: e.pointer, field: null });
    }
  });
});

describe("documentToForm and formToDocument", () => {
  it("give back the example document unchanged", () => {
    const { document, problems } = formToDocument(documentToForm(EXAMPLE_DEPOSIT));
    expect(problems).toEqual([]);
    expect(document).toEqual(EXAMPLE_DEPOSIT);
  });

  it("keep per-row uncertainty kind and coverage, and a row's own pressure and bath gas", () => {
    const form = documentToForm(EXAMPLE_DEPOSIT);
    expect(form.points[5]).toMatchObject({ u: "8", uKind: "relative", uConfidence: "2sigma" });
    expect(form.points[8]).toMatchObject({ u: "1.1", uKind: "factor", uConfidence: "" });
    expect(form.points[7]).toMatchObject({ pressure: "100" });
    expect(form.points[9]).toMatchObject({ bathGas: "N2" });
  });

  it("read numbers written with a Unicode minus or a Fortran exponent", () => {
    const form = documentToForm(EXAMPLE_DEPOSIT);
    form.points[0] = { ...form.points[0], k: "2.09D-15" };
    form.reportedFit = { ...form.reportedFit, Ea: "\u22121.5" };
    const { document, problems } = formToDocument(form);
    expect(problems).toEqual([]);
    expect(document.points[0].k).toBe(2.09e-15);
    expect(document.reportedFit?.Ea).toBe(-1.5);
  });

  it("flag an unreadable number at the server's pointer and send it as text, so the schema names it too", () => {
    const form = documentToForm(EXAMPLE_DEPOSIT);
    form.points[3] = { ...form.points[3], k: "5.89e-1x" };
    const { document, problems } = formToDocument(form);
    expect(problems).toEqual([expect.objectContaining({ pointer: "/points/3/k", value: "5.89e-1x" })]);
    const result = validateDeposit(document);
    expect(result.ok).toBe(false);
    if (!result.ok) expect(result.errors.map((e) => e.pointer)).toContain("/points/3/k");
  });

  it("send a blank required cell as empty text so the problem names the row, not the list", () => {
    const form = documentToForm(EXAMPLE_DEPOSIT);
    form.points[2] = { ...form.points[2], T: "" };
    const result = validateDeposit(formToDocument(form).document);
    expect(result.ok).toBe(false);
    if (!result.ok) expect(result.errors.map((e) => e.pointer)).toContain("/points/2/T");
  });

  it("split authors on semicolons (Family, Given) and keep a name without a comma whole", () => {
    const form = documentToForm(EXAMPLE_DEPOSIT);
    form.source = {
      ...form.source,
      refTitle: "Rate constants of an example",
      refAuthors: "Okafor, Maren; Example Kinetics Consortium",
      refJournal: "Example Journal",
      refYear: "2021",
    };
    const ref = formToDocument(form).document.source.reference;
    expect(ref).toEqual({
      type: "article-journal",
      title: "Rate constants of an example",
      author: [{ family: "Okafor", given: "Maren" }, { literal: "Example Kinetics Consortium" }],
      "container-title": "Example Journal",
      issued: { "date-parts": [[2021]] },
    });
    expect(validateDeposit(formToDocument(form).document).ok).toBe(true);
  });

  it("keep a stored reference's other CSL fields, and its month while the year is unchanged", () => {
    const doc: DepositDocument = {
      ...EXAMPLE_DEPOSIT,
      source: { reference: { type: "article-journal", title: "T", volume: 12, page: "100-110", issued: { "date-parts": [[2020, 5, 3]] } } },
    };
    const form = documentToForm(doc);
    expect(formToDocument(form).document.source).toEqual(doc.source);
    form.source = { ...form.source, refYear: "2019" };
    expect(formToDocument(form).document.source.reference).toEqual({
      type: "article-journal",
      title: "T",
      volume: 12,
      page: "100-110",
      issued: { "date-parts": [[2019]] },
    });
  });

  it("write the solvent only for the liquid phase and the surface only for the surface phase", () => {
    const form = documentToForm(EXAMPLE_DEPOSIT);
    form.reaction = { ...form.reaction, solventName: "water", surface: "Pt(111)" };
    expect(formToDocument(form).document.reaction).not.toHaveProperty("solvent");
    expect(formToDocument(form).document.reaction).not.toHaveProperty("surface");
    form.reaction = { ...form.reaction, phase: "liquid" };
    expect(formToDocument(form).document.reaction.solvent).toEqual({ name: "water" });
    form.reaction = { ...form.reaction, phase: "surface" };
    expect(formToDocument(form).document.reaction.surface).toBe("Pt(111)");
  });

  it("leave out empty product rows when the products were not identified", () => {
    const form = documentToForm(EXAMPLE_DEPOSIT);
    form.reaction = {
      ...form.reaction,
      products: [{ name: "", smiles: "", inchi: "", coefficient: "1" }],
      productsUnknown: true,
      productsUnknownReason: "overall removal of OH measured",
    };
    const doc = formToDocument(form).document;
    expect(doc.reaction.products).toEqual([]);
    expect(doc.reaction.productsUnknown).toEqual({ reason: "overall removal of OH measured" });
    expect(validateDeposit(doc).ok).toBe(true);
  });

  it("write a pressure range, and the pressure unit only when some pressure is given", () => {
    const form = documentToForm(EXAMPLE_DEPOSIT);
    form.conditions = { ...form.conditions, pressureMode: "range", pressureMin: "10", pressureMax: "700" };
    expect(formToDocument(form).document.conditions?.pressure).toEqual({ min: 10, max: 700 });
    form.conditions = { ...form.conditions, pressureMode: "none" };
    form.points = form.points.map((p) => ({ ...p, pressure: "" }));
    const doc = formToDocument(form).document;
    expect(doc.conditions).not.toHaveProperty("pressure");
    expect(doc.units).toEqual({ k: "cm3 molecule-1 s-1", T: "K" });
  });

  it("split keywords on commas and drop empty ones", () => {
    const form = blankForm(person);
    form.keywords = " methane, , hydroxyl radical ,";
    expect(formToDocument(form).document.keywords).toEqual(["methane", "hydroxyl radical"]);
  });
});

describe("pointToRow", () => {
  it("shows numbers as plain text and an absent coverage as not stated", () => {
    expect(pointToRow({ T: 298, k: 6.1e-15, uncertainty: { kind: "absolute", value: 5e-16 } })).toEqual({
      T: "298",
      k: "6.1e-15",
      u: "5e-16",
      uKind: "absolute",
      uConfidence: "",
      pressure: "",
      bathGas: "",
      note: "",
    });
  });
});
