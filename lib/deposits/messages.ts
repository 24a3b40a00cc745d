/**
 * Wording helpers for deposit errors: which field a JSON pointer names ("Point 7: rate constant"),
 * how to show an offending value, how to print counts. Labels come from the schema's `title`s.
 */
import { schemaAtSegments, splitPointer } from "./schema";

/** Lower-case the first letter unless the first word is an acronym or mixed case (SMILES, InChI, ORCID iD). */
export function lowerFirst(label: string): string {
  const firstWord = label.split(/[\s-]/)[0];
  if (/[A-Z]/.test(firstWord.slice(1))) return label;
  return label.charAt(0).toLowerCase() + label.slice(1);
}

export function upperFirst(text: string): string {
  return text.charAt(0).toUpperCase() + text.slice(1);
}

/** 100001 → "100,001". */
export function formatCount(n: number): string {
  return n.toLocaleString("en-GB");
}

/** A value as it should appear inside a message: strings quoted and shortened, numbers as written. */
export function formatValue(value: unknown): string {
  if (typeof value === "string") {
    const shown = value.length > 60 ? `${value.slice(0, 57)}…` : value;
    return JSON.stringify(shown);
  }
  if (typeof value === "number" || typeof value === "boolean" || value === null) return String(value);
  if (Array.isArray(value)) return `a list of ${formatCount(value.length)} ${value.length === 1 ? "entry" : "entries"}`;
  if (typeof value === "object") return "a group of fields";
  return String(value);
}

/** Name of what a value is, for type errors: "text", "a number", … */
export function describeType(value: unknown): string {
  if (value === null) return "null";
  if (Array.isArray(value)) return "a list";
  switch (typeof value) {
    case "string":
      return "text";
    case "number":
      return Number.isInteger(value) ? "a whole number" : "a number";
    case "boolean":
      return "true/false";
    case "object":
      return "a group of fields";
    default:
      return typeof value;
  }
}

/** The offending value to attach to a FieldError: primitives only (a 100 000-entry list is not echoed). */
export function offendingValue(value: unknown): { value?: unknown } {
  if (value === undefined) return {};
  if (value === null || ["string", "number", "boolean"].includes(typeof value)) return { value };
  return {};
}

/**
 * How a message names the value at `pointer`: `{ prefix: "Point 7", label: "Rate constant" }` for
 * /points/6/k; `{ label: "Point 7" }` for /points/6; `{ label: "Reaction order" }` for /reaction/order.
 */
export function describePointer(pointer: string): { prefix?: string; label: string } {
  const segments = splitPointer(pointer);
  const parts: string[] = [];
  for (let j = 0; j < segments.length; j++) {
    if (/^\d+$/.test(segments[j]) && j < segments.length - 1) {
      const item = schemaAtSegments(segments.slice(0, j + 1));
      parts.push(`${item?.title ?? "Entry"} ${Number(segments[j]) + 1}`);
    }
  }
  const last = segments[segments.length - 1];
  let label: string;
  if (last === undefined) label = "The document";
  else if (/^\d+$/.test(last)) label = `${schemaAtSegments(segments)?.title ?? "Entry"} ${Number(last) + 1}`;
  else label = schemaAtSegments(segments)?.title ?? `"${last}"`;
  return parts.length ? { prefix: parts.join(", "), label } : { label };
}

/**
 * A sentence about the value at `pointer`: subject + predicate, e.g.
 * sentenceAt("/points/6/k", "must be greater than 0") → "Point 7: rate constant must be greater than 0."
 */
export function sentenceAt(pointer: string, predicate: string): string {
  const { prefix, label } = describePointer(pointer);
  const text = prefix ? `${prefix}: ${lowerFirst(label)} ${predicate}` : `${label} ${predicate}`;
  return /[.!?]$/.test(text) ? text : `${text}.`;
}

/** A sentence that starts with the row context only, e.g. "Point 7: -300 °C is below absolute zero." */
export function sentenceWithPrefix(pointer: string, text: string): string {
  const { prefix } = describePointer(pointer);
  const body = prefix ? `${prefix}: ${text}` : upperFirst(text);
  return /[.!?]$/.test(body) ? body : `${body}.`;
}

/**
 * The one wording for a temperature at or below absolute zero, in the editor, the checks of a
 * document and a table import alike: "must be above absolute zero (got -5 K)", and with an offset
 * unit the kelvin value too: "(got -300 °C, which is -26.85 K)". `written` is the value as typed.
 */
export function aboveAbsoluteZeroWords(written: string, unit: { label: string; offset?: number }, kelvin: number): string {
  const inKelvin = unit.offset ? `, which is ${Number(kelvin.toFixed(2))} K` : "";
  return `must be above absolute zero (got ${written} ${unit.label}${inKelvin})`;
}

/** ["a"] → "a"; ["a", "b"] → "a or b"; ["a", "b", "c"] → "a, b or c". */
export function joinAlternatives(options: readonly string[]): string {
  if (options.length <= 1) return options.join("");
  return `${options.slice(0, -1).join(", ")} or ${options[options.length - 1]}`;
}
