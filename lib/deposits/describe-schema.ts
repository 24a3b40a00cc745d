/**
 * Field-by-field description of the deposit schema, for the documentation page: one section per
 * object (the document, reaction, each kind of list entry…), one row per field, built by walking
 * the schema so the page can never drift from it.
 */
import { depositSchema, resolveSchema, type SchemaNode } from "./schema";

export interface FieldDoc {
  /** Dotted path with [] for list entries, e.g. "reaction.reactants[].smiles". */
  path: string;
  name: string;
  title: string;
  description: string;
  /** "number", "text", "list of Point", … */
  type: string;
  required: boolean;
  /** Allowed values of an enum or const. */
  allowed?: string[];
  default?: string;
  /** Limits in words: "greater than 0", "2 to 100 000 entries", … */
  constraints: string[];
  examples?: string[];
  /** Section id documenting the fields of this field's object (or of its list entries). */
  sectionId?: string;
}

export interface SectionDoc {
  /** HTML id, e.g. "field-reaction-reactants". */
  id: string;
  /** Dotted path of the object, "" for the document itself. */
  path: string;
  title: string;
  description: string;
  fields: FieldDoc[];
  /** True when fields beyond those listed are accepted (CSL-JSON references). */
  open: boolean;
}

function defName(node: SchemaNode): string | undefined {
  return node.$ref?.replace(/^#\/\$defs\//, "");
}

function typeName(t: string | string[] | undefined): string {
  const one = (x: string) =>
    ({ string: "text", integer: "whole number", number: "number", boolean: "true/false", object: "object", array: "list" })[x] ?? x;
  if (Array.isArray(t)) return t.map(one).join(" or ");
  return t ? one(t) : "any";
}

function num(n: number): string {
  return n >= 1e9 ? String(n) : n >= 10000 ? n.toLocaleString("en-GB") : String(n);
}

function constraintsOf(node: SchemaNode): string[] {
  const out: string[] = [];
  if (node.exclusiveMinimum !== undefined) out.push(`greater than ${num(node.exclusiveMinimum)}`);
  if (node.minimum !== undefined && node.maximum !== undefined) out.push(`${num(node.minimum)} to ${num(node.maximum)}`);
  else if (node.minimum !== undefined) out.push(`at least ${num(node.minimum)}`);
  else if (node.maximum !== undefined) out.push(`at most ${num(node.maximum)}`);
  if (node.multipleOf !== undefined) out.push(`a multiple of ${num(node.multipleOf)}`);
  if (node.minLength !== undefined && node.maxLength !== undefined) out.push(`${num(node.minLength)}–${num(node.maxLength)} characters`);
  else if (node.maxLength !== undefined) out.push(`up to ${num(node.maxLength)} characters`);
  if (node.minItems !== undefined && node.maxItems !== undefined) out.push(`${num(node.minItems)} to ${num(node.maxItems)} entries`);
  else if (node.maxItems !== undefined) out.push(`up to ${num(node.maxItems)} entries`);
  else if (node.minItems !== undefined) out.push(`at least ${num(node.minItems)} entries`);
  if (node.uniqueItems) out.push("no repeats");
  if (node.pattern) out.push(`pattern ${node.pattern}`);
  if (node.format) out.push(`format ${node.format}`);
  return out;
}

function sectionIdOf(path: string): string {
  return `field-${path.replace(/\[\]/g, "").replace(/[^a-zA-Z0-9]+/g, "-") || "document"}`.replace(/-+$/, "");
}

/** Sections describing every object of the deposit schema, the document first. */
export function describeDepositSchema(): SectionDoc[] {
  const sections: SectionDoc[] = [];
  const documentedDefs = new Map<string, string>(); // $defs name → section id

  function walkObject(path: string, title: string, node: SchemaNode): string {
    const id = sectionIdOf(path);
    const section: SectionDoc = {
      id,
      path,
      title,
      description: node.description ?? "",
      fields: [],
      open: node.additionalProperties !== false,
    };
    sections.push(section);
    const required = new Set(node.required ?? []);
    for (const [name, raw] of Object.entries(node.properties ?? {})) {
      const field = resolveSchema(raw);
      const fieldPath = path ? `${path}.${name}` : name;
      const doc: FieldDoc = {
        path: fieldPath,
        name,
        title: field.title ?? name,
        description: field.description ?? "",
        type: typeName(field.type),
        required: required.has(name),
        constraints: constraintsOf(field),
      };
      if (field.enum) doc.allowed = field.enum.map(String);
      if (field.const !== undefined) doc.allowed = [String(field.const)];
      if (field.default !== undefined) doc.default = String(field.default);
      if (field.examples) doc.examples = field.examples.map(String);
      if (field.type === "object" && field.properties) {
        doc.sectionId = sectionFor(fieldPath, field.title ?? name, raw, field);
      } else if (field.type === "array" && field.items) {
        const items = resolveSchema(field.items);
        doc.type = `list of ${items.type === "object" ? (items.title ?? "entries") : typeName(items.type)}`;
        if (items.type === "object" && items.properties)
          doc.sectionId = sectionFor(`${fieldPath}[]`, items.title ?? name, field.items, items);
        else if (items.type === "array") doc.type = `list of lists of ${typeName(resolveSchema(items.items ?? {}).type)}`;
        else doc.constraints.push(...constraintsOf(items).map((c) => `each: ${c}`));
      }
      section.fields.push(doc);
    }
    return id;
  }

  function sectionFor(path: string, title: string, raw: SchemaNode, resolved: SchemaNode): string {
    const def = defName(raw);
    if (def && documentedDefs.has(def)) return documentedDefs.get(def)!;
    // A definition shared by several fields (reactants and products) is titled by its own name.
    const id = walkObject(path, (def && depositSchema.$defs[def]?.title) || title, resolved);
    if (def) documentedDefs.set(def, id);
    return id;
  }

  walkObject("", "The document", depositSchema);
  return sections;
}
