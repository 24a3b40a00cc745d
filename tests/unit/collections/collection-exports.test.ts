import { describe, expect, it } from "vitest";
import { parse } from "yaml";
import {
  buildCollectionCanteraYaml,
  buildCollectionTable,
  cmMolUnit,
  type CollectionExportHeader,
} from "@/lib/collections/mechanism-export";
import { buildCollectionDoiMetadata } from "@/lib/identifiers/datacite";
import type { MechanismSubject } from "@/lib/exports/mechanism";
// Source: CODATA 2018 recommended values (N_A exact since the 2019 SI): tests/fixtures/units-codata2018.json.
import codata from "@/tests/fixtures/units-codata2018.json";

const N_A = codata.constants_CODATA2018.N_A_per_mol;

/** Invented members: a bimolecular Arrhenius fit and a unimolecular modified Arrhenius fit (canonical units: molecule, cm, s, J/mol). */
const species = (key: string, formula: string, name: string) => ({ inchiKey: key, formula, charge: 0, depositedName: name, name });
const oh = species("AAAAAAAAAAAAAA-UHFFFAOYSA-N", "HO", "hydroxyl");
const ch4 = species("BBBBBBBBBBBBBB-UHFFFAOYSA-N", "CH4", "methane");
const h2o = species("CCCCCCCCCCCCCC-UHFFFAOYSA-N", "H2O", "water");
const ch3 = species("DDDDDDDDDDDDDD-UHFFFAOYSA-N", "CH3", "methyl");
const c2h6 = species("EEEEEEEEEEEEEE-UHFFFAOYSA-N", "C2H6", "ethane");
const base = {
  kind: "version" as const,
  sources: [],
  landingPage: "https://arrhenia.invalid/x",
  citation: null,
  engineVersion: null,
  retraction: null,
  caution: "Caution.",
};
const bimolecular: MechanismSubject = {
  ...base,
  title: "Invented OH + CH4",
  equation: "hydroxyl + methane → water + methyl",
  participants: [
    { ...oh, side: "reactant", coefficient: 1 },
    { ...ch4, side: "reactant", coefficient: 1 },
    { ...h2o, side: "product", coefficient: 1 },
    { ...ch3, side: "product", coefficient: 1 },
  ],
  order: 2,
  identifier: "10.5072/ARH-AAAA-AAAA/1",
  range: { Tmin: 250, Tmax: 420 },
  fits: [{ model: "arrhenius", lnA: Math.log(2.45e-12), n: 0, Ea: 15000, T0: 298.15 }],
  preferred: "arrhenius",
};
const unimolecular: MechanismSubject = {
  ...base,
  title: "Invented ethane dissociation",
  equation: "ethane → 2 methyl",
  participants: [
    { ...c2h6, side: "reactant", coefficient: 1 },
    { ...ch3, side: "product", coefficient: 2 },
  ],
  order: 1,
  identifier: "10.5072/ARH-BBBB-BBBB/2",
  range: { Tmin: 900, Tmax: 1400 },
  fits: [
    { model: "arrhenius", lnA: Math.log(1e16), n: 0, Ea: 360000, T0: 298.15 },
    { model: "modified_arrhenius", lnA: Math.log(3e15), n: 0.5, Ea: 355000, T0: 298.15 },
  ],
  preferred: "modified_arrhenius",
};
const header: CollectionExportHeader = {
  title: "Invented collection",
  versionNumber: 1,
  identifier: "10.5072/ARH-CCCC-CCCC/1",
  landingPage: "https://arrhenia.invalid/collections/1/versions/1",
  citation: "Tanaka, Emi (2026). Invented collection. Version 1. Arrhenia. doi:10.5072/ARH-CCCC-CCCC/1",
  caution: "Extrapolation outside the measured range is unreliable.",
  skipped: [{ label: "Invented without a fit, version 1", reason: "no fit to export" }],
};

describe("a collection's combined mechanism parameters", () => {
  it("writes one Cantera YAML file in cm–mol units, one reaction a member, each commented with its version identifier", () => {
    const text = buildCollectionCanteraYaml(header, [bimolecular, unimolecular], "kJ mol-1");
    const doc = parse(text);
    expect(doc.units).toEqual({ length: "cm", quantity: "mol", time: "s", "activation-energy": "kJ/mol" });
    expect(doc.reactions.map((r: { equation: string }) => r.equation)).toEqual(["OH + CH4 => H2O + CH3", "C2H6 => 2 CH3"]);
    // cm³ molecule⁻¹ s⁻¹ → cm³ mol⁻¹ s⁻¹ multiplies by N_A (CODATA 2018).
    expect(doc.reactions[0]["rate-constant"].A / (2.45e-12 * N_A)).toBeCloseTo(1, 12);
    expect(doc.reactions[0]["rate-constant"].Ea).toBeCloseTo(15, 12);
    // The preferred modified Arrhenius fit: A′ = A / T0^n (first order: no unit factor).
    expect(doc.reactions[1]["rate-constant"]).toMatchObject({ b: 0.5 });
    expect(doc.reactions[1]["rate-constant"].A / (3e15 / Math.sqrt(298.15))).toBeCloseTo(1, 12);
    expect(text).toContain("# doi:10.5072/ARH-AAAA-AAAA/1 — hydroxyl + methane → water + methyl");
    expect(text).toContain("# doi:10.5072/ARH-BBBB-BBBB/2 — ethane → 2 methyl");
    expect(text).toContain("# doi:10.5072/ARH-CCCC-CCCC/1");
    expect(doc.description).toContain("caution: Extrapolation outside the measured range is unreliable.");
    expect(doc.description).toContain("not included: Invented without a fit, version 1 (no fit to export)");
    // Every species once, with one name in the whole file.
    expect(doc["species-identities"].map((s: { name: string }) => s.name)).toEqual(["OH", "CH4", "H2O", "CH3", "C2H6"]);
  });

  it("writes the plain-text tables one after another, each naming its version identifier", () => {
    const text = buildCollectionTable(header, [bimolecular, unimolecular], "kcal mol-1");
    expect(text.split("version identifier: doi:")).toHaveLength(3);
    expect(text).toContain("Reaction 2 of 2");
    expect(text).toContain(`A (${cmMolUnit(2)})`);
    expect(cmMolUnit(1)).toBe("s-1");
    expect(cmMolUnit(2)).toBe("cm3 mol-1 s-1");
  });
});

describe("a collection version's DataCite metadata", () => {
  it("is a Collection with HasPart for every member and its neighbours as versions", () => {
    const body = buildCollectionDoiMetadata({
      doi: "10.5072/ARH-CCCC-CCCC/2",
      baseUrl: "https://arrhenia.invalid/",
      collectionId: 4,
      versionNumber: 2,
      title: "Invented collection",
      description: "",
      publishedAt: new Date("2026-05-01T00:00:00Z"),
      ownerName: "Emi Tanaka",
      ownerOrcid: "0000-0002-1825-0097",
      memberIdentifiers: ["10.5072/ARH-AAAA-AAAA/1", "10.5072/ARH-BBBB-BBBB/2"],
      previousVersionIdentifier: "10.5072/ARH-CCCC-CCCC/1",
      nextVersionIdentifier: null,
    });
    const a = body.data.attributes;
    expect(a.types.resourceTypeGeneral).toBe("Collection");
    expect(a.url).toBe("https://arrhenia.invalid/collections/4/versions/2");
    expect(a.relatedIdentifiers.map((r) => `${r.relationType} ${r.relatedIdentifier}`)).toEqual([
      "HasPart 10.5072/ARH-AAAA-AAAA/1",
      "HasPart 10.5072/ARH-BBBB-BBBB/2",
      "IsNewVersionOf 10.5072/ARH-CCCC-CCCC/1",
    ]);
    expect(a.creators[0]).toMatchObject({
      name: "Tanaka, Emi",
      nameIdentifiers: [{ nameIdentifier: "https://orcid.org/0000-0002-1825-0097" }],
    });
    expect(a.dates).toEqual([{ date: "2026-05-01", dateType: "Issued" }]);
  });
});

describe("one rate per reaction in the collection's YAML", () => {
  const header: CollectionExportHeader = {
    title: "Two of the same",
    versionNumber: 1,
    identifier: "10.5072/ARH-CCCC-CCCC/1",
    landingPage: "https://arrhenia.invalid/c",
    citation: "Someone (2026).",
    caution: "Caution.",
    skipped: [],
  };
  // The same reaction from another dataset, its reactants written the other way round.
  const again: MechanismSubject = {
    ...bimolecular,
    title: "Invented OH + CH4, second set",
    participants: [bimolecular.participants[1], bimolecular.participants[0], ...bimolecular.participants.slice(2)],
    identifier: "10.5072/ARH-DDDD-DDDD/1",
    fits: [{ model: "arrhenius", lnA: Math.log(2.6e-12), n: 0, Ea: 15200, T0: 298.15 }],
  };

  it("writes the first member of a reaction and the others as a comment under it, never as a second (summed) term", () => {
    const text = buildCollectionCanteraYaml(header, [bimolecular, unimolecular, again], "J/mol");
    const doc = parse(text);
    expect(doc.reactions).toHaveLength(2);
    expect(doc.reactions.some((r: { duplicate?: boolean }) => r.duplicate)).toBe(false);
    expect(text).toMatch(
      /# also in this collection for the same reaction, not included \(a mechanism takes one rate per reaction\): doi:10\.5072\/ARH-DDDD-DDDD\/1/,
    );
    // The first member's rate is the one written.
    expect(doc.reactions[0]["rate-constant"].A).toBeCloseTo(2.45e-12 * N_A, -2);
  });

  it("names an excited-state species by its own name, not by the ground state's formula", () => {
    const excited = { ...species("FFFFFFFFFFFFFF-UHFFFAOYSA-N", "O", "O(1D)") };
    const subject: MechanismSubject = {
      ...bimolecular,
      title: "Invented O(1D) + CH4",
      participants: [
        { ...excited, side: "reactant", coefficient: 1 },
        { ...ch4, side: "reactant", coefficient: 1 },
        { ...oh, side: "product", coefficient: 1 },
        { ...ch3, side: "product", coefficient: 1 },
      ],
    };
    const doc = parse(buildCollectionCanteraYaml(header, [subject], "J/mol"));
    expect(doc.reactions[0].equation).toMatch(/^O\(1D\) \+ CH4 => /);
  });
});
