import path from "node:path";
import { fileURLToPath } from "node:url";

const root = path.dirname(fileURLToPath(import.meta.url));

/**
 * Content negotiation on a dataset's pages: a client asking for a citation format gets the
 * citation endpoint's answer at the page's own URL — the version (`/datasets/3/v2`) or every
 * version (`/datasets/3`). The endpoint sees the page's URL and reads the format from Accept and
 * the version from the path (lib/citation/request.ts citationQueryOrThrow). Next matches a header
 * with one regular expression (no flags), so media types are matched letter by letter in either
 * case (RFC 9110 §8.3.1), and quality values (RFC 9110 §12.4.2) only as far as a pattern can: a
 * citation type with q=0 asks for nothing; a citation type is served when HTML is not asked for,
 * or when the citation type has the full quality (no q, or q=1) and HTML a lower one. Any other
 * mix of qualities gets the page (HTML).
 */
const citationTypes = [
  "application/x-bibtex",
  "application/x-research-info-systems",
  "application/vnd.citationstyles.csl+json",
  "text/x-bibliography",
];
/** A pattern matching `text` in any mix of upper and lower case. */
const anyCase = (text) =>
  [...text].map((c) => (/[a-z]/i.test(c) ? `[${c.toLowerCase()}${c.toUpperCase()}]` : c.replace(/[.+*/]/g, "\\$&"))).join("");
/** One element of Accept whose media type is one of `types`, followed (in its own element) by parameters matching `rest`. */
const element = (types, rest) => `(?:.*[,\\s])?(?:${types.map(anyCase).join("|")})${rest}(?:[;,\\s].*)?`;
const Q = "[;]\\s*[qQ]\\s*=\\s*";
/** After the media type: no q=0 (0, 0.0, 0.00, 0.000) in its element. */
const positiveQ = `(?![^,]*${Q}0(?:\\.0{0,3})?\\s*(?:[;,]|$))`;
/** After the media type: no q below 1 in its element (no q, or q=1, 1.0…). */
const fullQ = `(?![^,]*${Q}0)`;
const citationRules = [
  // A citation type (q > 0) and no HTML at all.
  {
    has: [{ type: "header", key: "accept", value: element(citationTypes, positiveQ) }],
    missing: [{ type: "header", key: "accept", value: element(["text/html"], "") }],
  },
  // A citation type at full quality; HTML, if named, at a lower one.
  {
    has: [{ type: "header", key: "accept", value: element(citationTypes, fullQ) }],
    missing: [{ type: "header", key: "accept", value: element(["text/html"], fullQ) }],
  },
];
const citationRewrites = citationRules.flatMap((negotiation) => [
  { source: "/datasets/:id(\\d+)/:version(v\\d+)", ...negotiation, destination: "/api/v1/datasets/:id/citation" },
  { source: "/datasets/:id(\\d+)", ...negotiation, destination: "/api/v1/datasets/:id/citation" },
]);

/** The rewrites' header conditions, for tests: whether Next would serve the citation for this Accept. */
export function acceptRewritesToCitation(accept) {
  const matches = (item) => new RegExp(`^${item.value}$`).test(accept);
  return citationRules.some((r) => r.has.every(matches) && !r.missing.some(matches));
}

/** @type {import('next').NextConfig} */
const nextConfig = {
  // RDKit loads a .wasm file next to its JS; bundling rewrites that path.
  // piscina starts its own worker file from its package folder, which bundling would move.
  // citation-js loads its plugins and citeproc as CommonJS modules that register with one shared core.
  serverExternalPackages: [
    "@citation-js/core",
    "@citation-js/plugin-csl",
    "@citation-js/plugin-bibtex",
    "@citation-js/plugin-ris",
    "@rdkit/rdkit",
    "pg-boss",
    "pg",
    "smtp-server",
    "mailparser",
    "nodemailer",
    "piscina",
  ],
  // A lockfile in a parent folder would otherwise move Next's inferred root.
  turbopack: { root },
  outputFileTracingRoot: root,
  poweredByHeader: false,
  async rewrites() {
    return { beforeFiles: citationRewrites, afterFiles: [], fallback: [] };
  },
  async headers() {
    // The same URL answers HTML or a citation format, by the Accept header.
    return [
      { source: "/datasets/:id(\\d+)", headers: [{ key: "Vary", value: "Accept" }] },
      { source: "/datasets/:id(\\d+)/:version(v\\d+)", headers: [{ key: "Vary", value: "Accept" }] },
    ];
  },
  // npm test builds into its own folder so it never replaces the build a running npm start serves.
  distDir: process.env.NEXT_DIST_DIR || ".next",
  // Type errors are caught by `npm run typecheck`, its own tier in `npm test`; checking again here
  // would only double the build time.
  typescript: { ignoreBuildErrors: true },
  typedRoutes: false,
  experimental: {
    // Next reads a server action's whole body, counting it, before any action runs. The largest
    // argument is a deposit document (at most 25 MB, MAX_DOCUMENT_BYTES) passed as a JSON string,
    // whose escaped quotes add about a fifth; every other action sends a few kilobytes.
    serverActions: { bodySizeLimit: "32mb" },
    // forbidden() (app/forbidden.tsx, a 403 "You do not have access" page) needs this flag in Next 16.
    authInterrupts: true,
  },
};

export default nextConfig;
