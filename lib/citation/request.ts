/**
 * The query of GET /api/v1/datasets/:id/citation, read with zod: `format`, `style` (for `text`) and
 * `version` (a number; without it, the series — every version). Any other parameter, a repeated
 * one or a bad value is a 400 naming the parameter. A request that reached the endpoint by content
 * negotiation on a dataset page (proxy.ts → lib/http/content-negotiation.ts; if the handler sees the page's URL)
 * takes its format from Accept and its version from the path, and leaves the page's own query
 * (the reader's units, say) aside. Pure.
 */
import { z } from "zod";
import { AppError } from "@/lib/errors";
import { acceptedCitationStyle, CITATION_MEDIA_TYPES, negotiateCitationFormat } from "@/lib/http/content-negotiation";
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

/** The query of GET /api/v1/datasets/:id/citation/references: one style, and a version (without it, the newest public one). */
export const referencesQuerySchema = citationQuerySchema.pick({ style: true, version: true }).strict();

/** The parsed query, or a 400 problem naming each parameter at fault. */
export function parseCitationQueryOrThrow(params: URLSearchParams): CitationQuery;
export function parseCitationQueryOrThrow(
  params: URLSearchParams,
  schema: typeof referencesQuerySchema,
): z.infer<typeof referencesQuerySchema>;
export function parseCitationQueryOrThrow(
  params: URLSearchParams,
  schema: typeof citationQuerySchema | typeof referencesQuerySchema = citationQuerySchema,
): CitationQuery | z.infer<typeof referencesQuerySchema> {
  const known = Object.keys(schema.shape).join(", ");
  const raw: Record<string, string> = {};
  const errors: { pointer: string; parameter: string; message: string }[] = [];
  for (const [name, value] of params) {
    if (name in raw) errors.push({ pointer: `/${name}`, parameter: name, message: `${name} may be given once` });
    raw[name] = value;
  }
  const parsed = schema.safeParse(raw);
  if (!parsed.success)
    for (const issue of parsed.error.issues) {
      const names = issue.code === "unrecognized_keys" ? issue.keys : [String(issue.path[0] ?? "")];
      for (const parameter of names)
        errors.push({
          pointer: `/${parameter}`,
          parameter,
          message: issue.code === "unrecognized_keys" ? `unknown parameter “${parameter}” (${known})` : issue.message,
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

/** The format an Accept header prefers among ours (lib/http/content-negotiation.ts: the `negotiator` package's rule). */
export { negotiateCitationFormat };

/** A dataset page's path: `/datasets/3` (every version) or `/datasets/3/v2`. */
const PAGE_PATH = /^\/datasets\/\d+(?:\/v([1-9]\d{0,9}))?\/?$/;

/** The citation request of a route-handler request: the API's query, or a dataset page's negotiation. */
export function citationQueryOrThrow(req: Request): CitationQuery {
  const url = new URL(req.url);
  const page = PAGE_PATH.exec(url.pathname);
  if (!page) return parseCitationQueryOrThrow(url.searchParams);
  const accept = req.headers.get("accept");
  const format = negotiateCitationFormat(accept);
  if (!format) throw new AppError("bad_request", `Accept names none of ${Object.keys(CITATION_MEDIA_TYPES).join(", ")}`);
  const style = citationQuerySchema.shape.style.safeParse(url.searchParams.get("style") ?? acceptedCitationStyle(accept) ?? undefined);
  const version = page[1] ? Number(page[1]) : undefined;
  if (version !== undefined && version > 2 ** 31 - 1) throw new AppError("not_found", "No such version");
  return { format, style: style.success ? style.data : DEFAULT_STYLE, ...(version !== undefined ? { version } : {}) };
}
