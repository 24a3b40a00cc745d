/**
 * The deposit document schema as data, and navigation helpers over it (resolving `$ref`, finding
 * the subschema at a JSON pointer) shared by error messages and the documentation page.
 */
import schemaJson from "@/schemas/deposit.v1.schema.json";

/** A JSON Schema node as far as our helpers read it. */
export interface SchemaNode {
  $ref?: string;
  title?: string;
  description?: string;
  type?: string | string[];
  properties?: Record<string, SchemaNode>;
  items?: SchemaNode;
  prefixItems?: SchemaNode[];
  required?: string[];
  enum?: unknown[];
  const?: unknown;
  default?: unknown;
  examples?: unknown[];
  anyOf?: SchemaNode[];
  oneOf?: SchemaNode[];
  allOf?: SchemaNode[];
  if?: SchemaNode;
  then?: SchemaNode;
  else?: SchemaNode;
  additionalProperties?: boolean | SchemaNode;
  minimum?: number;
  maximum?: number;
  exclusiveMinimum?: number;
  exclusiveMaximum?: number;
  multipleOf?: number;
  minLength?: number;
  maxLength?: number;
  minItems?: number;
  maxItems?: number;
  pattern?: string;
  format?: string;
  $defs?: Record<string, SchemaNode>;
  [keyword: string]: unknown;
}

/** The parsed schemas/deposit.v1.schema.json. */
export const depositSchema = schemaJson as unknown as SchemaNode & { $id: string; $defs: Record<string, SchemaNode> };

/** Follow a local `$ref` ("#/$defs/name"); sibling keywords (title, description) win over the target's. */
export function resolveSchema(node: SchemaNode): SchemaNode {
  if (!node.$ref) return node;
  const name = node.$ref.replace(/^#\/\$defs\//, "");
  const target = depositSchema.$defs[name];
  if (!target) return node;
  const { $ref: _ref, ...siblings } = node;
  void _ref;
  return { ...resolveSchema(target), ...siblings };
}

/** Split a JSON pointer into unescaped segments ("" → []). */
export function splitPointer(pointer: string): string[] {
  if (!pointer) return [];
  return pointer
    .slice(1)
    .split("/")
    .map((s) => s.replace(/~1/g, "/").replace(/~0/g, "~"));
}

/** Escape one segment for a JSON pointer (RFC 6901: ~ → ~0, / → ~1). */
export function escapePointerSegment(segment: string): string {
  return segment.replace(/~/g, "~0").replace(/\//g, "~1");
}

/** The (resolved) subschema that describes the value at `segments`, or undefined off the schema. */
export function schemaAtSegments(segments: readonly string[], root: SchemaNode = depositSchema): SchemaNode | undefined {
  let node: SchemaNode | undefined = resolveSchema(root);
  for (const seg of segments) {
    if (!node) return undefined;
    if (node.properties && Object.hasOwn(node.properties, seg)) node = resolveSchema(node.properties[seg]);
    else if (node.prefixItems && /^\d+$/.test(seg) && Number(seg) < node.prefixItems.length)
      node = resolveSchema(node.prefixItems[Number(seg)]);
    else if (node.items && /^\d+$/.test(seg)) node = resolveSchema(node.items);
    else return undefined;
  }
  return node;
}
