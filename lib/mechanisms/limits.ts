/**
 * What a mechanism file may be, and the one-pass check that refuses the rest before any parser
 * sees it: a parser given a 2 MB run of nested brackets runs a process out of memory, and one given
 * a file of a single 20 MB line spends seconds on it. The check allocates nothing per character.
 */
import type { TextPlace } from "./types";

/** Largest mechanism file (UTF-8 bytes). */
export const MAX_MECHANISM_BYTES = 20 * 1024 * 1024;
/** Most reactions one check reads. */
export const MAX_MECHANISM_REACTIONS = 50_000;
/** Longest line (characters). */
export const MAX_MECHANISM_LINE = 100_000;
/** Deepest nesting of YAML blocks and brackets; a mechanism needs about 6. */
export const MAX_MECHANISM_DEPTH = 64;

export type PrecheckCode = "too_large" | "not_text" | "line_too_long" | "too_deep";

export interface PrecheckFailure extends TextPlace {
  code: PrecheckCode;
  message: string;
}

const megabytes = (bytes: number) => `${Math.round(bytes / (1024 * 1024))} MB`;

/** A byte count over the limit, in words; null when it fits. */
export function checkMechanismSize(bytes: number): PrecheckFailure | null {
  if (bytes <= MAX_MECHANISM_BYTES) return null;
  return {
    code: "too_large",
    line: 1,
    column: 1,
    message: `The mechanism file is ${megabytes(bytes)}; at most ${megabytes(MAX_MECHANISM_BYTES)} can be checked.`,
  };
}

/**
 * One pass over the text: NUL or other binary control characters (not text), a line longer than
 * MAX_MECHANISM_LINE, YAML block or bracket nesting deeper than MAX_MECHANISM_DEPTH. Quoted text and
 * `#` / `!` comments are skipped for brackets. Returns the first failure with its line and column.
 */
export function precheckMechanismText(text: string): PrecheckFailure | null {
  const size = checkMechanismSize(text.length); // characters ≤ bytes: the exact byte count is checked where bytes exist
  if (size) return size;
  let line = 1;
  let lineStart = 0;
  let flowDepth = 0;
  // Indentation stack of YAML blocks: the deepest level open at each indentation.
  const blockIndents: number[] = [];
  let atLineStart = true;
  let indent = 0;
  let quote = 0; // the open quote's character code, 0 when none
  let inComment = false;
  for (let i = 0; i <= text.length; i++) {
    const c = i < text.length ? text.charCodeAt(i) : 10;
    if (c === 10) {
      if (i - lineStart > MAX_MECHANISM_LINE) {
        return {
          code: "line_too_long",
          line,
          column: MAX_MECHANISM_LINE + 1,
          message: `Line ${line} is ${i - lineStart} characters long; lines of a mechanism may have at most ${MAX_MECHANISM_LINE}.`,
        };
      }
      line++;
      lineStart = i + 1;
      atLineStart = true;
      indent = 0;
      inComment = false;
      // A quoted YAML scalar may span lines; a single quote in plain text (a comment's apostrophe) may not.
      if (quote === 39) quote = 0;
      continue;
    }
    if (c === 0 || (c < 32 && c !== 9 && c !== 13 && c !== 12) || c === 0xfffe || c === 0xffff) {
      return {
        code: "not_text",
        line,
        column: i - lineStart + 1,
        message: `This is not a text file: line ${line}, column ${i - lineStart + 1} holds the control character U+${c.toString(16).toUpperCase().padStart(4, "0")}.`,
      };
    }
    if (i - lineStart > MAX_MECHANISM_LINE) continue; // reported at the line's end
    if (inComment) continue;
    if (atLineStart) {
      if (c === 32) {
        indent++;
        continue;
      }
      // "- " opens one more block level at the next column.
      if (c === 45 && (text.charCodeAt(i + 1) === 32 || text.charCodeAt(i + 1) === 10)) {
        if (quote === 0 && flowDepth === 0) {
          while (blockIndents.length && blockIndents[blockIndents.length - 1] >= indent) blockIndents.pop();
          blockIndents.push(indent);
          if (blockIndents.length > MAX_MECHANISM_DEPTH) return tooDeep(line, i - lineStart + 1);
        }
        indent++;
        continue;
      }
      atLineStart = false;
      if (c === 35 || c === 33 || c === 13) {
        inComment = true; // a comment line or a blank one does not open a block
        continue;
      }
      if (quote === 0 && flowDepth === 0) {
        while (blockIndents.length && blockIndents[blockIndents.length - 1] >= indent) blockIndents.pop();
        blockIndents.push(indent);
        if (blockIndents.length > MAX_MECHANISM_DEPTH) return tooDeep(line, i - lineStart + 1);
      }
    }
    if (quote !== 0) {
      if (c === quote) quote = 0;
      continue;
    }
    // A quote opens a quoted scalar only where a scalar starts; inside a plain scalar (5" or it's) it is text.
    if ((c === 34 || c === 39) && startsScalar(text, i, lineStart)) quote = c;
    else if ((c === 35 || c === 33) && (i === lineStart || text.charCodeAt(i - 1) === 32 || text.charCodeAt(i - 1) === 9)) inComment = true;
    else if (c === 91 || c === 123) {
      flowDepth++;
      if (flowDepth + blockIndents.length > MAX_MECHANISM_DEPTH) return tooDeep(line, i - lineStart + 1);
    } else if ((c === 93 || c === 125) && flowDepth > 0) flowDepth--;
  }
  return null;
}

function tooDeep(line: number, column: number): PrecheckFailure {
  return {
    code: "too_deep",
    line,
    column,
    message: `Line ${line}, column ${column}: the mechanism nests more than ${MAX_MECHANISM_DEPTH} levels deep (lists or blocks inside each other); a mechanism needs far fewer.`,
  };
}

/** Whether position i begins a YAML scalar: first on its line, or after a space following ":", "-", "?", ",", "[" or "{", or right after a bracket or comma. */
function startsScalar(text: string, i: number, lineStart: number): boolean {
  let j = i - 1;
  while (j >= lineStart && (text.charCodeAt(j) === 32 || text.charCodeAt(j) === 9)) j--;
  if (j < lineStart) return true;
  const p = text.charCodeAt(j);
  if (p === 91 || p === 123 || p === 44) return true;
  return j < i - 1 && (p === 58 || p === 45 || p === 63);
}
