/**
 * Finds where and why a text is not valid JSON (RFC 8259), for messages people can act on.
 * JSON.parse's own messages differ between engines and often omit the position, so when it fails
 * this scanner walks the text once, iteratively (deep nesting cannot overflow the stack).
 */

export interface JsonSyntaxProblem {
  /** Zero-based character offset of the problem. */
  offset: number;
  /** Line and column, counted from 1. */
  line: number;
  column: number;
  /** What is wrong, in words, e.g. `unexpected "}"; a trailing comma is not allowed`. */
  problem: string;
}

const NUMBER = /-?(?:0|[1-9]\d*)(?:\.\d+)?(?:[eE][+-]?\d+)?/y;
const WHITESPACE = new Set([" ", "\t", "\n", "\r"]);

function describeChar(c: string): string {
  if (c === "\n") return "a line break";
  if (c === "'") return `"'" (strings need double quotes)`;
  return JSON.stringify(c);
}

function position(text: string, offset: number): { line: number; column: number } {
  let line = 1;
  let lineStart = 0;
  for (let i = 0; i < offset && i < text.length; i++) {
    if (text[i] === "\n") {
      line++;
      lineStart = i + 1;
    }
  }
  return { line, column: offset - lineStart + 1 };
}

/** Returns the end offset of the string starting at `start` (a `"`), or a problem. */
function scanString(text: string, start: number): number | { offset: number; problem: string } {
  let i = start + 1;
  while (i < text.length) {
    const c = text[i];
    if (c === '"') return i + 1;
    if (c === "\\") {
      const e = text[i + 1];
      if (e === "u") {
        if (!/^[0-9a-fA-F]{4}$/.test(text.slice(i + 2, i + 6))) return { offset: i, problem: "a \\u escape needs four hexadecimal digits" };
        i += 6;
        continue;
      }
      if (e === undefined || !'"\\/bfnrt'.includes(e)) return { offset: i, problem: `"\\${e ?? ""}" is not a valid escape in a string` };
      i += 2;
      continue;
    }
    if (c.charCodeAt(0) < 0x20) return { offset: i, problem: "a line break or control character inside a string (write it as \\n)" };
    i++;
  }
  return { offset: start, problem: "a string is never closed (missing closing quote)" };
}

/**
 * The first syntax problem of `text`, or null when it is valid JSON.
 *
 * @example findJsonSyntaxProblem('{"a": 1,}')?.problem // 'unexpected "}"; a trailing comma is not allowed'
 */
export function findJsonSyntaxProblem(text: string): JsonSyntaxProblem | null {
  type State = "value" | "valueOrClose" | "key" | "keyOrClose" | "colon" | "after";
  const stack: string[] = [];
  let state: State = "value";
  let afterComma = false;
  let i = 0;
  const fail = (offset: number, problem: string): JsonSyntaxProblem => ({ offset, ...position(text, offset), problem });

  for (;;) {
    while (i < text.length && WHITESPACE.has(text[i])) i++;
    if (i >= text.length) {
      if (state === "after" && stack.length === 0) return null;
      if (stack.length === 0 && state === "value") return fail(i, "the text is empty");
      return fail(
        i,
        `the text ends early (${stack.length ? `missing "${stack[stack.length - 1] === "{" ? "}" : "]"}"` : "a value is missing"})`,
      );
    }
    const c = text[i];
    switch (state) {
      case "value":
      case "valueOrClose": {
        if (c === "]" && (state === "valueOrClose" || afterComma)) {
          if (afterComma) return fail(i, `unexpected "]"; a trailing comma is not allowed`);
          stack.pop();
          i++;
          state = "after";
          break;
        }
        if (c === "}" && afterComma) return fail(i, `unexpected "}"; a trailing comma is not allowed`);
        afterComma = false;
        if (c === "{") {
          stack.push("{");
          i++;
          state = "keyOrClose";
        } else if (c === "[") {
          stack.push("[");
          i++;
          state = "valueOrClose";
        } else if (c === '"') {
          const end = scanString(text, i);
          if (typeof end !== "number") return fail(end.offset, end.problem);
          i = end;
          state = "after";
        } else if (c === "-" || (c >= "0" && c <= "9")) {
          NUMBER.lastIndex = i;
          const m = NUMBER.exec(text);
          if (!m) return fail(i, `"${text.slice(i, i + 12)}" is not a number`);
          i += m[0].length;
          state = "after";
        } else if (text.startsWith("true", i) || text.startsWith("null", i)) {
          i += 4;
          state = "after";
        } else if (text.startsWith("false", i)) {
          i += 5;
          state = "after";
        } else if (/^(NaN|Infinity|undefined)/.test(text.slice(i, i + 9))) {
          return fail(i, `${/^(NaN|Infinity|undefined)/.exec(text.slice(i, i + 9))![1]} is not allowed in JSON`);
        } else {
          return fail(i, `unexpected ${describeChar(c)} where a value was expected`);
        }
        break;
      }
      case "key":
      case "keyOrClose":
        if (c === "}" && state === "keyOrClose" && !afterComma) {
          stack.pop();
          i++;
          state = "after";
        } else if (c === "}" && afterComma) {
          return fail(i, `unexpected "}"; a trailing comma is not allowed`);
        } else if (c === '"') {
          afterComma = false;
          const end = scanString(text, i);
          if (typeof end !== "number") return fail(end.offset, end.problem);
          i = end;
          state = "colon";
        } else {
          return fail(i, `unexpected ${describeChar(c)}; a field name in double quotes was expected`);
        }
        break;
      case "colon":
        if (c !== ":") return fail(i, `unexpected ${describeChar(c)}; ":" was expected after the field name`);
        i++;
        state = "value";
        break;
      case "after": {
        const top = stack[stack.length - 1];
        if (top === undefined) return fail(i, `unexpected ${describeChar(c)} after the end of the document`);
        const close = top === "{" ? "}" : "]";
        if (c === ",") {
          i++;
          afterComma = true;
          state = top === "{" ? "key" : "value";
        } else if (c === close) {
          stack.pop();
          i++;
        } else {
          return fail(i, `unexpected ${describeChar(c)}; "," or "${close}" was expected`);
        }
        break;
      }
    }
  }
}
