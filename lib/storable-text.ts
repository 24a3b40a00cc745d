/**
 * Text PostgreSQL cannot store. `text` and `jsonb` refuse U+0000 (NUL), and a lone UTF-16
 * surrogate is either refused (jsonb) or silently turned into U+FFFD (text). The rule for every
 * entry point: refuse the input and say where, never strip or replace it silently.
 */
import type { FieldError } from "@/lib/errors";

// A NUL, a high surrogate not followed by a low one, or a low surrogate not preceded by a high one.
const UNSTORABLE = /\u0000|[\ud800-\udbff](?![\udc00-\udfff])|(?<![\ud800-\udbff])[\udc00-\udfff]/;

const hex = (c: string) => c.charCodeAt(0).toString(16).toUpperCase().padStart(4, "0");

/**
 * Why this string cannot be stored, or null when it can.
 *
 * @example describeUnstorableText("a\u0000b") // "contains U+0000 (NUL) at character 2, …"
 */
export function describeUnstorableText(text: string): string | null {
  const m = UNSTORABLE.exec(text);
  if (!m) return null;
  const what = m[0] === "\u0000" ? "U+0000 (NUL)" : `a lone surrogate U+${hex(m[0])} (half of a character, not valid Unicode)`;
  return `contains ${what} at character ${m.index + 1}, which cannot be stored; remove it`;
}

export function isStorableText(text: string): boolean {
  return !UNSTORABLE.test(text);
}

const escapePointer = (key: string) => key.replace(/~/g, "~0").replace(/\//g, "~1");

/**
 * Every string (and property name) in a parsed JSON value that cannot be stored, each with its
 * JSON pointer, at most `limit` of them. Iterative, so a deeply nested document cannot overflow
 * the stack.
 *
 * @example findUnstorableText({ title: "a\u0000" })[0].pointer // "/title"
 */
export function findUnstorableText(value: unknown, limit = 200, base = ""): FieldError[] {
  // The common case (nothing to report) takes one allocation-free pass; pointers are built only when needed.
  if (!containsUnstorableText(value)) return [];
  const errors: FieldError[] = [];
  const stack: [unknown, string][] = [[value, base]];
  while (stack.length && errors.length < limit) {
    const [v, pointer] = stack.pop()!;
    if (typeof v === "string") {
      const why = describeUnstorableText(v);
      if (why) errors.push({ pointer, message: `This text ${why}.`, value: v });
    } else if (Array.isArray(v)) {
      for (let i = v.length - 1; i >= 0; i--) stack.push([v[i], `${pointer}/${i}`]);
    } else if (v !== null && typeof v === "object") {
      const entries = Object.entries(v);
      for (let i = entries.length - 1; i >= 0; i--) {
        const [key, child] = entries[i];
        const at = `${pointer}/${escapePointer(key)}`;
        const why = describeUnstorableText(key);
        if (why && errors.length < limit) errors.push({ pointer: at, message: `This property name ${why}.` });
        else stack.push([child, at]);
      }
    }
  }
  return errors;
}

// A cheap character-class test first; the look-around pattern only for strings with a surrogate or NUL.
const NUL_OR_SURROGATE = /[\u0000\ud800-\udfff]/;
const isBadString = (s: string) => NUL_OR_SURROGATE.test(s) && UNSTORABLE.test(s);

/** Whether any string or property name in a parsed JSON value cannot be stored (no pointers; fast). */
export function containsUnstorableText(value: unknown): boolean {
  const stack: unknown[] = [value];
  while (stack.length) {
    const v = stack.pop();
    if (typeof v === "string") {
      if (isBadString(v)) return true;
    } else if (Array.isArray(v)) {
      for (let i = 0; i < v.length; i++) {
        const item = v[i];
        if (typeof item === "string") {
          if (isBadString(item)) return true;
        } else if (item !== null && typeof item === "object") stack.push(item);
      }
    } else if (v !== null && typeof v === "object") {
      for (const key in v) {
        if (isBadString(key)) return true;
        const child = (v as Record<string, unknown>)[key];
        if (typeof child === "string") {
          if (isBadString(child)) return true;
        } else if (child !== null && typeof child === "object") stack.push(child);
      }
    }
  }
  return false;
}
