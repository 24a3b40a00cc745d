// One error type for the whole app; its code maps to an HTTP status and an RFC 9457 problem.

export type ErrorCode =
  | "bad_request"
  | "unauthenticated"
  | "forbidden"
  | "not_found"
  | "conflict"
  | "validation_failed"
  | "rate_limited"
  | "payload_too_large"
  | "unavailable"
  | "internal";

const statusByCode: Record<ErrorCode, number> = {
  bad_request: 400,
  unauthenticated: 401,
  forbidden: 403,
  not_found: 404,
  conflict: 409,
  validation_failed: 422,
  rate_limited: 429,
  payload_too_large: 413,
  unavailable: 503,
  internal: 500,
};

export interface FieldError {
  /** JSON pointer to the offending value, e.g. `/points/3/T`. */
  pointer: string;
  /** The query parameter at fault, when the error is about one. */
  parameter?: string;
  message: string;
  value?: unknown;
}

export class AppError extends Error {
  readonly status: number;
  constructor(
    readonly code: ErrorCode,
    message: string,
    readonly errors: FieldError[] = [],
    readonly retryAfterSeconds?: number,
  ) {
    super(message);
    this.name = "AppError";
    this.status = statusByCode[code];
  }
}

export function problemJson(error: AppError, instance?: string) {
  return {
    type: `https://arrhenia.invalid/problems/${error.code.replace(/_/g, "-")}`,
    title: error.message,
    status: error.status,
    code: error.code,
    ...(instance ? { instance } : {}),
    ...(error.errors.length ? { errors: error.errors } : {}),
  };
}

// SQLSTATEs by which PostgreSQL refuses a value itself (not the query): NUL or invalid bytes in
// text (22021), a character jsonb cannot hold (22P05), a number outside its column (22003), and
// malformed JSON such as a lone surrogate escape (22P02 on jsonb).
const REFUSED_VALUE_STATES = new Set(["22021", "22P05", "22003"]);

/**
 * The last line behind input validation: a value PostgreSQL refused becomes a 422 (the
 * transaction has rolled back, so nothing was stored) instead of a 500. Null for any other error.
 */
export function storageRefusal(err: unknown): AppError | null {
  for (let e: unknown = err, depth = 0; e && typeof e === "object" && depth < 4; e = (e as { cause?: unknown }).cause, depth++) {
    const { code, message } = e as { code?: unknown; message?: unknown };
    if (typeof code !== "string") continue;
    if (REFUSED_VALUE_STATES.has(code) || (code === "22P02" && typeof message === "string" && /json|unicode/i.test(message))) {
      return new AppError(
        "validation_failed",
        "A value in the request cannot be stored (text with U+0000 or a lone surrogate, or a number out of range); nothing was stored",
        [
          {
            pointer: "",
            message:
              "A value cannot be stored: remove U+0000 and lone surrogates from text, and keep numbers within their documented ranges.",
          },
        ],
      );
    }
  }
  return null;
}

// Connection failures of the database (a restart, a full pool that cannot connect): the request
// may be retried in a moment, so they answer 503 with Retry-After rather than 500.
const UNAVAILABLE_CODES = new Set([
  "ECONNREFUSED",
  "ECONNRESET",
  "EPIPE",
  "CONNECTION_CLOSED",
  "CONNECTION_ENDED",
  "CONNECTION_DESTROYED",
  "CONNECT_TIMEOUT",
  "57P01", // admin_shutdown
  "57P02", // crash_shutdown
  "57P03", // cannot_connect_now (starting up)
  "08000",
  "08001",
  "08003",
  "08006",
]);

/** The 503 for an error that means the database is briefly out of reach, or null. */
export function databaseUnavailable(err: unknown): AppError | null {
  for (let e: unknown = err, depth = 0; e && typeof e === "object" && depth < 4; e = (e as { cause?: unknown }).cause, depth++) {
    const { code } = e as { code?: unknown };
    if (typeof code === "string" && UNAVAILABLE_CODES.has(code)) {
      return new AppError("unavailable", "The database is out of reach for a moment; try again in a few seconds", [], 5);
    }
  }
  return null;
}
