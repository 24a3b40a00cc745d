// One error type for the whole app; its code maps to an HTTP status and an RFC 9457 problem.

export type ErrorCode =
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
