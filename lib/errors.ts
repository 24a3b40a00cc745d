// One error type for the whole app; its code maps to an HTTP status and an RFC 9457 problem.

/**
 * Every problem type the API answers with (RFC 9457 §3.1.1 `type`): code → HTTP status, a short
 * title and when it happens. /docs/api lists this table; the type URIs never change meaning.
 */
export const PROBLEM_TYPES = {
  bad_request: { status: 400, title: "Bad request", when: "A query parameter or header is malformed (each one named)." },
  unauthenticated: {
    status: 401,
    title: "Not signed in",
    when: "The endpoint needs a token or session; or the token sent is unknown or revoked.",
  },
  forbidden: { status: 403, title: "Forbidden", when: "The token lacks the endpoint's scope, or the person's role may not do this." },
  not_found: {
    status: 404,
    title: "Not found",
    when: "No such record, or one you may not see (another person's draft is not found, never forbidden).",
  },
  conflict: {
    status: 409,
    title: "Conflict",
    when: "The record is in a state that does not allow the change (e.g. a submitted version is no longer editable).",
  },
  precondition_failed: {
    status: 412,
    title: "Precondition failed",
    when: "If-Match names a lock version that is no longer current: someone saved the draft since; fetch it again.",
  },
  payload_too_large: { status: 413, title: "Payload too large", when: "The body is larger than the endpoint accepts." },
  validation_failed: {
    status: 422,
    title: "Validation failed",
    when: "The body or a parameter is invalid; `errors` lists every problem with its JSON pointer.",
  },
  precondition_required: {
    status: 428,
    title: "Precondition required",
    when: "A draft is replaced only with If-Match carrying the lock version you edited.",
  },
  rate_limited: { status: 429, title: "Too many requests", when: "The client's budget is spent; wait the seconds Retry-After gives." },
  internal: { status: 500, title: "Internal error", when: "Something failed on our side; it has been logged." },
  unavailable: { status: 503, title: "Unavailable", when: "The database is out of reach for a moment; retry after Retry-After." },
} as const satisfies Record<string, { status: number; title: string; when: string }>;

export type ErrorCode = keyof typeof PROBLEM_TYPES;

/** The stable `type` URI of a problem code. */
export const problemTypeUri = (code: ErrorCode) => `https://arrhenia.invalid/problems/${code.replace(/_/g, "-")}`;

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
    this.status = PROBLEM_TYPES[code].status;
  }
}

export function problemJson(error: AppError, instance?: string) {
  return {
    type: problemTypeUri(error.code),
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
    const { code, message } = e as { code?: unknown; message?: unknown };
    // node-postgres's pool (the rate limits' store) gives up waiting for a connection with no code, only these words.
    const poolTimedOut = typeof message === "string" && message === "timeout exceeded when trying to connect";
    if ((typeof code === "string" && UNAVAILABLE_CODES.has(code)) || poolTimedOut) {
      return new AppError("unavailable", "The database is out of reach for a moment; try again in a few seconds", [], 5);
    }
  }
  return null;
}
