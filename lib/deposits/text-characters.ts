/**
 * The one rule for characters in a deposit's text (lib/text/clean.ts forbiddenCharacter): no
 * control character, DEL/C1 control, lone surrogate or noncharacter (U+FDD0–U+FDEF, U+FFFE/U+FFFF)
 * in any text of the document; tab and line breaks only in the fields written over several lines,
 * and no line/paragraph separator (U+2028/U+2029), text direction control or zero width space in a one-line field. The editor, the table import
 * (through the editor's save) and the API all validate through here, so a document holding one is
 * refused as a whole, with the JSON pointer and the character named. Pure.
 */
import type { FieldError } from "@/lib/errors";
import { SUSPECT_CHARACTER, describeCharacter, forbiddenCharacter } from "@/lib/text/clean";
import { sentenceAt } from "./messages";
import { escapePointerSegment } from "./schema";

/** The fields written over several lines (text areas in the editor); every other text is one line. */
export const MULTI_LINE_FIELDS: ReadonlySet<string> = new Set(["/description", "/method/notes", "/conditions/notes"]);

const SUSPECT = SUSPECT_CHARACTER;

/** The error for one string, or null when it is fine. */
export function forbiddenCharacterError(pointer: string, text: string): FieldError | null {
  if (!SUSPECT.test(text)) return null;
  const lines = MULTI_LINE_FIELDS.has(pointer);
  const found = forbiddenCharacter(text, { lines });
  if (!found) return null;
  const what = describeCharacter(found.character);
  const where = lines ? "any text" : "a one-line field";
  return {
    pointer,
    message: sentenceAt(pointer, `contains ${what} at character ${found.index + 1} (${pointer}), which ${where} may not hold; remove it`),
    value: text,
  };
}

/**
 * Every string of a parsed deposit document holding a forbidden character, with its pointer, at
 * most `limit`. Iterative (a deep document cannot overflow the stack).
 *
 * @example findForbiddenCharacters({ creators: [{ name: "A" }, { name: "B\u0007" }] })[0].pointer // "/creators/1/name"
 */
export function findForbiddenCharacters(doc: unknown, limit = 200): FieldError[] {
  // The common case (nothing suspect) takes one pass that pushes only objects and arrays.
  if (!containsSuspectText(doc)) return [];
  const errors: FieldError[] = [];
  // Pointers are built only for a string that fails (a 100 000-row table has half a million strings).
  type Frame = { value: unknown; parent: Frame | null; key: string };
  const pointerOf = (f: Frame): string => {
    const parts: string[] = [];
    for (let at: Frame | null = f; at && at.parent; at = at.parent) parts.push(escapePointerSegment(at.key));
    return parts.length ? `/${parts.reverse().join("/")}` : "";
  };
  const stack: Frame[] = [{ value: doc, parent: null, key: "" }];
  while (stack.length && errors.length < limit) {
    const frame = stack.pop()!;
    const v = frame.value;
    if (typeof v === "string") {
      if (!SUSPECT.test(v)) continue;
      const error = forbiddenCharacterError(pointerOf(frame), v);
      if (error) errors.push(error);
    } else if (Array.isArray(v)) {
      for (let i = v.length - 1; i >= 0; i--) {
        const child = v[i];
        if (typeof child === "string" ? SUSPECT.test(child) : child !== null && typeof child === "object")
          stack.push({ value: child, parent: frame, key: String(i) });
      }
    } else if (v !== null && typeof v === "object") {
      const keys = Object.keys(v);
      for (let i = keys.length - 1; i >= 0; i--) {
        const child = (v as Record<string, unknown>)[keys[i]];
        if (typeof child === "string" ? SUSPECT.test(child) : child !== null && typeof child === "object")
          stack.push({ value: child, parent: frame, key: keys[i] });
      }
    }
  }
  return errors;
}

/** Whether any string in a parsed JSON value could hold a forbidden character (no pointers; fast). */
function containsSuspectText(value: unknown): boolean {
  if (typeof value === "string") return SUSPECT.test(value);
  const stack: unknown[] = [value];
  while (stack.length) {
    const v = stack.pop();
    if (Array.isArray(v)) {
      for (let i = 0; i < v.length; i++) {
        const item = v[i];
        if (typeof item === "string") {
          if (SUSPECT.test(item)) return true;
        } else if (item !== null && typeof item === "object") stack.push(item);
      }
    } else if (v !== null && typeof v === "object") {
      for (const key in v) {
        const child = (v as Record<string, unknown>)[key];
        if (typeof child === "string") {
          if (SUSPECT.test(child)) return true;
        } else if (child !== null && typeof child === "object") stack.push(child);
      }
    }
  }
  return false;
}
