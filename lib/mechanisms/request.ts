/**
 * A mechanism check's request body → the mechanism, on a worker thread. The body is either the
 * mechanism itself (text/plain, application/yaml…; window and name in the query) or JSON
 * {text, name?, window?: {Tmin, Tmax}, format?}. Failures come back as values (structured clone
 * does not carry AppError) with the status they deserve: 413 past 20 MB, 422 naming line and column.
 */
import { describeCharacter, forbiddenCharacter, SUSPECT_CHARACTER } from "@/lib/text/clean";
import { z } from "zod";
import type { ErrorCode, FieldError } from "@/lib/errors";
import { checkMechanismSize, MAX_MECHANISM_BYTES } from "./limits";
import { readMechanism } from "./read-mechanism";
import type { ParsedMechanism } from "./types";
import { DEFAULT_USE_WINDOW } from "./verdicts";

/** Highest temperature a use window may reach, K. */
export const MAX_WINDOW_T = 10_000;

export const mechanismWindowSchema = z
  .object({
    Tmin: z.number().positive().max(MAX_WINDOW_T),
    Tmax: z.number().positive().max(MAX_WINDOW_T),
  })
  .strict()
  .refine((w) => w.Tmin < w.Tmax, { message: "Tmin must be below Tmax", path: ["Tmax"] });

export const mechanismCheckBodySchema = z
  .object({
    text: z.string().min(1, "the mechanism text is empty"),
    name: z.string().trim().min(1).max(200).optional(),
    window: mechanismWindowSchema.optional(),
    format: z.enum(["auto", "cantera-yaml", "plain-text"]).optional(),
  })
  .strict();

/** POST /api/v1/mechanism-checks/species-choices (JSON form) */
export const speciesChoicesBodySchema = z
  .object({
    choices: z
      .array(
        z
          .object({
            name: z.string().trim().min(1).max(200),
            inchiKey: z.string().regex(/^[A-Z]{14}-[A-Z]{10}-[A-Z]$/, "must be an InChIKey"),
          })
          .strict(),
      )
      .min(1)
      .max(10_000),
  })
  .strict();

/** POST /api/v1/mechanism-checks/:id/share */
export const shareBodySchema = z.object({ shared: z.boolean() }).strict();

export type MechanismCheckBody = z.infer<typeof mechanismCheckBodySchema>;

export interface MechanismRequestInput {
  bytes: Uint8Array;
  json: boolean;
  /** From the query when the body is the mechanism itself. */
  name?: string | null;
  window?: { Tmin: number; Tmax: number } | null;
  format?: "auto" | "cantera-yaml" | "plain-text";
}

export type MechanismRequestOutcome =
  | { ok: true; text: string; name: string; window: { Tmin: number; Tmax: number }; mechanism: ParsedMechanism }
  | { ok: false; code: ErrorCode; message: string; errors: FieldError[] };

const fail = (code: ErrorCode, message: string, errors: FieldError[] = []): MechanismRequestOutcome => ({
  ok: false,
  code,
  message,
  errors,
});

export function readMechanismRequest(input: MechanismRequestInput): MechanismRequestOutcome {
  const size = checkMechanismSize(input.bytes.byteLength - (input.json ? 64 * 1024 : 0));
  if (size) return fail("payload_too_large", size.message);
  let text: string;
  try {
    text = new TextDecoder("utf-8", { fatal: true }).decode(input.bytes);
  } catch {
    return fail("validation_failed", "This is not a text file: the body is not UTF-8 text.", [{ pointer: "", message: "not UTF-8 text" }]);
  }
  let name = input.name ?? null;
  let window = input.window ?? null;
  let format = input.format ?? "auto";
  const pointer = input.json ? "/text" : "";
  if (input.json) {
    let body: unknown;
    try {
      body = JSON.parse(text);
    } catch (err) {
      return fail("validation_failed", `The body is not valid JSON: ${(err as Error).message}`, [
        { pointer: "", message: "not valid JSON" },
      ]);
    }
    const parsed = mechanismCheckBodySchema.safeParse(body);
    if (!parsed.success) {
      const errors = parsed.error.issues.map((i) => ({ pointer: i.path.map((p) => `/${String(p)}`).join(""), message: i.message }));
      return fail(
        "validation_failed",
        `The request has ${errors.length} problem${errors.length === 1 ? "" : "s"}: ${errors[0].pointer} ${errors[0].message}`,
        errors,
      );
    }
    text = parsed.data.text;
    if (new TextEncoder().encode(text).byteLength > MAX_MECHANISM_BYTES)
      return fail("payload_too_large", checkMechanismSize(MAX_MECHANISM_BYTES + 1)!.message);
    name = parsed.data.name ?? name;
    window = parsed.data.window ?? window;
    format = parsed.data.format ?? format;
  }
  // The name as given (query or JSON): one line of at most 200 characters that every export can carry.
  if (name !== null) {
    name = name.trim();
    const bad = forbiddenCharacter(name, { lines: false });
    const namePointer = input.json ? "/name" : "name";
    if (name.length > 200 || !name || bad) {
      const message = bad
        ? `The name holds ${describeCharacter(bad.character)} at character ${bad.index + 1}; remove it`
        : name
          ? `The name is ${name.length} characters; at most 200`
          : "The name is empty";
      return fail("validation_failed", message, [{ pointer: namePointer, message }]);
    }
  }
  const read = readMechanism(text, format);
  if (!read.ok) {
    const { line, column, message, code } = read.failure;
    return fail("validation_failed", message, [{ pointer, message, value: { line, column, code } }]);
  }
  return {
    ok: true,
    text,
    name: name ?? firstWords(text),
    window: window ?? { ...DEFAULT_USE_WINDOW },
    mechanism: read.mechanism,
  };
}

/** A name for an unnamed check: its first line that is neither blank nor a keyword. */
function firstWords(text: string): string {
  const line = text
    .slice(0, 2000)
    .split("\n")
    .map((l) => l.replace(/^[\s!#]+/, "").trim())
    .find((l) => l.length > 0);
  // From the file's own text: characters no export could carry are dropped, not refused.
  return ((line ?? "").replace(new RegExp(SUSPECT_CHARACTER.source, "gu"), "").trim() || "Mechanism").slice(0, 80);
}
