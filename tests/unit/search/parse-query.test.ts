import { describe, expect, it } from "vitest";
import { parseQueryText, readFormula, readSpeciesTerm } from "@/lib/search/parse-query";

describe("readFormula", () => {
  // Hill order (E. A. Hill, J. Am. Chem. Soc. 22, 478 (1900)): C, H, then alphabetical; without C all alphabetical.
  it.each([
    ["CH4", "CH4"],
    ["OH", "HO"],
    ["H2O", "H2O"],
    ["C2H6", "C2H6"],
    ["CH3OH", "CH4O"],
    ["ClO", "ClO"],
    ["HCl", "ClH"],
    ["C", "C"],
  ])("%s reads as %s", (text, hill) => expect(readFormula(text)).toBe(hill));

  it.each(["methane", "Tanaka", "Xy2", "C0", "ch4", "CH4+"])("%s is not a formula", (text) => expect(readFormula(text)).toBeNull());
});

describe("readSpeciesTerm", () => {
  it("reads C as a SMILES, a formula and a name at once (the readings are united)", () => {
    expect(readSpeciesTerm("C")).toMatchObject({ name: true, formula: "C", smiles: true, structureOnly: false });
  });
  it("reads bracketed text as a structure only", () => {
    expect(readSpeciesTerm("[OH]")).toMatchObject({ name: false, formula: null, smiles: true, structureOnly: true });
  });
  it("recognises an InChI and an InChIKey", () => {
    expect(readSpeciesTerm("InChI=1S/CH4/h1H4")).toMatchObject({ inchi: true, structureOnly: true, name: false });
    expect(readSpeciesTerm("VNWKTOKETHGBQD-UHFFFAOYSA-N")).toMatchObject({ inchiKey: true, name: false, smiles: false });
  });
  it("reads a word as a name and maybe a SMILES", () => {
    expect(readSpeciesTerm("hydroxyl")).toMatchObject({ name: true, formula: null, smiles: true, structureOnly: false });
  });
});

describe("parseQueryText", () => {
  it("reads nothing as everything", () => expect(parseQueryText("   ")).toEqual({ kind: "all" }));

  it("reads free text with spaces, keeping the whole text as a possible name", () => {
    const shape = parseQueryText("flash photolysis");
    expect(shape).toMatchObject({ kind: "text", text: "flash photolysis", name: { text: "flash photolysis", name: true, smiles: false } });
  });

  it.each(["OH", "hydroxyl", "CH4", "C", "Tanaka", "InChI=1S/CH4/h1H4", "VNWKTOKETHGBQD-UHFFFAOYSA-N", "[O-][O+]=O", "C+"])(
    "reads %s as one species term",
    (q) => expect(parseQueryText(q)).toMatchObject({ kind: "species", term: { text: q } }),
  );

  it("reads OH + CH4 as two reactants, any products", () => {
    const shape = parseQueryText("OH + CH4");
    expect(shape).toMatchObject({ kind: "reaction", otherReactants: false, products: [] });
    expect(shape.kind === "reaction" && shape.reactants.map((t) => t.text)).toEqual(["OH", "CH4"]);
  });

  it("reads OH + * as every reaction of OH", () => {
    const shape = parseQueryText("OH + *");
    expect(shape).toMatchObject({ kind: "reaction", otherReactants: true, products: [] });
    expect(shape.kind === "reaction" && shape.reactants.map((t) => t.text)).toEqual(["OH"]);
  });

  it.each(["CH4 -> CH3", "CH4 → CH3", "CH4=>CH3", "CH4 => CH3"])("reads %s as reactant and product", (q) => {
    const shape = parseQueryText(q);
    expect(shape.kind).toBe("reaction");
    if (shape.kind !== "reaction") return;
    expect(shape.reactants.map((t) => t.text)).toEqual(["CH4"]);
    expect(shape.products.map((t) => t.text)).toEqual(["CH3"]);
  });

  it("reads a side with only * or nothing as anything", () => {
    expect(parseQueryText("-> CH3")).toMatchObject({ kind: "reaction", reactants: [], otherReactants: true });
    expect(parseQueryText("CH4 ->")).toMatchObject({ kind: "reaction", products: [] });
  });

  it("keeps a name with spaces as one term of a pattern", () => {
    const shape = parseQueryText("hydroxyl radical + methane");
    expect(shape.kind === "reaction" && shape.reactants.map((t) => t.text)).toEqual(["hydroxyl radical", "methane"]);
  });

  it("reads a reaction key as such", () => {
    const key = "TUJKJAMUKRIRHC-UHFFFAOYSA-N+VNWKTOKETHGBQD-UHFFFAOYSA-N>>WCYWZMWISLQXQU-UHFFFAOYSA-N+XLYOFNOQVPJJNP-UHFFFAOYSA-N";
    expect(parseQueryText(key)).toEqual({ kind: "reactionKey", key });
    expect(parseQueryText("2*WCYWZMWISLQXQU-UHFFFAOYSA-N>>*")).toMatchObject({ kind: "reactionKey" });
  });

  it("keeps SQL and markup as text", () => {
    expect(parseQueryText("'; drop table datasets; --")).toMatchObject({ kind: "text" });
    expect(parseQueryText("<script>alert(1)</script>")).toMatchObject({ kind: "species" });
  });
});
