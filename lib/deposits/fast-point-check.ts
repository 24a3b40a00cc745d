/**
 * A hand-written check for the common shape of a deposit point ({T, k} and other plain numbers),
 * derived from the schema at load time. It only ever says "certainly valid"; anything it does not
 * recognise (a string field, an uncertainty, a keyword it does not know) goes to the compiled
 * validator, so it can never accept a row the schema would refuse.
 */
import { resolveSchema, type SchemaNode } from "./schema";

/** Keywords a number field may carry for the fast check to decide it alone. */
const NUMBER_KEYWORDS = new Set([
  "type",
  "title",
  "description",
  "examples",
  "default",
  "minimum",
  "maximum",
  "exclusiveMinimum",
  "exclusiveMaximum",
]);
/** Keywords the point object itself may carry. */
const OBJECT_KEYWORDS = new Set(["type", "title", "description", "examples", "additionalProperties", "required", "properties"]);

type NumberTest = (v: unknown) => boolean;

function numberTest(node: SchemaNode): NumberTest | undefined {
  if (node.$ref || (node.type !== "number" && node.type !== "integer")) return undefined;
  if (Object.keys(node).some((k) => !NUMBER_KEYWORDS.has(k))) return undefined;
  const integer = node.type === "integer";
  const { minimum, maximum, exclusiveMinimum, exclusiveMaximum } = node;
  return (v) =>
    typeof v === "number" &&
    Number.isFinite(v) &&
    (!integer || Number.isInteger(v)) &&
    (minimum === undefined || v >= minimum) &&
    (maximum === undefined || v <= maximum) &&
    (exclusiveMinimum === undefined || v > exclusiveMinimum) &&
    (exclusiveMaximum === undefined || v < exclusiveMaximum);
}

/**
 * A predicate that is true only for rows the point schema certainly accepts; undefined when the
 * schema has a shape the fast check does not cover (then every row goes to the validator).
 */
export function makeFastPointCheck(itemSchema: SchemaNode): ((row: unknown) => boolean) | undefined {
  const node = resolveSchema(itemSchema);
  if (node.type !== "object" || node.additionalProperties !== false || !node.properties) return undefined;
  if (Object.keys(node).some((k) => !OBJECT_KEYWORDS.has(k))) return undefined;
  const tests = new Map<string, NumberTest>();
  for (const [name, field] of Object.entries(node.properties)) {
    const test = numberTest(field);
    if (test) tests.set(name, test);
  }
  const required = node.required ?? [];
  if (required.some((name) => !tests.has(name))) return undefined;
  return (row) => {
    if (typeof row !== "object" || row === null || Array.isArray(row)) return false;
    const record = row as Record<string, unknown>;
    let present = 0;
    for (const key in record) {
      if (!Object.hasOwn(record, key)) continue;
      const test = tests.get(key);
      if (!test || !test(record[key])) return false;
      if (required.includes(key)) present++;
    }
    return present === required.length;
  };
}
