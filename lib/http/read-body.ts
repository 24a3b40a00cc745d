// Every request body is read through here: streamed, counted, and refused (413) the moment it
// crosses its route's limit, so a chunked upload without Content-Length cannot fill memory.
import { AppError } from "@/lib/errors";
import { assertNotTooDeep } from "@/lib/json-depth";

/** Body limits per kind of request, bytes. */
export const BODY_LIMITS = {
  /** Small JSON commands (transitions, role changes). */
  json: 1024 * 1024,
  /** Sign-in and other small form posts. */
  form: 64 * 1024,
  /** Room for multipart boundaries and part headers around a file. */
  multipartOverhead: 64 * 1024,
} as const;

export interface ReadBodyOptions {
  /** Largest accepted body, bytes. */
  limit: number;
  /** What the body is, for the message: "deposit document", "analysis request"… */
  what?: string;
  /** The limit as people know it, when `limit` adds framing (a 25 MB file in a multipart body). */
  shownLimit?: number;
}

/**
 * The client closed its connection before its request body had arrived: nothing is wrong on our
 * side (no outage, no 5xx to count), and nobody is left to answer.
 */
export class ClientAbortError extends Error {
  readonly code = "CLIENT_ABORTED";
  constructor(
    readonly bytesReceived: number,
    cause?: unknown,
  ) {
    super(`The client closed the request after ${bytesReceived} bytes of its body`, { cause });
    this.name = "ClientAbortError";
  }
}

/** True when the request failed because its client went away (its body stream broke, or Next aborted its signal). */
export function isClientAbort(err: unknown, req: Request): boolean {
  return err instanceof ClientAbortError || req.signal?.aborted === true;
}

function formatLimit(bytes: number): string {
  if (bytes >= 1024 * 1024) return `${+(bytes / 1024 / 1024).toFixed(1)} MB`;
  if (bytes >= 1024) return `${+(bytes / 1024).toFixed(1)} KB`;
  return `${bytes} bytes`;
}

function tooLarge({ limit, what = "request body", shownLimit = limit }: ReadBodyOptions): AppError {
  return new AppError("payload_too_large", `The ${what} is larger than ${formatLimit(shownLimit)}, the limit`, [
    { pointer: "", message: `more than ${limit} bytes` },
  ]);
}

/**
 * The body's bytes, at most `limit` of them. A declared Content-Length above the limit is refused
 * before reading anything; otherwise the stream is counted chunk by chunk and cancelled as soon as
 * it crosses the limit, so at most `limit` plus one chunk is ever held.
 *
 * @throws AppError `payload_too_large` (413) saying the limit.
 */
export async function readBodyOrThrow(req: Request, options: ReadBodyOptions): Promise<Uint8Array> {
  const declared = req.headers.get("content-length");
  if (declared !== null && Number(declared) > options.limit) {
    await req.body?.cancel().catch(() => {});
    throw tooLarge(options);
  }
  if (!req.body) return new Uint8Array(0);
  const reader = req.body.getReader();
  const chunks: Uint8Array[] = [];
  let total = 0;
  for (;;) {
    let next: ReadableStreamReadResult<Uint8Array>;
    try {
      next = await reader.read();
    } catch (err) {
      // Only the client feeds this stream: a failure here is its connection closing, whatever
      // the code says (Node reports it as ECONNRESET "aborted", the code a database reset has too).
      throw new ClientAbortError(total, err);
    }
    const { done, value } = next;
    if (done) break;
    total += value.byteLength;
    if (total > options.limit) {
      await reader.cancel().catch(() => {});
      throw tooLarge(options);
    }
    chunks.push(value);
  }
  if (chunks.length === 1) return chunks[0];
  const body = new Uint8Array(total);
  let at = 0;
  for (const c of chunks) {
    body.set(c, at);
    at += c.byteLength;
  }
  return body;
}

/** The body as text (UTF-8; invalid sequences become U+FFFD, as `Request.text()` does). */
export async function readTextBodyOrThrow(req: Request, options: ReadBodyOptions): Promise<string> {
  return new TextDecoder().decode(await readBodyOrThrow(req, options));
}

/** Bytes already read, parsed as JSON; malformed JSON is a 422 naming the parser's complaint. */
export function parseJsonBytesOrThrow(bytes: Uint8Array): unknown {
  let value: unknown;
  try {
    value = JSON.parse(new TextDecoder().decode(bytes));
  } catch (err) {
    throw new AppError("validation_failed", "The request body is not valid JSON", [{ pointer: "", message: (err as Error).message }]);
  }
  // Validation (zod) recurses: a body nested thousands deep is refused before it.
  assertNotTooDeep(value);
  return value;
}

/** The body parsed as JSON, read with the cap. */
export async function readJsonBodyOrThrow(req: Request, options: ReadBodyOptions): Promise<unknown> {
  return parseJsonBytesOrThrow(await readBodyOrThrow(req, options));
}

/**
 * A multipart/form-data body read with the cap, then parsed. The bytes are counted before any
 * part is decoded, so an oversized upload is refused without buffering it.
 *
 * @throws AppError `validation_failed` (422) when the body is not multipart form data.
 */
export async function readFormDataOrThrow(req: Request, options: ReadBodyOptions): Promise<FormData> {
  const contentType = req.headers.get("content-type") ?? "";
  if (!/^multipart\/form-data\b/i.test(contentType)) {
    await req.body?.cancel().catch(() => {});
    throw new AppError("validation_failed", "Send the body as multipart/form-data", [
      { pointer: "", message: `content type “${contentType || "none"}”` },
    ]);
  }
  const bytes = await readBodyOrThrow(req, options);
  try {
    return await new Response(bytes as BodyInit, { headers: { "content-type": contentType } }).formData();
  } catch {
    throw new AppError("validation_failed", "The multipart body could not be read", [
      { pointer: "", message: "malformed multipart/form-data" },
    ]);
  }
}
