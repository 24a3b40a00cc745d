/**
 * The query of GET /api/v1/datasets/:id/citation, read with zod: `format`, `style` (for `text`) and
 * `version` (a number; without it, the series — every version). Any other parameter, a repeated
 * one or a bad value is a 400 naming the parameter; except when the request reached the endpoint by
 * content negotiation on a dataset page (`negotiated=1`, next.config.mjs), whose own query (the
 * reader's units, say) is left aside. Pure.
 */
import { z } from "zod";
import { AppError } from "@/lib/errors";
import { CITATION_FORMAT_IDS, CITATION_STYLE_IDS, DEFAULT_STYLE, type CitationFormat, type CitationStyleId } from "./formats";

export const citationQuerySchema = z
  .object({
    format: z.enum(CITATION_FORMAT_IDS, { error: `format must be one of ${CITATION_FORMAT_IDS.join(", ")}` }).default("bibtex"),
    style: z.enum(CITATION_STYLE_IDS, { error: `style must be one of ${CITATION_STYLE_IDS.join(", ")}` }).default(DEFAULT_STYLE),
    version: z
      .string()
      .regex(/^v?[1-9]\d{0,9}$/, "version must be a version number such as 2")
      .transform((v) => Number(v.replace(/^v/, "")))
      .refine((n) => n <= 2 ** 31 - 1, "version must be a version number such as 2")
      .optional(),
  })
  .strict();

export interface CitationQuery {
  format: CitationFormat;
  style: CitationStyleId;
  version?: number;
}

/** The parsed query, or a 400 problem naming each parameter at fault. */
export function parseCitationQueryOrThrow(params: URLSearchParams): CitationQuery {
  const raw: Record<string, string> = {};
  const errors: { pointer: string; parameter: string; message: string }[] = [];
  const negotiated = params.get("negotiated") === "1";
  const known = new Set(Object.keys(citationQuerySchema.shape));
  for (const [name, value] of params) {
    if (negotiated && !known.has(name)) continue;
    if (name in raw) errors.push({ pointer: `/${name}`, parameter: name, message: `${name} may be given once` });
    raw[name] = value;
  }
  const parsed = citationQuerySchema.safeParse(raw);
  if (!parsed.success)
    for (const issue of parsed.error.issues) {
      const names = issue.code === "unrecognized_keys" ? issue.keys : [String(issue.path[0] ?? "")];
      for (const parameter of names)
        errors.push({
          pointer: `/${parameter}`,
          parameter,
          message: issue.code === "unrecognized_keys" ? `unknown parameter “${parameter}” (format, style, version)` : issue.message,
        });
    }
  if (errors.length || !parsed.success) {
    const title =
      errors.length === 1
        ? errors[0].message
        : `${errors.length} query parameters are not valid (${[...new Set(errors.map((e) => e.parameter))].join(", ")})`;
    throw new AppError("bad_request", title, errors);
  }
  return parsed.data;
}
