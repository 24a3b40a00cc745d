import path from "node:path";
import { fileURLToPath } from "node:url";

const root = path.dirname(fileURLToPath(import.meta.url));

/** @type {import('next').NextConfig} */
const nextConfig = {
  // RDKit loads a .wasm file next to its JS; bundling rewrites that path.
  // piscina starts its own worker file from its package folder, which bundling would move.
  serverExternalPackages: ["@rdkit/rdkit", "pg-boss", "pg", "smtp-server", "mailparser", "nodemailer", "piscina"],
  // A lockfile in a parent folder would otherwise move Next's inferred root.
  turbopack: { root },
  outputFileTracingRoot: root,
  poweredByHeader: false,
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
