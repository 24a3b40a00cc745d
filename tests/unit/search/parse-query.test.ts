import { describe, expect, it } from "vitest";
import { getRdkit } from "@/lib/chem";
import { mayBeSmiles, parseQueryText, readFormula, readSpeciesTerm, repositoryIdentifierIn } from "@/lib/search/parse-query";
import { newSeriesIdentifier, versionIdentifierOf } from "@/lib/identifiers/series-code";

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
  it("reads a word as a name, and as a SMILES only when its letters are atoms a SMILES may write without brackets", () => {
    expect(readSpeciesTerm("hydroxyl")).toMatchObject({ name: true, formula: null, smiles: false, structureOnly: false });
    expect(readSpeciesTerm("CH4")).toMatchObject({ name: true, formula: "CH4", smiles: false });
    expect(readSpeciesTerm("CCO")).toMatchObject({ name: true, smiles: true });
    expect(readSpeciesTerm("ClCCl")).toMatchObject({ smiles: true });
  });
  it("hands a structure-only term to RDKit, so that a malformed one is told why, unless its letters are no SMILES's", () => {
    expect(readSpeciesTerm("C(C")).toMatchObject({ structureOnly: true, smiles: true });
    expect(readSpeciesTerm("C1CC")).toMatchObject({ smiles: true });
    // Excited oxygen as kineticists write it, and a rate constant's notation: words, not broken structures.
    expect(readSpeciesTerm("O(1D)")).toMatchObject({ structureOnly: false, smiles: false, name: true });
    expect(readSpeciesTerm("k(T)")).toMatchObject({ structureOnly: false, smiles: false });
  });
  it("reads a formula typed in lower case in capitals too", () => {
    expect(readSpeciesTerm("ch4")).toMatchObject({ name: true, formula: "CH4" });
    expect(readSpeciesTerm("oh")).toMatchObject({ formula: "HO" });
    expect(readSpeciesTerm("hcl")).toMatchObject({ formula: null });
  });
  it("reads words joined by slashes as words (a technique's RRKM/master), unless a SMILES could be written so", () => {
    expect(readSpeciesTerm("RRKM/master")).toMatchObject({ name: true, smiles: false, structureOnly: false });
    expect(readSpeciesTerm("LIF/PLP")).toMatchObject({ name: true, smiles: false, structureOnly: false });
    // F/C=C/F and CC/CC (slashes as bond directions) stay structures.
    expect(readSpeciesTerm("F/C=C/F")).toMatchObject({ structureOnly: true, smiles: true });
    expect(readSpeciesTerm("CC/CC")).toMatchObject({ structureOnly: true, smiles: true });
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

  it.each([
    ["OH+CH4", ["OH", "CH4"], []],
    ["OH+CH4->H2O+CH3", ["OH", "CH4"], ["H2O", "CH3"]],
    ["OH + CH4 <=> H2O + CH3", ["OH", "CH4"], ["H2O", "CH3"]],
    ["OH + CH4 ⇌ H2O + CH3", ["OH", "CH4"], ["H2O", "CH3"]],
    ["OH + CH4 = H2O + CH3", ["OH", "CH4"], ["H2O", "CH3"]],
    ["2CH3 -> C2H6", ["CH3"], ["C2H6"]],
    ["2 CH3 -> C2H6", ["CH3"], ["C2H6"]],
    ["O(¹D) + CH₄", ["O(1D)", "CH4"], []],
  ])("reads %s as a reaction as a mechanism or a page writes it", (q, reactants, products) => {
    const shape = parseQueryText(q);
    expect(shape.kind).toBe("reaction");
    if (shape.kind !== "reaction") return;
    expect(shape.reactants.map((t) => t.text)).toEqual(reactants);
    expect(shape.products.map((t) => t.text)).toEqual(products);
  });

  it("reads subscripts as digits, and keeps a SMILES's double bond and charges whole", () => {
    expect(parseQueryText("CH₄")).toMatchObject({ kind: "species", term: { text: "CH4", formula: "CH4" } });
    expect(parseQueryText("C=C")).toMatchObject({ kind: "species", term: { text: "C=C", structureOnly: true } });
    expect(parseQueryText("C[N+](C)(C)C")).toMatchObject({ kind: "species" });
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

describe("mayBeSmiles", () => {
  // The check only spares RDKit a parse: it must never turn away a text RDKit reads as a structure.
  // The strings are SMILES of real molecules written by hand (common practice, OpenSMILES organic subset)
  // and names and formulas of the demo's species.
  const smiles = ["C", "CC", "CCO", "c1ccccc1", "c1ccncc1", "O=O", "N#N", "[OH]", "[O][N]=O", "Cl", "ClCCl", "BrC", "I", "ICl"];
  const others = ["FC(F)(F)F", "[2H]C", "[Na+].[Cl-]", "C1CC1", "CO", "NO", "S", "P", "B", "OC(=O)C", "C/C=C/C", "[C@@H](O)(F)Cl"];
  const notSmiles = ["hydroxyl", "methane", "OH", "CH4", "HO2", "H2O", "ethanol", "Tanaka", "1-fluoro-4-hydroxypentane", "Ar", "He", "Xe"];

  it("is true for every text RDKit reads and false for plain names and formulas with hydrogen", async () => {
    const rdkit = await getRdkit();
    const reads = (t: string) => {
      const mol = rdkit.get_mol(t);
      const ok = mol !== null && mol.is_valid();
      mol?.delete();
      return ok;
    };
    for (const t of [...smiles, ...others]) {
      expect(reads(t), t).toBe(true);
      expect(mayBeSmiles(t), t).toBe(true);
    }
    for (const t of notSmiles) {
      expect(mayBeSmiles(t), t).toBe(false);
      expect(reads(t), t).toBe(false);
    }
  });

  it("looks only outside brackets, and refuses an unbalanced bracket", () => {
    expect(mayBeSmiles("[Fe+2]")).toBe(true);
    expect(mayBeSmiles("[nH]1cccc1")).toBe(true);
    expect(mayBeSmiles("C[")).toBe(false);
    expect(mayBeSmiles("C]")).toBe(false);
  });
});

describe("repositoryIdentifierIn", () => {
  it("recognises this repository's identifiers as printed (bare, doi:, the resolver's address), and nothing else", () => {
    const series = newSeriesIdentifier("10.5072", 12345);
    const version = versionIdentifierOf(series, 2);
    expect(repositoryIdentifierIn(version)).toBe(version);
    expect(repositoryIdentifierIn(`doi:${version}`)).toBe(version);
    expect(repositoryIdentifierIn(`https://doi.org/${series}`)).toBe(series);
    expect(repositoryIdentifierIn(` ${version.toLowerCase()} `)).toBe(version);
    // A paper's DOI is searched as words; so is anything else.
    expect(repositoryIdentifierIn("10.1021/jp123456x")).toBeNull();
    expect(repositoryIdentifierIn("OH + CH4")).toBeNull();
  });
});
