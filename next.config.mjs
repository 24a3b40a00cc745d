import path from "node:path";
import { fileURLToPath } from "node:url";

const root = path.dirname(fileURLToPath(import.meta.url));

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
  // The data cache's in-memory part (cachedPublic, lib/public-cache.ts; the rest is on disk). Next
  // measures an entry by its JSON's length, while the parsed objects it keeps take several times
  // that in the heap: at Next's default (50 MB) the 100 000-dataset benchmark's server grew by
  // hundreds of MB. Anonymous readers' pages are replayed whole by lib/html-cache.ts anyway.
  cacheMaxMemorySize: 16 * 1024 * 1024,
  async headers() {
    // The same URL answers HTML or a citation format, by the Accept header (proxy.ts, lib/http/content-negotiation.ts).
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
    // The data cache stays in memory (cacheMaxMemorySize above), never on disk: its entries are keyed
    // by the public pages' mark (lib/public-cache.ts cachedPublic), so every change would leave the
    // old ones on disk for good — measured after a few benchmark runs with pages rendered ahead:
    // 73 893 files, 518 MB in .next-bench/cache/fetch-cache, and growing with every publication.
    isrFlushToDisk: false,
  },
};

export default nextConfig;
