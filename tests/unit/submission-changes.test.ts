import { describe, expect, it } from "vitest";
import { fieldLabel, pointColumnLabel } from "@/components/submission-changes";
import { depositSchema, type SchemaNode } from "@/lib/deposits/schema";

const defs = depositSchema.$defs as Record<string, SchemaNode>;
const deref = (n: SchemaNode): SchemaNode => (n.$ref ? defs[n.$ref.split("/").pop()!] : n);

/** Every leaf field of the deposit format as a diff path ("units › pressure", list positions from 1), from the schema itself. */
function leafPaths(node: SchemaNode, path: string[] = [], out = new Set<string>(), depth = 0): Set<string> {
  const n = deref(node);
  const branches = [n, ...(n.allOf ?? []).flatMap((a) => [a, a.then, a.else]), n.then, n.else, ...(n.oneOf ?? []), ...(n.anyOf ?? [])]
    .filter((b): b is SchemaNode => Boolean(b))
    .map(deref);
  let inner = false;
  for (const b of branches) {
    for (const [k, v] of Object.entries(b.properties ?? {})) {
      inner = true;
      if (depth < 8) leafPaths(v, [...path, k], out, depth + 1);
    }
    if (b.items && !Array.isArray(b.items)) {
      inner = true;
      if (depth < 8) leafPaths(b.items, [...path, "1"], out, depth + 1);
    }
  }
  if (!inner && path.length) out.add(path.join(" › "));
  return out;
}

describe("labels of the review's diff rows", () => {
  it("names a changed field with the editor's words, list positions as written (from 1)", () => {
    expect(fieldLabel("description")).toBe("Title and summary, description");
    expect(fieldLabel("keywords › 1")).toBe("Title and summary, keyword 1");
    expect(fieldLabel("creators › 3 › orcid")).toBe("People, grants and links, person 3, ORCID");
    expect(fieldLabel("reportedFit › Tmin")).toBe("The authors' expression, valid from");
  });

  it("labels each field by what it is: a unit as a unit, a pressure value as a value", () => {
    expect(fieldLabel("units › pressure")).toBe("Conditions, pressure unit");
    expect(fieldLabel("conditions › pressure › value")).toBe("Conditions, pressure value");
    expect(fieldLabel("conditions › pressure › min")).toBe("Conditions, lowest pressure");
    expect(fieldLabel("units › k")).toBe("Rate constants, rate-constant unit");
    expect(fieldLabel("units › T")).toBe("Rate constants, temperature unit");
    expect(fieldLabel("source › reference › issued › date-parts › 1 › 1")).toBe("Where the numbers were published, year");
    expect(pointColumnLabel("uncertainty › kind")).toBe("uncertainty stated as");
    expect(pointColumnLabel("T")).toBe("T");
  });

  it("gives every field of the deposit format its own label, never a property name of the file", () => {
    const paths = [...leafPaths(depositSchema as SchemaNode)];
    expect(paths.length).toBeGreaterThan(50);
    const labels = new Map<string, string>();
    const faults: string[] = [];
    for (const path of paths) {
      const label = fieldLabel(path);
      // Distinct fields, distinct labels.
      if (labels.has(label)) faults.push(`${path} and ${labels.get(label)} share "${label}"`);
      labels.set(label, path);
      // No JSON property names (camelCase, $schema, date-parts) and no bare list positions; InChI is a name of the trade.
      if (/[a-z][A-Z][a-z]|\$|date-parts|, \d+(,|$)/.test(label.replace(/InChI/g, ""))) faults.push(`${path}: "${label}"`);
      if (path.startsWith("units › ") && !/ unit$/.test(label)) faults.push(`${path}: "${label}" is a unit`);
    }
    expect(faults).toEqual([]);
    for (const column of paths.filter((p) => p.startsWith("points › 1 › ")).map((p) => p.slice("points › 1 › ".length))) {
      const label = pointColumnLabel(column);
      expect(label, column).not.toMatch(/›|[a-z][A-Z]|^row /);
    }
  });
});
