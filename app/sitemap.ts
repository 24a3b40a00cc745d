import type { MetadataRoute } from "next";
import { appUrl } from "@/lib/config";
import { REACTION_CLASSES } from "@/lib/deposits/vocabulary";
import { classPath, speciesPath, versionPath } from "@/lib/identifiers/paths";
import { listPublicReactionKeysCached, listPublicSpeciesKeysCached, listPublicVersionPagesCached } from "@/lib/reactions/cached";
import { reactionPath } from "@/lib/reactions/paths";

// Read at request time: the list changes with every publication (cached data, invalidated then).
export const dynamic = "force-dynamic";

/** The pages anyone may read that never change their address. */
const STATIC_PUBLIC_PATHS = ["/", "/reactions", "/classes", "/search", "/analyse", "/docs/api", "/docs/deposit-format"];

// GET /sitemap.xml — every public page: the fixed pages, every published or retracted version, every public reaction by key, its species, every class.
export default async function sitemap(): Promise<MetadataRoute.Sitemap> {
  const base = appUrl();
  const [versions, reactions, species] = await Promise.all([
    listPublicVersionPagesCached(),
    listPublicReactionKeysCached(),
    listPublicSpeciesKeysCached(),
  ]);
  return [
    ...STATIC_PUBLIC_PATHS.map((path) => ({ url: `${base}${path}` })),
    ...REACTION_CLASSES.map((c) => ({ url: `${base}${classPath(c.id)}` })),
    ...reactions.map((key) => ({ url: `${base}${reactionPath(key)}` })),
    ...species.map((key) => ({ url: `${base}${speciesPath(key)}` })),
    ...versions.map((v) => ({ url: `${base}${versionPath(v.datasetId, v.number)}`, ...(v.changed ? { lastModified: v.changed } : {}) })),
  ];
}
