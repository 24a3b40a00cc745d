/**
 * Content negotiation on a dataset's pages (`/datasets/3` every version, `/datasets/3/v2` one
 * version): the same URL answers the page (HTML) or a citation format, by the Accept header, as
 * decided by the `negotiator` package (the one Express and Koa use): the highest quality value
 * wins (RFC 9110 §12.5.1; q=0 is "not acceptable"); at equal quality the more specific range wins
 * (`text/html` over `text/*` over `*\/*`), then the one written first in Accept, and at a complete
 * tie (one range such as `*\/*` covering both) the page. Media types compare in any case (RFC 9110
 * §8.3.1). The decision is pure; `proxy.ts` calls `negotiateDatasetPage` for the rewrite, and the
 * citation endpoint reads the format with `negotiateCitationFormat` (the same rule).
 */
import Negotiator from "negotiator";

/** Citation media types → the citation endpoint's `format` (text/x-bibliography is the formatted reference). */
export const CITATION_MEDIA_TYPES = {
  "application/x-bibtex": "bibtex",
  "application/x-research-info-systems": "ris",
  "application/vnd.citationstyles.csl+json": "csl-json",
  "text/x-bibliography": "text",
} as const;

export type NegotiatedCitationFormat = (typeof CITATION_MEDIA_TYPES)[keyof typeof CITATION_MEDIA_TYPES];

const CITATION_TYPES = Object.keys(CITATION_MEDIA_TYPES) as (keyof typeof CITATION_MEDIA_TYPES)[];

/**
 * A `style` parameter (`text/x-bibliography; style=apa`) says which formatted reference, not which
 * media type: negotiator would match an element with parameters only to an offer with the same
 * ones, so it is read apart and left out of the matching.
 */
const STYLE_PARAMETER = /;\s*style\s*=\s*("[^"]*"|[^;,\s]*)/gi;

function preferred(accept: string | null | undefined, offers: string[]): string | undefined {
  const header = (accept ?? "").replace(STYLE_PARAMETER, "");
  return new Negotiator({ headers: { accept: header } }).mediaType(offers);
}

/** The citation format an Accept header prefers among ours, or null when it accepts none of them (no header: none). */
export function negotiateCitationFormat(accept: string | null | undefined): NegotiatedCitationFormat | null {
  if (!accept?.trim()) return null;
  const type = preferred(accept, CITATION_TYPES) as keyof typeof CITATION_MEDIA_TYPES | undefined;
  return type ? CITATION_MEDIA_TYPES[type] : null;
}

/**
 * What a dataset page's URL answers for this Accept: "html" (the page), or a citation format.
 * No Accept, or one that accepts nothing we offer, gets the page (its own 406 is not worth a
 * reader's broken link).
 */
export function negotiateDatasetPage(accept: string | null | undefined): "html" | NegotiatedCitationFormat {
  if (!accept?.trim()) return "html";
  // The page is offered first: a range that covers it and a citation type alike (*/*, text/*) gives the page.
  const type = preferred(accept, ["text/html", ...CITATION_TYPES]);
  if (!type || type === "text/html") return "html";
  return CITATION_MEDIA_TYPES[type as keyof typeof CITATION_MEDIA_TYPES];
}

/** The `style` parameter an Accept header gives a formatted reference (`text/x-bibliography; style=apa`), if any. */
export function acceptedCitationStyle(accept: string | null | undefined): string | null {
  const m = /text\/x-bibliography\s*;[^,]*?style\s*=\s*"?([^";,\s]+)/i.exec(accept ?? "");
  return m ? m[1].toLowerCase() : null;
}

/** A dataset page's path: `/datasets/3` (every version) or `/datasets/3/v2`; else null. */
export function datasetPagePath(pathname: string): { datasetId: string; version: string | null } | null {
  const m = /^\/datasets\/([1-9]\d{0,9})(?:\/v([1-9]\d{0,9}))?\/?$/.exec(routedPath(pathname));
  return m ? { datasetId: m[1], version: m[2] ?? null } : null;
}

/**
 * The path as the app routes it: %-escapes of unreserved characters decoded ("/datasets/%31/v1") and
 * dot segments resolved ("/datasets/1/./v1", "/datasets/1/x/../v1"), so that every spelling of a
 * dataset page's address negotiates and says Vary: Accept as the plain one does.
 */
export function routedPath(pathname: string): string {
  const decoded = pathname.replace(/%([0-9A-Fa-f]{2})/g, (escape, hex: string) => {
    const c = String.fromCharCode(parseInt(hex, 16));
    return /[A-Za-z0-9\-._~]/.test(c) ? c : escape;
  });
  try {
    return new URL(decoded, "http://path.invalid").pathname;
  } catch {
    return decoded;
  }
}

/**
 * The Vary of an answer at `url`: a dataset page's address answers HTML or a citation format by
 * Accept, so its every answer names Accept (Next writes its own Vary over next.config's on a page).
 */
export function varyOfAnswer(method: string | undefined, url: string | undefined, vary: string | undefined): string | undefined {
  if ((method !== "GET" && method !== "HEAD") || !url) return vary;
  const q = url.indexOf("?");
  if (!datasetPagePath(q === -1 ? url : url.slice(0, q))) return vary;
  const names = (vary ?? "")
    .split(",")
    .map((n) => n.trim())
    .filter(Boolean);
  if (names.some((n) => n === "*" || n.toLowerCase() === "accept")) return vary;
  return ["Accept", ...names].join(", ");
}

/**
 * Where a request to a dataset page goes: null for the page itself, else the citation endpoint's
 * path and query (`/api/v1/datasets/3/citation?format=ris&version=2`). Only GET and HEAD negotiate.
 */
export function citationRewriteTarget(method: string, pathname: string, accept: string | null): string | null {
  if (method !== "GET" && method !== "HEAD") return null;
  const page = datasetPagePath(pathname);
  if (!page) return null;
  const choice = negotiateDatasetPage(accept);
  if (choice === "html") return null;
  const query = new URLSearchParams({ format: choice });
  if (page.version) query.set("version", page.version);
  return `/api/v1/datasets/${page.datasetId}/citation?${query}`;
}
