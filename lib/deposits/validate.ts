/**
 * Validation of a deposit document: JSON Schema (ajv, draft 2020-12, compiled once per process),
 * then the semantic checks the schema cannot express. Every problem comes back as a FieldError
 * with a JSON pointer, the offending value and a plain sentence, ready for the editor (beside the
 * field or row) and for the API (a problem+json 422 list).
 */
import Ajv2020 from "ajv/dist/2020";
import type { ErrorObject, ValidateFunction } from "ajv";
import addFormats from "ajv-formats";
import type { FieldError } from "@/lib/errors";
import { tooDeepError } from "@/lib/json-depth";
import { findUnstorableText } from "@/lib/storable-text";
import { findForbiddenCharacters } from "./text-characters";
import { checkDepositSemantics } from "./check-semantics";
import { utf8ByteLength } from "./byte-length";
import { findDuplicateKeys } from "./duplicate-keys";
import { findJsonSyntaxProblem } from "./json-syntax";
import { formatCount, sentenceAt } from "./messages";
import { makeFastPointCheck } from "./fast-point-check";
import { depositSchema, splitPointer } from "./schema";
import { tooManyPointsMessage, translateAjvErrors } from "./translate-errors";
import type { DepositDocument } from "./types";
import { DEFAULT_LICENCE, MAX_POINTS } from "./vocabulary";
import { MAX_DOCUMENT_BYTES } from "./limits";

/** Most errors returned for one document; a 100 000-row table with one mistake per row stays readable. */
export const MAX_VALIDATION_ERRORS = 200;

export { MAX_DOCUMENT_BYTES };

export type ValidationResult = { ok: true; value: DepositDocument } | { ok: false; errors: FieldError[] };

// Compiled once per process, on first use rather than at module load: compiling takes a few
// hundred milliseconds, and the request thread, which loads this module with every deposit
// route, never validates a document itself (the analysis worker threads do). verbose: true keeps
// the offending value (`data`) on each error.
//
// The points are validated row by row, never by the document validator: with allErrors, ajv
// concatenates the error list of every referenced subschema call into the parent's, which is
// quadratic in the number of errors (a 20 000-row table with a bad value per row took a minute).
// Row by row the cost is linear, and rows the fast check recognises skip ajv altogether.
const pointsItems = depositSchema.properties!.points.items!;
type DepositValidators = {
  validateAgainstSchema: ValidateFunction<DepositDocument>;
  validatePoint: ValidateFunction;
  isCertainlyValidPoint: (row: unknown) => boolean;
};
/** Where ajv's strict-mode remarks go; tests pass a logger that records them. */
export type AjvLogger = Pick<Console, "log" | "warn" | "error">;

/** Compile the deposit schema (a strict-mode remark goes to `logger`, so a test can refuse any). */
export function compileDepositValidators(logger: AjvLogger = console): DepositValidators {
  const ajv = new Ajv2020({ allErrors: true, verbose: true, strictTuples: false, allowUnionTypes: true, logger });
  addFormats(ajv, ["uri"]);
  return {
    validateAgainstSchema: ajv.compile<DepositDocument>(depositSchema),
    validatePoint: ajv.compile({ $ref: `${depositSchema.$id}#/properties/points/items` }),
    isCertainlyValidPoint: makeFastPointCheck(pointsItems) ?? (() => false),
  };
}
let compiled: DepositValidators | null = null;
function validators() {
  compiled ??= compileDepositValidators();
  return compiled;
}
/** What the document validator sees instead of a long points list (two rows it accepts). */
const POINTS_STAND_IN = [
  { T: 300, k: 1 },
  { T: 300, k: 1 },
];
/** Top-level fields the schema lists after points: their errors come after the rows' errors. */
const FIELDS_AFTER_POINTS = new Set(
  Object.keys(depositSchema.properties!).slice(Object.keys(depositSchema.properties!).indexOf("points") + 1),
);

/**
 * Schema errors of a document, at most `limit` translated, plus the number of distinct problems.
 * The document is validated with its points replaced by a stand-in; then each row on its own.
 */
function schemaErrorsOf(doc: Record<string, unknown>, limit: number): { errors: FieldError[]; total: number } {
  const { validateAgainstSchema, validatePoint, isCertainlyValidPoint } = validators();
  const points = doc.points;
  // Fewer than two rows: the document validator reports minItems itself (and the rows are few).
  const rows = Array.isArray(points) && points.length >= 2 ? points : undefined;
  validateAgainstSchema(rows ? { ...doc, points: POINTS_STAND_IN } : doc);
  const docErrors = validateAgainstSchema.errors ?? [];
  const split = docErrors.findIndex((e) => FIELDS_AFTER_POINTS.has(splitPointer(e.instancePath)[0]));
  const before = split < 0 ? docErrors : docErrors.slice(0, split);
  const after = split < 0 ? [] : docErrors.slice(split);

  const out = translateAjvErrors(before, limit);
  const errors = out.errors;
  let total = out.total;
  if (rows) {
    for (let i = 0; i < rows.length; i++) {
      const row = rows[i];
      if (isCertainlyValidPoint(row) || validatePoint(row)) continue;
      const prefix = `/points/${i}`;
      const rowErrors = (validatePoint.errors ?? []).map((e): ErrorObject => ({ ...e, instancePath: prefix + e.instancePath }));
      // Past the cap the rows are still counted (for the total) but no message is built.
      const translated = translateAjvErrors(rowErrors, limit - errors.length);
      errors.push(...translated.errors);
      total += translated.total;
    }
  }
  const rest = translateAjvErrors(after, limit - errors.length);
  errors.push(...rest.errors);
  total += rest.total;
  return { errors, total };
}

/**
 * Validate a parsed deposit document.
 *
 * On success, `value` is the same document with the licence defaulted to CC-BY-4.0 (a shallow
 * copy; the input is not changed). On failure, up to {@link MAX_VALIDATION_ERRORS} errors, then one
 * summary error at pointer "" when more were found. A document with more than 100 000 points is
 * refused with that single error, without validating its rows.
 *
 * @example validateDeposit(EXAMPLE_DEPOSIT).ok // true
 */
export function validateDeposit(doc: unknown): ValidationResult {
  if (typeof doc === "object" && doc !== null && !Array.isArray(doc)) {
    const points = (doc as { points?: unknown }).points;
    if (Array.isArray(points) && points.length > MAX_POINTS) {
      return { ok: false, errors: [{ pointer: "/points", message: tooManyPointsMessage(points.length), value: points.length }] };
    }
  } else {
    const got = Array.isArray(doc) ? "a list" : doc === null ? "null" : typeof doc;
    return {
      ok: false,
      errors: [
        { pointer: "", message: `A deposit document must be a JSON object with fields such as title, reaction and points (got ${got}).` },
      ],
    };
  }

  const translated = schemaErrorsOf(doc as Record<string, unknown>, MAX_VALIDATION_ERRORS);
  const errors = translated.errors;
  let total = translated.total;
  const pointers = new Set(errors.map((e) => e.pointer));
  const report = (error: FieldError) => {
    // A value the schema already complained about needs no second message.
    if (pointers.has(error.pointer)) return;
    pointers.add(error.pointer);
    total++;
    if (errors.length < MAX_VALIDATION_ERRORS) errors.push(error);
  };
  checkDepositSemantics(doc, report);
  // PostgreSQL refuses NUL and lone surrogates in text and jsonb: refused here, never stripped.
  findUnstorableText(doc, MAX_VALIDATION_ERRORS).forEach(report);
  // Control characters and the like in any text (tab and line breaks only in multi-line fields).
  findForbiddenCharacters(doc, MAX_VALIDATION_ERRORS).forEach(report);

  if (total === 0) {
    const value = doc as DepositDocument;
    return { ok: true, value: { ...value, license: value.license ?? DEFAULT_LICENCE } };
  }
  if (total > errors.length) {
    errors.push({
      pointer: "",
      message: `Showing the first ${formatCount(errors.length)} of ${formatCount(total)} problems; correct these and validate again to see the rest.`,
    });
  }
  return { ok: false, errors };
}

/**
 * Parse the text of a deposit document. Malformed JSON becomes one FieldError at pointer "" whose
 * message gives the line, column and character position, e.g.
 * `The document is not valid JSON: unexpected "}"; a trailing comma is not allowed (line 3, column 1, character 25).`
 */
export function parseDepositJson(
  text: string,
  { checkDuplicateKeys = true }: { checkDuplicateKeys?: boolean } = {},
): { ok: true; value: unknown } | { ok: false; errors: FieldError[] } {
  const body = text.charCodeAt(0) === 0xfeff ? text.slice(1) : text; // a byte-order mark is not JSON
  if (body.length > MAX_DOCUMENT_BYTES || utf8ByteLength(body) > MAX_DOCUMENT_BYTES) {
    return {
      ok: false,
      errors: [{ pointer: "", message: `The document is ${(utf8ByteLength(body) / 1024 / 1024).toFixed(1)} MB; the limit is 25 MB.` }],
    };
  }
  if (body.trim() === "")
    return { ok: false, errors: [{ pointer: "", message: "The document is empty; a deposit document is a JSON object." }] };
  let value: unknown;
  try {
    value = JSON.parse(body);
  } catch (e) {
    const problem = findJsonSyntaxProblem(body);
    if (!problem) return { ok: false, errors: [{ pointer: "", message: `The document is not valid JSON: ${(e as Error).message}` }] };
    const excerpt = body.slice(Math.max(0, problem.offset - 20), problem.offset + 20);
    return {
      ok: false,
      errors: [
        {
          pointer: "",
          value: excerpt,
          message: `The document is not valid JSON: ${problem.problem} (line ${problem.line}, column ${problem.column}, character ${problem.offset + 1}).`,
        },
      ],
    };
  }
  // Every later check walks the tree recursively: a value nested thousands deep is refused first.
  const tooDeep = tooDeepError(value);
  if (tooDeep) return { ok: false, errors: [tooDeep] };
  // JSON.parse keeps the last of two equal keys; a document must say each thing once.
  const duplicates = checkDuplicateKeys ? findDuplicateKeys(body, MAX_VALIDATION_ERRORS) : [];
  if (duplicates.length) {
    return {
      ok: false,
      errors: duplicates.map((d) => ({
        pointer: d.pointer,
        message: sentenceAt(
          d.pointer,
          `is given more than once (again at line ${d.line}, column ${d.column}); JSON keeps only one of them, so give each field once`,
        ),
      })),
    };
  }
  return { ok: true, value };
}

/** parseDepositJson, then validateDeposit. */
export function parseAndValidateDeposit(text: string): ValidationResult {
  const parsed = parseDepositJson(text);
  return parsed.ok ? validateDeposit(parsed.value) : parsed;
}
