import { describe, expect, it } from "vitest";
import { GET } from "@/app/schemas/deposit/v1.json/route";
import { describeDepositSchema } from "@/lib/deposits/describe-schema";
import { compileDepositValidators } from "@/lib/deposits/validate";
import { depositSchema, resolveSchema, schemaAtSegments, type SchemaNode } from "@/lib/deposits/schema";
import {
  CONFIDENCE_LEVELS,
  DEFAULT_LICENCE,
  DEPOSIT_SCHEMA_ID,
  FIT_MODELS,
  IDENTIFIER_KINDS,
  LICENCES,
  MAX_POINTS,
  METHOD_CATEGORIES,
  MIN_POINTS,
  PHASES,
  REACTION_CLASSES,
  RELATION_TYPES,
  UNCERTAINTY_KINDS,
} from "@/lib/deposits/vocabulary";

const defs = depositSchema.$defs;
const ids = (list: readonly { id: string }[]) => list.map((x) => x.id);

/** Every (path, node) of the schema's `properties` maps, $defs included. */
function allProperties(node: SchemaNode, path: string, out: [string, SchemaNode][] = []): [string, SchemaNode][] {
  for (const [name, child] of Object.entries(node.properties ?? {})) {
    out.push([`${path}.${name}`, child]);
    allProperties(child, `${path}.${name}`, out);
    if (child.items) allProperties(child.items, `${path}.${name}[]`, out);
  }
  if (node.items) allProperties(node.items, `${path}[]`, out);
  for (const [name, def] of Object.entries(node.$defs ?? {})) allProperties(def, `$defs.${name}`, out);
  return out;
}

describe("the deposit schema file", () => {
  it("is draft 2020-12 with the stable $id", () => {
    expect(depositSchema.$schema).toBe("https://json-schema.org/draft/2020-12/schema");
    expect(depositSchema.$id).toBe(DEPOSIT_SCHEMA_ID);
    expect(DEPOSIT_SCHEMA_ID).toBe("https://arrhenia.invalid/schemas/deposit/v1.json");
  });

  it("gives every property a title and a description", () => {
    const props = allProperties(depositSchema, "");
    expect(props.length).toBeGreaterThan(80);
    for (const [path, node] of props) {
      const resolved = resolveSchema(node);
      expect(resolved.title, `${path} title`).toBeTruthy();
      expect(resolved.description, `${path} description`).toBeTruthy();
    }
  });

  it("refuses unknown fields everywhere except in CSL-JSON references", () => {
    const open = Object.entries(defs)
      .filter(([, d]) => d.type === "object" && d.additionalProperties !== false)
      .map(([name]) => name);
    expect(open.sort()).toEqual(["cslName", "cslReference"]);
    expect(depositSchema.additionalProperties).toBe(false);
  });

  it("repeats the controlled lists of the code", () => {
    expect(schemaAtSegments(["reaction", "class"])!.enum).toEqual(ids(REACTION_CLASSES));
    expect(schemaAtSegments(["license"])!.enum).toEqual(ids(LICENCES));
    expect(schemaAtSegments(["license"])!.default).toBe(DEFAULT_LICENCE);
    expect(schemaAtSegments(["reaction", "phase"])!.enum).toEqual(ids(PHASES));
    expect(schemaAtSegments(["method", "category"])!.enum).toEqual(ids(METHOD_CATEGORIES));
    expect(schemaAtSegments(["points", "0", "uncertainty", "kind"])!.enum).toEqual(ids(UNCERTAINTY_KINDS));
    expect(schemaAtSegments(["points", "0", "uncertainty", "confidence"])!.enum).toEqual(ids(CONFIDENCE_LEVELS));
    expect(schemaAtSegments(["reportedFit", "model"])!.enum).toEqual(ids(FIT_MODELS));
    expect(schemaAtSegments(["relatedIdentifiers", "0", "relation"])!.enum).toEqual(ids(RELATION_TYPES));
    expect(schemaAtSegments(["relatedIdentifiers", "0", "kind"])!.enum).toEqual(ids(IDENTIFIER_KINDS));
    expect(schemaAtSegments(["points"])!.minItems).toBe(MIN_POINTS);
    expect(schemaAtSegments(["points"])!.maxItems).toBe(MAX_POINTS);
    expect(schemaAtSegments(["$schema"])!.const).toBe(DEPOSIT_SCHEMA_ID);
  });

  it("names reaction classes in kebab-case words", () => {
    for (const c of REACTION_CLASSES) expect(c.id).toMatch(/^[a-z]+(-[a-z]+)*$/);
    expect(REACTION_CLASSES).toHaveLength(11);
  });
});

describe("GET /schemas/deposit/v1.json", () => {
  it("serves the schema as application/schema+json with a cache header", async () => {
    const response = GET();
    expect(response.status).toBe(200);
    expect(response.headers.get("content-type")).toBe("application/schema+json; charset=utf-8");
    expect(response.headers.get("cache-control")).toMatch(/^public, max-age=\d+/);
    expect(await response.json()).toEqual(depositSchema);
  });
});

describe("describeDepositSchema (the documentation page's field list)", () => {
  const sections = describeDepositSchema();

  it("has a section for the document and for each nested object, once each", () => {
    const paths = sections.map((s) => s.path);
    expect(paths).toEqual(
      expect.arrayContaining([
        "",
        "creators[]",
        "reaction",
        "reaction.reactants[]",
        "method",
        "conditions",
        "conditions.pressure",
        "units",
        "points[]",
        "points[].uncertainty",
        "reportedFit",
        "source",
        "source.reference",
        "relatedIdentifiers[]",
      ]),
    );
    expect(new Set(sections.map((s) => s.id)).size).toBe(sections.length);
    // Products share the species fields: documented once, linked from both lists.
    expect(paths).not.toContain("reaction.products[]");
    const reaction = sections.find((s) => s.path === "reaction")!;
    const products = reaction.fields.find((f) => f.name === "products")!;
    expect(products.sectionId).toBe(reaction.fields.find((f) => f.name === "reactants")!.sectionId);
  });

  it("describes each field with its type, requirement, allowed values and limits", () => {
    const root = sections[0];
    const points = root.fields.find((f) => f.name === "points")!;
    expect(points).toMatchObject({ required: true, type: "list of Point", constraints: ["2 to 100,000 entries"] });
    const license = root.fields.find((f) => f.name === "license")!;
    expect(license).toMatchObject({ required: false, default: "CC-BY-4.0" });
    expect(license.allowed).toContain("CC0-1.0");
    const k = sections.find((s) => s.path === "points[]")!.fields.find((f) => f.name === "k")!;
    expect(k).toMatchObject({ required: true, type: "number", constraints: ["greater than 0", "at most 1e+100"] });
    for (const s of sections) for (const f of s.fields) expect(f.description, f.path).not.toBe("");
  });
});

describe("the deposit schema compiles without strict-mode remarks", () => {
  it("ajv reports nothing (a missing type beside pattern or minimum, an unknown keyword…)", () => {
    const remarks: unknown[][] = [];
    const record = (...args: unknown[]) => void remarks.push(args);
    compileDepositValidators({ log: record, warn: record, error: record });
    expect(remarks).toEqual([]);
  });
});
