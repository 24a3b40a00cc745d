// Next decodes a server action's arguments (React's reply format: JSON, or multipart form data
// whose text fields are JSON) recursively, before any code of ours runs: a body of 100 000 nested
// `[` overflows the stack there and answers 500. The front server therefore scans each action
// body as it streams through, in constant memory and one pass, and refuses it as soon as brackets
// nest deeper than any form of the app ever sends. File parts of a multipart body are skipped:
// which parts are files is decided by the very multipart parser Next uses (its bundled busboy), so
// a part that merely mentions "filename" somewhere in its headers is still scanned.
import { createRequire } from "node:module";

/** Deepest nesting of `[` / `{` (outside JSON strings) an action body may carry. */
export const MAX_ACTION_NESTING = 128;

const QUOTE = 0x22;
const BACKSLASH = 0x5c;
const OPEN_SQUARE = 0x5b;
const CLOSE_SQUARE = 0x5d;
const OPEN_CURLY = 0x7b;
const CLOSE_CURLY = 0x7d;
const CR = 0x0d;
const LF = 0x0a;

/** The part headers of a multipart body are read up to this size; longer ones are not inspected. */
const MAX_PART_HEADERS = 16 * 1024;

type Mode = "json" | "headers" | "file";

type Busboy = NodeJS.WritableStream & {
  on(event: "file", listener: (name: string, stream: NodeJS.ReadableStream) => void): Busboy;
  on(event: "error", listener: (err: unknown) => void): Busboy;
};
const busboy = createRequire(import.meta.url)("next/dist/compiled/busboy") as (options: object) => Busboy;

/**
 * Whether Next's multipart parser treats a part with these header bytes (everything after its
 * delimiter, up to and including the blank line) as a file, which is never decoded as JSON. The
 * part is replayed, empty, through the same parser with the same options as Next's action handler;
 * anything else (a field, a part it ignores, headers it rejects) counts as not a file.
 */
export function isFilePart(headers: Buffer): boolean {
  const boundary = "arrhenia-part-probe";
  let file = false;
  try {
    const parser = busboy({ defParamCharset: "utf8", headers: { "content-type": `multipart/form-data; boundary=${boundary}` } });
    parser.on("file", (_name, stream) => {
      file = true;
      stream.resume();
    });
    parser.on("error", () => {});
    // Writable.write runs the parser synchronously while nothing is queued: the verdict is known on return.
    parser.write(Buffer.concat([Buffer.from(`--${boundary}`, "latin1"), headers, Buffer.from(`\r\n--${boundary}--\r\n`, "latin1")]));
    parser.end();
  } catch {
    return false;
  }
  return file;
}

/** KMP failure table of the multipart delimiter, for a streaming search. */
function failureTable(pattern: Buffer): Int32Array {
  const fail = new Int32Array(pattern.length);
  for (let i = 1, k = 0; i < pattern.length; i++) {
    while (k > 0 && pattern[i] !== pattern[k]) k = fail[k - 1];
    if (pattern[i] === pattern[k]) k++;
    fail[i] = k;
  }
  return fail;
}

/** The boundary parameter of a multipart/form-data content type, or null. */
function boundaryOf(contentType: string | undefined): string | null {
  if (!contentType || !/^multipart\/form-data/i.test(contentType)) return null;
  const m = /;\s*boundary=(?:"([^"]{1,70})"|([^\s;]{1,70}))/i.exec(contentType);
  return m ? (m[1] ?? m[2]) : null;
}

export class ActionBodyGuard {
  private depth = 0;
  private inString = false;
  private escaped = false;
  private mode: Mode = "json";
  // Multipart only: the delimiter ("\r\n--boundary"), its KMP table and the match so far.
  private readonly delimiter: Buffer | null;
  private readonly fail: Int32Array | null;
  private matched = 0;
  private headers: number[] = [];
  private headerEnd = 0;

  constructor(contentType: string | undefined) {
    const boundary = boundaryOf(contentType);
    this.delimiter = boundary ? Buffer.from(`\r\n--${boundary}`, "latin1") : null;
    this.fail = this.delimiter ? failureTable(this.delimiter) : null;
    // The first delimiter has no CRLF before it: count it as already seen.
    if (this.delimiter) {
      this.matched = 2;
      this.mode = "file"; // a preamble is not decoded
    }
  }

  /** Scans the next chunk; returns a message when the body must be refused, else null. */
  write(chunk: Uint8Array): string | null {
    const { delimiter, fail } = this;
    for (let i = 0; i < chunk.length; i++) {
      const b = chunk[i];
      if (delimiter && fail) {
        while (this.matched > 0 && b !== delimiter[this.matched]) this.matched = fail[this.matched - 1];
        if (b === delimiter[this.matched]) this.matched++;
        if (this.matched === delimiter.length) {
          this.matched = fail[this.matched - 1];
          this.startPart();
          continue;
        }
      }
      if (this.mode === "file") continue;
      if (this.mode === "headers") {
        this.readHeaderByte(b);
        continue;
      }
      if (this.inString) {
        if (this.escaped) this.escaped = false;
        else if (b === BACKSLASH) this.escaped = true;
        else if (b === QUOTE) this.inString = false;
      } else if (b === QUOTE) {
        this.inString = true;
      } else if (b === OPEN_SQUARE || b === OPEN_CURLY) {
        if (++this.depth > MAX_ACTION_NESTING) {
          return `The form's data is nested more than ${MAX_ACTION_NESTING} levels deep; no form of this site sends that.`;
        }
      } else if ((b === CLOSE_SQUARE || b === CLOSE_CURLY) && this.depth > 0) {
        this.depth--;
      }
    }
    return null;
  }

  private startPart() {
    this.mode = "headers";
    this.headers = [];
    this.headerEnd = 0;
    this.depth = 0;
    this.inString = false;
    this.escaped = false;
  }

  /** Collects a part's headers up to the blank line; a part with a file name is not scanned. */
  private readHeaderByte(b: number) {
    if (this.headers.length < MAX_PART_HEADERS) this.headers.push(b);
    // "\r\n\r\n" ends the headers (the delimiter line's own CRLF counts as the first pair's start).
    this.headerEnd = b === (this.headerEnd % 2 === 0 ? CR : LF) ? this.headerEnd + 1 : b === CR ? 1 : 0;
    if (this.headerEnd < 4) return;
    // Headers cut at MAX_PART_HEADERS end without their blank line: never a file, so scanned.
    this.mode = this.headers.length < MAX_PART_HEADERS && isFilePart(Buffer.from(this.headers)) ? "file" : "json";
  }
}

/**
 * Whether a request goes to a route handler that takes posts from anywhere and authenticates on its
 * own: the REST API and next-auth (under /api/), and the OAI-PMH repository (/oai: public,
 * read-only, no cookie used; harvesters may POST its arguments, §3.1.1.2). Next resolves dot segments
 * ("%2e" and "\\" included) and repeated slashes before routing, so "/api/%2e%2e/admin" is the
 * page /admin: a path with a dot segment, an encoded dot, slash or backslash, a backslash or "//"
 * is never counted as the API, whatever it starts with; it gets every check a page gets.
 */
export function isApiPath(url: string | undefined): boolean {
  const raw = (url ?? "/").split("?")[0];
  if (/%2e|%2f|%5c|\\|\/\//i.test(raw) || /(^|\/)\.\.?(\/|$)/.test(raw)) return false;
  return raw.startsWith("/api/") || raw === "/oai";
}

/** The path of a request as Next routes it (dot segments resolved, backslashes read as slashes). */
export function pagePath(url: string | undefined): string {
  const raw = url ?? "/";
  if (!raw.startsWith("/")) return raw;
  try {
    return new URL(`http://front.invalid${raw}`).pathname;
  } catch {
    return raw;
  }
}

/**
 * Whether a request is a server action (or may be one) that Next will decode: a POST with the
 * Next-Action header, or a multipart form posted to a page (a form that works without script).
 */
export function isActionRequest(method: string | undefined, url: string | undefined, headers: Record<string, unknown>): boolean {
  if (method !== "POST") return false;
  if (headers["next-action"] !== undefined) return true;
  const type = headers["content-type"];
  return typeof type === "string" && /^multipart\/form-data/i.test(type) && !isApiPath(url);
}
