/**
 * Finds object keys written twice in a JSON text. JSON.parse keeps the last one silently, so a
 * document could show a reviewer one value and store another (RFC 8259 §4 leaves the meaning of
 * repeated names open). One linear pass over text that JSON.parse has already accepted, so only
 * structure is tracked: strings are skipped to their closing quote, a string followed by ":" is a
 * key. (jsonc-parser's visitor does the same but took five times as long as JSON.parse itself.)
 */
import { escapePointerSegment } from "./schema";

export interface DuplicateKey {
  /** JSON pointer of the repeated field. */
  pointer: string;
  /** 1-based line and column of its second occurrence. */
  line: number;
  column: number;
}

const QUOTE = 0x22,
  BACKSLASH = 0x5c,
  COLON = 0x3a,
  COMMA = 0x2c,
  OPEN_OBJECT = 0x7b,
  CLOSE_OBJECT = 0x7d,
  OPEN_ARRAY = 0x5b,
  CLOSE_ARRAY = 0x5d;
const isSpace = (c: number) => c === 0x20 || c === 0x0a || c === 0x0d || c === 0x09;

function position(text: string, offset: number): { line: number; column: number } {
  let line = 1;
  let lineStart = 0;
  for (let i = text.indexOf("\n"); i >= 0 && i < offset; i = text.indexOf("\n", i + 1)) {
    line++;
    lineStart = i + 1;
  }
  return { line, column: offset - lineStart + 1 };
}

/**
 * The first `limit` duplicated keys of `text` (which must be valid JSON), in document order.
 *
 * @example findDuplicateKeys('{"a": 1, "a": 2}') // [{ pointer: "/a", line: 1, column: 10 }]
 */
export function findDuplicateKeys(text: string, limit = 20): DuplicateKey[] {
  const found: DuplicateKey[] = [];
  // Per open container: the keys seen (objects) or null (arrays), and the path segment now open in it.
  const keys: (Set<string> | null)[] = [];
  const segments: (string | number)[] = [];
  const n = text.length;
  for (let i = 0; i < n; i++) {
    const c = text.charCodeAt(i);
    if (c === QUOTE) {
      const start = i;
      let escaped = false;
      for (i++; i < n; i++) {
        const d = text.charCodeAt(i);
        if (d === BACKSLASH) {
          escaped = true;
          i++;
        } else if (d === QUOTE) break;
      }
      const top = keys[keys.length - 1];
      if (!top) continue;
      let j = i + 1;
      while (j < n && isSpace(text.charCodeAt(j))) j++;
      if (text.charCodeAt(j) !== COLON) continue;
      const raw = text.slice(start + 1, i);
      const key = escaped ? (JSON.parse(`"${raw}"`) as string) : raw;
      segments[segments.length - 1] = key;
      if (!top.has(key)) top.add(key);
      else if (found.length < limit) {
        found.push({ pointer: segments.map((s) => "/" + escapePointerSegment(String(s))).join(""), ...position(text, start) });
      }
    } else if (c === OPEN_OBJECT) {
      keys.push(new Set());
      segments.push("");
    } else if (c === OPEN_ARRAY) {
      keys.push(null);
      segments.push(0);
    } else if (c === CLOSE_OBJECT || c === CLOSE_ARRAY) {
      keys.pop();
      segments.pop();
    } else if (c === COMMA && keys[keys.length - 1] === null) {
      (segments[segments.length - 1] as number)++;
    }
  }
  return found;
}
