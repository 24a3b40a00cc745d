import { describe, expect, it } from "vitest";
import { EXAMPLE_DEPOSIT } from "@/lib/deposits/example";
import type { DepositDocument } from "@/lib/deposits/types";
import { MAX_VALIDATION_ERRORS, parseAndValidateDeposit, parseDepositJson, validateDeposit } from "@/lib/deposits/validate";
import type { FieldError } from "@/lib/errors";

/** A deep copy of the example, loosely typed so tests can break it. */
// eslint-disable-next-line @typescript-eslint/no-explicit-any -- tests deliberately build invalid documents
function example(): any {
  return structuredClone(EXAMPLE_DEPOSIT);
}

function errorsOf(doc: unknown): FieldError[] {
  const result = validateDeposit(doc);
  if (result.ok) throw new Error("expected the document to be refused");
  return result.errors;
}

function errorAt(doc: unknown, pointer: string): FieldError {
  const errors = errorsOf(doc);
  const found = errors.find((e) => e.pointer === pointer);
  if (!found) throw new Error(`no error at ${pointer}; got ${JSON.stringify(errors, null, 1)}`);
  return found;
}

describe("validateDeposit: valid documents", () => {
  it("accepts the documentation example", () => {
    const result = validateDeposit(EXAMPLE_DEPOSIT);
    expect(result.ok ? [] : result.errors).toEqual([]);
    expect(result.ok).toBe(true);
  });

  it("fills in the default licence without changing the input", () => {
    const doc = example();
    delete doc.license;
    const result = validateDeposit(doc);
    expect(result.ok && result.value.license).toBe("CC-BY-4.0");
    expect(doc.license).toBeUndefined();
  });

  it("accepts unknown products with a reason, a liquid phase with its solvent, and a pressure range", () => {
    const doc = example();
    doc.reaction.products = [];
    doc.reaction.productsUnknown = { reason: "overall removal of OH followed; products not detected" };
    doc.reaction.phase = "liquid";
    doc.reaction.solvent = { name: "water", smiles: "O" };
    doc.conditions.pressure = { min: 20, max: 600 };
    doc.reportedFit = { model: "modified_arrhenius", A: 1e-13, n: 2.1, Ea: 1200, EaUnit: "K", T0: 300 };
    doc.source = {
      reference: {
        type: "article-journal",
        title: "An invented article",
        author: [{ family: "Okafor", given: "M." }],
        issued: { "date-parts": [[2020, 4]] },
      },
    };
    expect(validateDeposit(doc)).toMatchObject({ ok: true });
  });

  it("reads units written with superscripts and aliases", () => {
    const doc = example();
    doc.units = { k: "cm³ molecule⁻¹ s⁻¹", T: "°C", pressure: "torr" };
    doc.points = doc.points.map((p: { T: number }) => ({ ...p, T: p.T - 273.15 }));
    // Without its own unit the valid range is in units.T (documents written before rangeUnit existed).
    delete doc.reportedFit.rangeUnit;
    doc.reportedFit.Tmin = -23.15;
    doc.reportedFit.Tmax = 146.85;
    expect(validateDeposit(doc)).toMatchObject({ ok: true });
  });

  it("reads the valid range in its own unit, whatever units.T is", () => {
    const doc = example();
    doc.units = { ...doc.units, T: "degC" };
    doc.points = doc.points.map((p: { T: number }) => ({ ...p, T: p.T - 273.15 }));
    // 250 K and 420 K stay valid in kelvin beside data in °C; -23.15 K is below absolute zero.
    expect(validateDeposit(doc)).toMatchObject({ ok: true });
    doc.reportedFit.Tmin = -23.15;
    const out = validateDeposit(doc);
    expect(out.ok).toBe(false);
    expect(out.ok ? [] : out.errors.map((e) => e.pointer)).toEqual(["/reportedFit/Tmin"]);
    doc.reportedFit.rangeUnit = "furlongs";
    expect(
      validateDeposit(doc).ok ? [] : (validateDeposit(doc) as { errors: { pointer: string }[] }).errors.map((e) => e.pointer),
    ).toContain("/reportedFit/rangeUnit");
  });
});

describe("parseDepositJson: malformed JSON", () => {
  it("reports a trailing comma with its line, column and character", () => {
    const result = parseDepositJson('{\n  "title": "OH + CH4",\n}');
    expect(result).toMatchObject({ ok: false });
    const [error] = (result as { errors: FieldError[] }).errors;
    expect(error.pointer).toBe("");
    expect(error.message).toBe(
      'The document is not valid JSON: unexpected "}"; a trailing comma is not allowed (line 3, column 1, character 26).',
    );
  });

  it.each([
    ['{"title": }', 'unexpected "}" where a value was expected (line 1, column 11'],
    ['{"title": "x"', 'the text ends early (missing "}")'],
    ["{'title': 'x'}", "strings need double quotes"],
    ['{"k": 1.2e-1x}', 'unexpected "x"; "," or "}" was expected'],
    ['{"k": NaN}', "NaN is not allowed in JSON"],
    ['{"a": 1}}', "after the end of the document"],
  ])("%s", (text, fragment) => {
    const result = parseDepositJson(text);
    expect(result.ok).toBe(false);
    expect((result as { errors: FieldError[] }).errors[0].message).toContain(fragment);
  });

  it("survives a million nested brackets (the scanner is iterative)", () => {
    const result = parseDepositJson("[".repeat(1_000_000));
    expect((result as { errors: FieldError[] }).errors[0].message).toContain('the text ends early (missing "]")');
  });

  it("refuses an empty text and a non-object document", () => {
    expect(parseDepositJson("  ")).toEqual({
      ok: false,
      errors: [{ pointer: "", message: "The document is empty; a deposit document is a JSON object." }],
    });
    expect(parseAndValidateDeposit("[1, 2]")).toEqual({
      ok: false,
      errors: [
        { pointer: "", message: "A deposit document must be a JSON object with fields such as title, reaction and points (got a list)." },
      ],
    });
  });

  it("parses valid JSON (with a byte-order mark) and validates it", () => {
    expect(parseAndValidateDeposit(`\uFEFF${JSON.stringify(EXAMPLE_DEPOSIT)}`)).toMatchObject({ ok: true });
  });
});

describe("validateDeposit: schema errors in plain English", () => {
  it("wrong types name the field and the value", () => {
    const doc = example();
    doc.title = 42;
    doc.reaction.order = "2";
    doc.creators = { name: "x" };
    expect(errorAt(doc, "/title")).toEqual({ pointer: "/title", value: 42, message: "Title must be text (got a whole number 42)." });
    expect(errorAt(doc, "/reaction/order").message).toBe("Reaction order must be a whole number, not text: write 2 without quotes.");
    expect(errorAt(doc, "/creators").message).toBe("Creators must be a list (got a group of fields).");
  });

  it("a missing required field points at the field itself", () => {
    const doc = example();
    delete doc.reaction.order;
    delete doc.points[3].k;
    expect(errorAt(doc, "/reaction/order")).toEqual({ pointer: "/reaction/order", message: "Reaction order is required." });
    expect(errorAt(doc, "/points/3/k")).toEqual({ pointer: "/points/3/k", message: "Point 4: rate constant is required." });
  });

  it("non-numeric cells are named with their point", () => {
    const doc = example();
    doc.points[3].T = "abc";
    doc.points[6].k = "1.2e-1x";
    expect(errorAt(doc, "/points/3/T")).toEqual({
      pointer: "/points/3/T",
      value: "abc",
      message: 'Point 4: temperature must be a number; "abc" is not a number.',
    });
    expect(errorAt(doc, "/points/6/k").message).toBe('Point 7: rate constant must be a number; "1.2e-1x" is not a number.');
  });

  it("k ≤ 0 is refused", () => {
    const doc = example();
    doc.points[2].k = 0;
    doc.points[4].k = -8.59e-15;
    expect(errorAt(doc, "/points/2/k")).toEqual({
      pointer: "/points/2/k",
      value: 0,
      message: "Point 3: rate constant must be greater than 0 (got 0).",
    });
    expect(errorAt(doc, "/points/4/k").message).toBe("Point 5: rate constant must be greater than 0 (got -8.59e-15).");
  });

  it("an unknown field is named, with the fields that exist", () => {
    const doc = example();
    doc.reaction.oder = 2;
    expect(errorAt(doc, "/reaction/oder").message).toBe(
      '"oder" is not a field of reaction; the fields are: reactants, products, productsUnknown, class, order, phase, solvent, surface.',
    );
  });

  it("enumerations list the allowed values", () => {
    const doc = example();
    doc.reaction.class = "abstraction";
    doc.license = "CC-BY-NC-4.0";
    expect(errorAt(doc, "/reaction/class").message).toMatch(
      /^Reaction class must be one of: hydrogen-abstraction, addition, .* \(got "abstraction"\)\.$/,
    );
    expect(errorAt(doc, "/license").message).toContain('(got "CC-BY-NC-4.0")');
  });

  it.each([
    ["h_abstraction", "hydrogen-abstraction"],
    ["bond_fission", "bond-fission"],
    ["disproportionation", "radical-disproportionation"],
    ["electron_transfer", "electron-transfer"],
  ])("a retired reaction-class id (%s) is refused with the id to write instead", (retired, current) => {
    const doc = example();
    doc.reaction.class = retired;
    expect(errorAt(doc, "/reaction/class").message).toBe(`Reaction class uses the retired id "${retired}": write "${current}" instead.`);
    doc.reaction.class = current;
    expect(validateDeposit(doc).ok).toBe(true);
  });

  it("a species needs a SMILES or an InChI", () => {
    const doc = example();
    doc.reaction.reactants[1] = { name: "methane" };
    expect(errorsOf(doc)).toEqual([{ pointer: "/reaction/reactants/1", message: "Reactant 2 needs at least one of: SMILES or InChI." }]);
  });

  it("products may be empty only when productsUnknown says why", () => {
    const doc = example();
    doc.reaction.products = [];
    expect(errorAt(doc, "/reaction/products").message).toBe(
      "Products must list at least one product; if the products were not determined (an overall removal rate), give productsUnknown with a reason instead.",
    );
  });

  it("a liquid-phase reaction needs its solvent", () => {
    const doc = example();
    doc.reaction.phase = "liquid";
    expect(errorAt(doc, "/reaction/solvent").message).toBe("Solvent is required when the phase is liquid.");
  });

  it("an uncertainty factor must exceed 1 and other uncertainties must be positive", () => {
    const doc = example();
    doc.points[8].uncertainty = { kind: "factor", value: 1 };
    doc.points[5].uncertainty = { kind: "relative", value: 0 };
    doc.points[0].uncertainty.confidence = "3sigma";
    expect(errorAt(doc, "/points/8/uncertainty/value").message).toBe(
      "Point 9: an uncertainty factor f (k/f to k·f) must be greater than 1 (got 1).",
    );
    expect(errorAt(doc, "/points/5/uncertainty/value").message).toBe("Point 6: uncertainty must be greater than 0 (got 0).");
    expect(errorAt(doc, "/points/0/uncertainty/confidence").message).toBe(
      'Point 1: confidence must be one of: 1sigma, 2sigma (got "3sigma").',
    );
  });

  it("DOIs are checked for syntax", () => {
    const doc = example();
    doc.source.doi = "https://doi.org/10.5555/arrhenia.example.0001";
    doc.relatedIdentifiers = [{ kind: "doi", identifier: "11.5555/x", relation: "cites" }];
    expect(errorAt(doc, "/source/doi").message).toBe(
      'Publication DOI must be written without the "https://doi.org/" prefix, e.g. 10.5555/abc.123 (got "https://doi.org/10.5555/arrhenia.example.0001").',
    );
    expect(errorAt(doc, "/relatedIdentifiers/0/identifier").message).toBe(
      'Related identifier 1: identifier is not a DOI: a DOI starts with "10.", four or more digits and a slash, e.g. 10.5555/abc.123 (got "11.5555/x").',
    );
  });

  it("a source needs a DOI or a reference", () => {
    const doc = example();
    doc.source = { locator: "Table 1" };
    expect(errorAt(doc, "/source").message).toBe("Source needs at least one of: publication DOI or reference.");
  });

  it("web addresses must be http(s)", () => {
    const doc = example();
    doc.relatedIdentifiers[0].identifier = "ftp://example.invalid/data";
    expect(errorAt(doc, "/relatedIdentifiers/0/identifier").message).toContain(
      "must be a full web address starting with http:// or https://",
    );
  });

  it("a pressure is a value or a range, not both", () => {
    const doc = example();
    doc.conditions.pressure = { value: 50, min: 10, max: 100 };
    expect(errorAt(doc, "/conditions/pressure").message).toBe("Pressure must be either a single value or a range (min and max), not both.");
    doc.conditions.pressure = { min: 10 };
    expect(errorAt(doc, "/conditions/pressure").message).toBe("Pressure needs either a single value, or min and max for a range.");
  });

  it("a modified Arrhenius fit needs n", () => {
    const doc = example();
    doc.reportedFit.model = "modified_arrhenius";
    expect(errorAt(doc, "/reportedFit/n").message).toBe("Temperature exponent is required for the modified_arrhenius model.");
  });

  it("fewer than 2 points is refused", () => {
    const doc = example();
    doc.points = doc.points.slice(0, 1);
    expect(errorAt(doc, "/points").message).toBe("Points must have at least 2 entries (it has 1).");
  });
});

describe("validateDeposit: checks beyond the schema", () => {
  it("T ≤ 0 K is refused", () => {
    const doc = example();
    doc.points[0].T = 0;
    doc.points[1].T = -5;
    expect(errorAt(doc, "/points/0/T")).toEqual({
      pointer: "/points/0/T",
      value: 0,
      message: "Point 1: temperature must be above absolute zero (got 0 K).",
    });
    expect(errorAt(doc, "/points/1/T").message).toBe("Point 2: temperature must be above absolute zero (got -5 K).");
  });

  it("°C below absolute zero is refused with its kelvin value", () => {
    const doc = example();
    doc.units.T = "degC";
    doc.points = doc.points.map((p: { T: number }) => ({ ...p, T: p.T - 273.15 }));
    doc.points[2].T = -300;
    delete doc.reportedFit;
    expect(errorsOf(doc)).toEqual([
      {
        pointer: "/points/2/T",
        value: -300,
        message: "Point 3: temperature must be above absolute zero (got -300 °C, which is -26.85 K).",
      },
    ]);
  });

  it("an unknown unit is named and the accepted spellings listed", () => {
    const doc = example();
    doc.units.k = "furlongs per fortnight";
    doc.units.T = "F";
    doc.units.pressure = "psi";
    doc.reportedFit.EaUnit = "kJ";
    const k = errorAt(doc, "/units/k");
    expect(k.value).toBe("furlongs per fortnight");
    expect(k.message).toMatch(/^Unknown second-order rate-constant unit "furlongs per fortnight"\. Accepted: cm3 molecule-1 s-1/);
    expect(errorAt(doc, "/units/T").message).toMatch(/^Unknown temperature unit "F"\. Accepted: K/);
    expect(errorAt(doc, "/units/pressure").message).toMatch(/^Unknown pressure unit "psi"/);
    expect(errorAt(doc, "/reportedFit/EaUnit").message).toMatch(/^Unknown energy unit "kJ"/);
  });

  it("a k unit of another reaction order is refused", () => {
    const doc = example();
    doc.units.k = "s-1";
    expect(errorAt(doc, "/units/k")).toEqual({
      pointer: "/units/k",
      value: "s-1",
      message:
        '"s-1" is a first-order unit, but this reaction is second order. Use one of: cm3 molecule-1 s-1, cm3 mol-1 s-1, L mol-1 s-1, m3 mol-1 s-1, m3 molecule-1 s-1.',
    });
    doc.units.k = "cm6 molecule-2 s-1";
    expect(errorAt(doc, "/units/k").message).toContain("is a third-order unit, but this reaction is second order");
  });

  it("pressures need a pressure unit", () => {
    const doc = example();
    delete doc.units.pressure;
    expect(errorAt(doc, "/units/pressure").message).toBe(
      "Pressure unit is required because the document gives pressures (under conditions or on points).",
    );
  });

  it("ORCID check digits are verified", () => {
    const doc = example();
    doc.creators[0].orcid = "0000-0002-1825-0098";
    doc.creators[1].orcid = "https://orcid.org/0000-0002-1825-0097";
    expect(errorAt(doc, "/creators/0/orcid").message).toBe(
      "Creator 1: ORCID iD 0000-0002-1825-0098 has a wrong check digit (the first 15 digits call for 7); check it for a typing mistake.",
    );
    expect(errorAt(doc, "/creators/1/orcid").message).toContain('must be written without "https://orcid.org/"');
  });

  it("the reported fit must make sense", () => {
    const doc = example();
    doc.reportedFit = { model: "arrhenius", A: 2.2e-12, n: 1.5, Ea: 14550, EaUnit: "kJ mol-1", Tmin: 420, Tmax: 250, T0: -1 };
    expect(errorAt(doc, "/reportedFit/n").message).toBe(
      "An Arrhenius expression has no temperature exponent: choose modified_arrhenius, or leave n out.",
    );
    expect(errorAt(doc, "/reportedFit/Ea").message).toContain("more than any chemical barrier; check the value and its unit");
    expect(errorAt(doc, "/reportedFit/Tmax").message).toBe("Highest valid temperature (250) must be above the lowest (420).");
    expect(errorAt(doc, "/reportedFit/T0").message).toBe("Reference temperature must be above absolute zero (got -1 K).");
  });

  it("phase-specific fields for another phase are flagged", () => {
    const doc = example();
    doc.reaction.solvent = { name: "water" };
    expect(errorAt(doc, "/reaction/solvent").message).toBe('A solvent is only for liquid-phase reactions (phase is "gas").');
  });
});

describe("validateDeposit: size limits", () => {
  it("refuses 100 001 points with one specific message, quickly", () => {
    const doc = example();
    doc.points = Array.from({ length: 100_001 }, (_, i) => ({ T: 250 + (i % 170), k: 1e-14 }));
    const started = performance.now();
    const result = validateDeposit(doc);
    expect(performance.now() - started).toBeLessThan(500);
    expect(result).toEqual({
      ok: false,
      errors: [
        {
          pointer: "/points",
          value: 100_001,
          message:
            "The dataset has 100,001 points; the limit is 100,000. Split it into several datasets, for example by temperature range or bath gas.",
        },
      ],
    });
  });

  // Its speed is measured by `npm run bench:validation`, not here.
  it("accepts exactly 100 000 points", () => {
    const doc = example();
    doc.points = Array.from({ length: 100_000 }, (_, i) => ({
      T: 250 + (i % 170),
      k: 1e-14 * (1 + (i % 7) / 10),
      uncertainty: { kind: "relative", value: 5 },
    }));
    expect(validateDeposit(doc).ok).toBe(true);
  });

  it(`caps the list at ${MAX_VALIDATION_ERRORS} errors and says how many there were`, () => {
    const doc = example();
    doc.points = Array.from({ length: 1000 }, () => ({ T: "x", k: 1e-14 }));
    const errors = errorsOf(doc);
    expect(errors).toHaveLength(MAX_VALIDATION_ERRORS + 1);
    expect(errors[MAX_VALIDATION_ERRORS]).toEqual({
      pointer: "",
      message: "Showing the first 200 of 1,000 problems; correct these and validate again to see the rest.",
    });
  });
});

describe("every error is well formed", () => {
  it("has a pointer into the document, a sentence, and the value when it is a plain value", () => {
    const doc = example();
    doc.title = "";
    doc.keywords = ["methane", "methane"];
    doc.points[0].T = "abc";
    doc.points[1].k = -1;
    doc.units.k = "s-1";
    doc.creators[0].orcid = "0000-0002-1825-0098";
    const errors = errorsOf(doc);
    expect(errors.length).toBeGreaterThanOrEqual(6);
    for (const e of errors) {
      expect(e.pointer).toMatch(/^(\/[^/]+)*$/);
      expect(e.message).toMatch(/^[A-Z"].*\.$/);
    }
    expect(errorAt(doc, "/title").message).toBe('Title must be at least 3 characters long (got "").');
    expect(errorAt(doc, "/keywords").message).toBe("Keywords lists the same value twice (entries 1 and 2).");
  });
});

// The hand-written type must accept the example; a compile-time check.
const typed: DepositDocument = EXAMPLE_DEPOSIT;
void typed;
