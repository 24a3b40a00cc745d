// How deeply a parsed JSON value nests, walked with an explicit stack: a document of thousands of
// nested arrays or objects would overflow the call stack of any recursive check (schema
// validation, the unstorable-text scan) and answer 500 instead of naming the place.
import { AppError, type FieldError } from "@/lib/errors";

/** Deepest nesting of arrays/objects a document may have; the deposit schema needs about 8. */
export const MAX_JSON_DEPTH = 64;

function escapePointerToken(key: string): string {
  return key.replace(/~/g, "~0").replace(/\//g, "~1");
}

/**
 * The JSON pointer of the first value (in document order) for which `test` holds, given the value
 * and its level (the top-level value is level 1); a value that passes is not descended into.
 */
function firstPointerWhere(value: unknown, test: (value: unknown, depth: number) => boolean): string | null {
  const stack: { value: unknown; pointer: string; depth: number }[] = [{ value, pointer: "", depth: 1 }];
  while (stack.length) {
    const item = stack.pop()!;
    if (test(item.value, item.depth)) return item.pointer;
    if (item.value === null || typeof item.value !== "object") continue;
    // Pushed in reverse so the first member is walked first (the pointer named is the first in document order).
    if (Array.isArray(item.value)) {
      for (let i = item.value.length - 1; i >= 0; i--)
        stack.push({ value: item.value[i], pointer: `${item.pointer}/${i}`, depth: item.depth + 1 });
    } else {
      const keys = Object.keys(item.value);
      for (let i = keys.length - 1; i >= 0; i--) {
        const key = keys[i];
        stack.push({
          value: (item.value as Record<string, unknown>)[key],
          pointer: `${item.pointer}/${escapePointerToken(key)}`,
          depth: item.depth + 1,
        });
      }
    }
  }
  return null;
}

/**
 * The JSON pointer of the first array or object nested deeper than `max` levels (the top-level
 * value is level 1), or null when the value stays within it.
 */
export function findTooDeep(value: unknown, max = MAX_JSON_DEPTH): string | null {
  return firstPointerWhere(value, (v, depth) => v !== null && typeof v === "object" && depth > max);
}

/**
 * The JSON pointer of the first number JSON.parse turned into ±Infinity (a literal such as 1e400,
 * beyond the largest double), or null. PostgreSQL's jsonb would store it as null.
 */
export function findNumberTooLarge(value: unknown): string | null {
  return firstPointerWhere(value, (v) => typeof v === "number" && !Number.isFinite(v));
}

/** The problem for a value nested too deeply, or null. */
export function tooDeepError(value: unknown, max = MAX_JSON_DEPTH): FieldError | null {
  const pointer = findTooDeep(value, max);
  if (pointer === null) return null;
  return {
    pointer,
    message: `The document nests lists or objects more than ${max} levels deep here (at ${pointer}); a deposit needs far fewer.`,
  };
}

/** Throws a 422 naming the first place nested deeper than `max`. */
export function assertNotTooDeep(value: unknown, max = MAX_JSON_DEPTH): void {
  const problem = tooDeepError(value, max);
  if (problem) throw new AppError("validation_failed", problem.message, [problem]);
}
