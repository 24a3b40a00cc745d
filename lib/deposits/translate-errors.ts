/**
 * Turns ajv's errors into FieldErrors in plain English: a JSON pointer to the offending value
 * (for `required`, the missing field itself), the value, and a sentence naming the field by the
 * schema's title. Branch errors under anyOf/oneOf and the bookkeeping errors of if/then are folded
 * into one message per place.
 */
import type { ErrorObject } from "ajv";
import type { FieldError } from "@/lib/errors";
import {
  describeType,
  formatCount,
  formatValue,
  joinAlternatives,
  lowerFirst,
  offendingValue,
  sentenceAt,
  sentenceWithPrefix,
} from "./messages";
import { depositSchema, escapePointerSegment, schemaAtSegments, splitPointer, type SchemaNode } from "./schema";
import { MAX_POINTS, RETIRED_REACTION_CLASS_IDS } from "./vocabulary";

type MessageRule = (pointer: string, value: unknown, error: ErrorObject) => string;

const defs = depositSchema.$defs;
/** The schema's pattern for required text: at least one character that is not a space. */
const NON_BLANK_PATTERN = "\\S";
/** The schema's bound on a relative uncertainty, percent. */
export const MAX_RELATIVE_UNCERTAINTY_PERCENT = defs.uncertainty.allOf![1].then!.properties!.value.maximum!;
const DOI_PREFIX = /^(https?:\/\/(dx\.)?doi\.org\/|doi:)/i;
const webAddressRule: MessageRule = (p, v) =>
  sentenceAt(p, `must be a full web address starting with http:// or https:// (got ${formatValue(v)})`);

/**
 * Messages for particular places in the schema, keyed by the schema node that holds the keyword
 * (ajv's `parentSchema`, the very object from the schema file) and the keyword. Identity, not
 * schemaPath: ajv reports paths relative to whichever referenced schema it compiled separately.
 */
const SPECIFIC = new Map<object, Partial<Record<string, MessageRule>>>([
  [
    defs.doi,
    {
      pattern: (p, v) =>
        typeof v === "string" && DOI_PREFIX.test(v.trim())
          ? sentenceAt(
              p,
              `must be written without the "${DOI_PREFIX.exec(v.trim())![0]}" prefix, e.g. 10.5555/abc.123 (got ${formatValue(v)})`,
            )
          : sentenceAt(
              p,
              `is not a DOI: a DOI starts with "10.", four or more digits and a slash, e.g. 10.5555/abc.123 (got ${formatValue(v)})`,
            ),
    },
  ],
  [
    defs.orcid,
    {
      pattern: (p, v) =>
        typeof v === "string" && /orcid\.org/i.test(v)
          ? sentenceAt(p, `must be written without "https://orcid.org/", e.g. 0000-0002-1825-0097 (got ${formatValue(v)})`)
          : sentenceAt(
              p,
              `must be four groups of four digits joined by hyphens, the last character a digit or X, e.g. 0000-0002-1825-0097 (got ${formatValue(v)})`,
            ),
    },
  ],
  [
    defs.species.properties!.coefficient,
    {
      multipleOf: (p, v) => sentenceAt(p, `must be a whole number or a half, e.g. 1, 2 or 0.5 (got ${formatValue(v)})`),
      minimum: (p, v) => sentenceAt(p, `must be at least 0.5; a species that does not take part is left out (got ${formatValue(v)})`),
    },
  ],
  [
    defs.inchi,
    { pattern: (p, v) => sentenceAt(p, `must start with "InChI=1S/" or "InChI=1/" and contain no spaces (got ${formatValue(v)})`) },
  ],
  [defs.smiles, { pattern: (p, v) => sentenceAt(p, `must not contain spaces (got ${formatValue(v)})`) }],
  [defs.webAddress, { pattern: webAddressRule, format: webAddressRule }],
  [
    defs.uncertainty.allOf![1].then!.properties!.value,
    {
      maximum: (p, v) =>
        sentenceWithPrefix(
          p,
          `a relative uncertainty may be at most ${formatValue(MAX_RELATIVE_UNCERTAINTY_PERCENT)} % (got ${formatValue(v)} %); check the value, or give it as a factor`,
        ),
    },
  ],
  [
    defs.uncertainty.allOf![0].then!.properties!.value,
    {
      exclusiveMinimum: (p, v) =>
        sentenceWithPrefix(p, `an uncertainty factor f (k/f to k·f) must be greater than 1 (got ${formatValue(v)})`),
    },
  ],
  [
    defs.reaction.allOf![1].else!.properties!.products,
    {
      minItems: (p) =>
        sentenceAt(
          p,
          "must list at least one product; if the products were not determined (an overall removal rate), give productsUnknown with a reason instead",
        ),
    },
  ],
  [defs.reaction.allOf![0].then!, { required: (p) => sentenceAt(p, "is required when the phase is liquid") }],
  [defs.reportedFit.then!, { required: (p) => sentenceAt(p, "is required for the modified_arrhenius model") }],
  [defs.cslName, { anyOf: (p) => sentenceAt(p, "needs a family name or a literal name (an organisation) that is not blank") }],
  [
    defs.pressureCondition,
    {
      oneOf: (p, _v, e) =>
        Array.isArray((e.params as { passingSchemas?: unknown }).passingSchemas)
          ? sentenceAt(p, "must be either a single value or a range (min and max), not both")
          : sentenceAt(p, "needs either a single value, or min and max for a range"),
    },
  ],
  [depositSchema.properties!.points, { maxItems: (_p, v) => tooManyPointsMessage(Array.isArray(v) ? v.length : MAX_POINTS + 1) }],
  [
    depositSchema.properties!.$schema,
    { const: (p, v) => sentenceAt(p, `must be "${depositSchema.$id}" when given (got ${formatValue(v)})`) },
  ],
]);

function specificRule(e: ErrorObject): MessageRule | undefined {
  return e.parentSchema ? SPECIFIC.get(e.parentSchema)?.[e.keyword] : undefined;
}

/** The message for a document with more points than one dataset may hold. */
export function tooManyPointsMessage(count: number): string {
  return `The dataset has ${formatCount(count)} points; the limit is ${formatCount(MAX_POINTS)}. Split it into several datasets, for example by temperature range or bath gas.`;
}

function typeWord(type: string): string {
  switch (type) {
    case "number":
      return "a number";
    case "integer":
      return "a whole number";
    case "string":
      return "text";
    case "array":
      return "a list";
    case "object":
      return "a group of fields";
    case "boolean":
      return "true or false";
    default:
      return type;
  }
}

function fieldTitle(parentSegments: string[], name: string): string {
  return schemaAtSegments([...parentSegments, name])?.title ?? name;
}

function alternatives(branches: SchemaNode[] | undefined, segments: string[]): string {
  const options = (branches ?? [])
    .map((b) => (b.required ?? []).map((name) => lowerFirst(fieldTitle(segments, name))).join(" and "))
    .filter(Boolean);
  return joinAlternatives(options);
}

function messageFor(e: ErrorObject, pointer: string): string {
  const specific = specificRule(e);
  if (specific) return specific(pointer, e.data, e);
  const v = e.data;
  const p = e.params as Record<string, unknown>;
  const segments = splitPointer(e.instancePath);
  switch (e.keyword) {
    case "required":
      return sentenceAt(pointer, "is required");
    case "additionalProperties": {
      const allowed = Object.keys(schemaAtSegments(segments)?.properties ?? {});
      const where = e.instancePath ? ` of ${lowerFirst(schemaAtSegments(segments)?.title ?? "this group")}` : " of a deposit document";
      return `"${String(p.additionalProperty)}" is not a field${where}${allowed.length ? `; the fields are: ${allowed.join(", ")}` : ""}.`;
    }
    case "type": {
      const want = String(p.type);
      if ((want === "number" || want === "integer") && typeof v === "string") {
        const looksNumeric = v.trim() !== "" && Number.isFinite(Number(v));
        return looksNumeric
          ? sentenceAt(pointer, `must be ${typeWord(want)}, not text: write ${v.trim()} without quotes`)
          : sentenceAt(pointer, `must be ${typeWord(want)}; ${formatValue(v)} is not a number`);
      }
      if (want === "integer" && typeof v === "number") return sentenceAt(pointer, `must be a whole number (got ${v})`);
      return sentenceAt(
        pointer,
        `must be ${typeWord(want)} (got ${describeType(v)}${v !== null && typeof v !== "object" ? ` ${formatValue(v)}` : ""})`,
      );
    }
    case "enum": {
      const allowed = (p.allowedValues as unknown[]).map((a) => String(a));
      if (pointer === "/reaction/class" && typeof v === "string" && Object.hasOwn(RETIRED_REACTION_CLASS_IDS, v)) {
        return sentenceAt(pointer, `uses the retired id ${formatValue(v)}: write "${RETIRED_REACTION_CLASS_IDS[v]}" instead`);
      }
      return sentenceAt(pointer, `must be one of: ${allowed.join(", ")} (got ${formatValue(v)})`);
    }
    case "const":
      return sentenceAt(pointer, `must be ${formatValue(p.allowedValue)} (got ${formatValue(v)})`);
    case "minimum":
      return sentenceAt(pointer, `must be at least ${String(p.limit)} (got ${formatValue(v)})`);
    case "maximum":
      return sentenceAt(pointer, `must be at most ${String(p.limit)} (got ${formatValue(v)})`);
    case "exclusiveMinimum":
      return sentenceAt(pointer, `must be greater than ${String(p.limit)} (got ${formatValue(v)})`);
    case "exclusiveMaximum":
      return sentenceAt(pointer, `must be less than ${String(p.limit)} (got ${formatValue(v)})`);
    case "multipleOf":
      return sentenceAt(pointer, `must be a multiple of ${String(p.multipleOf)} (got ${formatValue(v)})`);
    case "minLength":
      return p.limit === 1
        ? sentenceAt(pointer, "must not be empty")
        : sentenceAt(pointer, `must be at least ${String(p.limit)} characters long (got ${formatValue(v)})`);
    case "maxLength":
      return sentenceAt(
        pointer,
        `must be at most ${formatCount(Number(p.limit))} characters long (it has ${formatCount(String(v).length)})`,
      );
    case "minItems":
      return sentenceAt(
        pointer,
        `must have at least ${String(p.limit)} ${p.limit === 1 ? "entry" : "entries"} (it has ${Array.isArray(v) ? v.length : 0})`,
      );
    case "maxItems":
      return sentenceAt(
        pointer,
        `can have at most ${formatCount(Number(p.limit))} entries (it has ${Array.isArray(v) ? formatCount(v.length) : "more"})`,
      );
    case "uniqueItems":
      return sentenceAt(
        pointer,
        `lists the same value twice (entries ${Math.min(Number(p.i), Number(p.j)) + 1} and ${Math.max(Number(p.i), Number(p.j)) + 1})`,
      );
    case "anyOf":
      return sentenceAt(pointer, `needs at least one of: ${alternatives((e.schema as SchemaNode[]) ?? [], segments)}`);
    case "oneOf":
      return Array.isArray(p.passingSchemas)
        ? sentenceAt(pointer, `must have only one of: ${alternatives(e.schema as SchemaNode[], segments)} — not both`)
        : sentenceAt(pointer, `needs one of: ${alternatives(e.schema as SchemaNode[], segments)}`);
    case "dependentRequired":
      return sentenceAt(pointer, `is required when ${lowerFirst(fieldTitle(segments, String(p.property)))} is given`);
    case "pattern":
      // Required text must say something: blanks alone are refused as the class they are.
      if (e.schema === NON_BLANK_PATTERN) return sentenceAt(pointer, `must contain a character other than spaces (got ${formatValue(v)})`);
      return sentenceAt(pointer, `is not in the expected form (got ${formatValue(v)})`);
    case "format":
      return sentenceAt(pointer, `is not a valid ${String(p.format)} (got ${formatValue(v)})`);
    default:
      return sentenceAt(pointer, `is not valid (${e.message ?? e.keyword})`);
  }
}

function pointerOf(e: ErrorObject): string {
  const p = e.params as Record<string, unknown>;
  if (e.keyword === "required") return `${e.instancePath}/${escapePointerSegment(String(p.missingProperty))}`;
  if (e.keyword === "additionalProperties") return `${e.instancePath}/${escapePointerSegment(String(p.additionalProperty))}`;
  return e.instancePath;
}

function valueOf(e: ErrorObject): { value?: unknown } {
  const p = e.params as Record<string, unknown>;
  if (e.keyword === "required") return {};
  if (e.keyword === "additionalProperties") {
    const container = e.data as Record<string, unknown> | undefined;
    return offendingValue(container?.[String(p.additionalProperty)]);
  }
  return offendingValue(e.data);
}

/**
 * Translate ajv errors (compiled with `verbose: true`) into at most `limit` FieldErrors, one per
 * pointer. Returns the errors and how many distinct problems there were in all.
 */
export function translateAjvErrors(errors: readonly ErrorObject[], limit: number): { errors: FieldError[]; total: number } {
  // anyOf/oneOf: drop the errors of their individual branches; the combined message says it all.
  const combined = errors.filter((e) => e.keyword === "anyOf" || e.keyword === "oneOf");
  const isBranchError = (e: ErrorObject) =>
    combined.some(
      (c) =>
        c !== e &&
        e.schemaPath.startsWith(`${c.schemaPath}/`) &&
        (e.instancePath === c.instancePath || e.instancePath.startsWith(`${c.instancePath}/`)),
    );
  const seen = new Set<string>();
  const out: FieldError[] = [];
  let total = 0;
  for (const e of errors) {
    // "must match then/else schema" only repeats the error inside then/else.
    if (e.keyword === "if") continue;
    if (combined.length && isBranchError(e)) continue;
    const pointer = pointerOf(e);
    if (seen.has(pointer)) continue;
    seen.add(pointer);
    total++;
    if (out.length < limit) out.push({ pointer, message: messageFor(e, pointer), ...valueOf(e) });
  }
  return { errors: out, total };
}
