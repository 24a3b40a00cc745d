/**
 * The query of GET /api/v1/datasets/:id/citation, read with zod: `format`, `style` (for `text`) and
 * `version` (a number; without it, the series — every version). Any other parameter, a repeated
 * one or a bad value is a 400 naming the parameter. A request that reached the endpoint by content
 * negotiation on a dataset page (next.config.mjs rewrites; the handler still sees the page's URL)
 * takes its format from Accept and its version from the path, and leaves the page's own query
 * (the reader's units, say) aside. Pure.
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
  for (const [name, value] of params) {
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

/** Accept media types → citation formats (those the endpoint serves; text/x-bibliography is the formatted reference). */
const ACCEPTED: Record<string, CitationFormat> = {
  "application/x-bibtex": "bibtex",
  "application/x-research-info-systems": "ris",
  "application/vnd.citationstyles.csl+json": "csl-json",
  "text/x-bibliography": "text",
};

/**
 * The citation format an Accept header prefers (RFC 9110 §12.5.1: highest q wins, then the order
 * written), or null when it names none of ours.
 */
export function negotiateCitationFormat(accept: string | null): CitationFormat | null {
  let best: { format: CitationFormat; q: number } | null = null;
  for (const part of (accept ?? "").split(",")) {
    const [type = "", ...params] = part.split(";").map((x) => x.trim().toLowerCase());
    const format = ACCEPTED[type];
    if (!format) continue;
    const qParam = params.find((p) => p.startsWith("q="));
    const q = qParam ? Number(qParam.slice(2)) : 1;
    if (Number.isFinite(q) && q > 0 && (!best || q > best.q)) best = { format, q };
  }
  return best?.format ?? null;
}

/** A dataset page's path: `/datasets/3` (every version) or `/datasets/3/v2`. */
const PAGE_PATH = /^\/datasets\/\d+(?:\/v([1-9]\d{0,9}))?\/?$/;

/** The citation request of a route-handler request: the API's query, or a dataset page's negotiation. */
export function citationQueryOrThrow(req: Request): CitationQuery {
  const url = new URL(req.url);
  const page = PAGE_PATH.exec(url.pathname);
  if (!page) return parseCitationQueryOrThrow(url.searchParams);
  const format = negotiateCitationFormat(req.headers.get("accept"));
  if (!format) throw new AppError("bad_request", `Accept names none of ${Object.keys(ACCEPTED).join(", ")}`);
  const style = citationQuerySchema.shape.style.safeParse(url.searchParams.get("style") ?? undefined);
  const version = page[1] ? Number(page[1]) : undefined;
  if (version !== undefined && version > 2 ** 31 - 1) throw new AppError("not_found", "No such version");
  return { format, style: style.success ? style.data : DEFAULT_STYLE, ...(version !== undefined ? { version } : {}) };
}
