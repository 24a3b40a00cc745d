/**
 * Validation of a deposit document: JSON Schema (ajv, draft 2020-12, compiled once per process),
 * then the semantic checks the schema cannot express. Every problem comes back as a FieldError
 * with a JSON pointer, the offending value and a plain sentence, ready for the editor (beside the
 * field or row) and for the API (a problem+json 422 list).
 */
import Ajv2020 from "ajv/dist/2020";
import addFormats from "ajv-formats";
import type { FieldError } from "@/lib/errors";
import { findUnstorableText } from "@/lib/storable-text";
import { checkDepositSemantics } from "./check-semantics";
import { utf8ByteLength } from "./byte-length";
import { findJsonSyntaxProblem } from "./json-syntax";
import { formatCount } from "./messages";
import { depositSchema } from "./schema";
import { tooManyPointsMessage, translateAjvErrors } from "./translate-errors";
import type { DepositDocument } from "./types";
import { DEFAULT_LICENCE, MAX_POINTS } from "./vocabulary";

/** Most errors returned for one document; a 100 000-row table with one mistake per row stays readable. */
export const MAX_VALIDATION_ERRORS = 200;

/** Largest JSON text accepted, bytes (the same limit as an uploaded file). */
export const MAX_DOCUMENT_BYTES = 25 * 1024 * 1024;

export type ValidationResult = { ok: true; value: DepositDocument } | { ok: false; errors: FieldError[] };

// Compiled once at module load: compiling takes milliseconds, validating a 100 000-point document
// tens of milliseconds. verbose: true keeps the offending value (`data`) on each error.
const ajv = new Ajv2020({ allErrors: true, verbose: true, strictTuples: false, allowUnionTypes: true });
addFormats(ajv, ["uri"]);
const validateAgainstSchema = ajv.compile<DepositDocument>(depositSchema);

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
    return { ok: false, errors: [{ pointer: "", message: `A deposit document must be a JSON object with fields such as title, reaction and points (got ${got}).` }] };
  }

  const schemaOk = validateAgainstSchema(doc);
  const translated = schemaOk ? { errors: [] as FieldError[], total: 0 } : translateAjvErrors(validateAgainstSchema.errors ?? [], MAX_VALIDATION_ERRORS);
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

  if (total === 0) {
    const value = doc as DepositDocument;
    return { ok: true, value: { ...value, license: value.license ?? DEFAULT_LICENCE } };
  }
  if (total > errors.length) {
    errors.push({ pointer: "", message: `Showing the first ${formatCount(errors.length)} of ${formatCount(total)} problems; correct these and validate again to see the rest.` });
  }
  return { ok: false, errors };
}

/**
 * Parse the text of a deposit document. Malformed JSON becomes one FieldError at pointer "" whose
 * message gives the line, column and character position, e.g.
 * `The document is not valid JSON: unexpected "}"; a trailing comma is not allowed (line 3, column 1, character 25).`
 */
export function parseDepositJson(text: string): { ok: true; value: unknown } | { ok: false; errors: FieldError[] } {
  const body = text.charCodeAt(0) === 0xfeff ? text.slice(1) : text; // a byte-order mark is not JSON
  if (body.length > MAX_DOCUMENT_BYTES || utf8ByteLength(body) > MAX_DOCUMENT_BYTES) {
    return { ok: false, errors: [{ pointer: "", message: `The document is ${(utf8ByteLength(body) / 1024 / 1024).toFixed(1)} MB; the limit is 25 MB.` }] };
  }
  if (body.trim() === "") return { ok: false, errors: [{ pointer: "", message: "The document is empty; a deposit document is a JSON object." }] };
  try {
    return { ok: true, value: JSON.parse(body) };
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
}

/** parseDepositJson, then validateDeposit. */
export function parseAndValidateDeposit(text: string): ValidationResult {
  const parsed = parseDepositJson(text);
  return parsed.ok ? validateDeposit(parsed.value) : parsed;
}
