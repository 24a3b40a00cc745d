import { z } from "zod";
import { AppError } from "@/lib/errors";

/** Largest id a PostgreSQL `integer` column holds (2³¹−1). */
export const MAX_ID = 2_147_483_647;

/**
 * The one id parser for paths, forms and action arguments: a decimal integer 1 … 2³¹−1 written
 * without sign, exponent, fraction or leading zeros (a number of that range is accepted too).
 * Anything else is null, so callers answer 404 rather than letting the database fail.
 */
export function parseIdOrNull(raw: unknown): number | null {
  if (typeof raw === "number") return Number.isInteger(raw) && raw >= 1 && raw <= MAX_ID ? raw : null;
  if (typeof raw !== "string" || !/^[1-9]\d{0,9}$/.test(raw)) return null;
  const id = Number(raw);
  return id <= MAX_ID ? id : null;
}

/** `parseIdOrNull`, throwing a 404 that names what was looked for ("No such dataset version"). */
export function parseIdOrThrow(raw: unknown, what: string): number {
  const id = parseIdOrNull(raw);
  if (id === null) throw new AppError("not_found", `No such ${what}`);
  return id;
}

/**
 * The same rule as a zod schema, for forms (strings) and action arguments (numbers). Its issue
 * carries `params.notFound`, so action wrappers answer "No such …" (404) rather than a form error.
 */
export function idFor(what: string) {
  return z.unknown().transform((raw, ctx) => {
    const id = parseIdOrNull(raw);
    if (id === null) {
      ctx.addIssue({ code: "custom", message: `No such ${what}`, params: { notFound: true } });
      return z.NEVER;
    }
    return id;
  });
}

export const idSchema = idFor("record");

/** The 404 an id issue stands for, if the zod error holds one. */
export function notFoundFromIssues(error: z.ZodError): AppError | null {
  const issue = error.issues.find((i) => i.code === "custom" && (i as { params?: { notFound?: boolean } }).params?.notFound);
  return issue ? new AppError("not_found", issue.message) : null;
}
