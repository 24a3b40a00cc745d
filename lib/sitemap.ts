import "server-only";
import type { MetadataRoute } from "next";
import { appUrl } from "@/lib/config";
import { REACTION_CLASSES } from "@/lib/deposits/vocabulary";
import { classPath, collectionVersionPath, speciesPath, versionPath } from "@/lib/identifiers/paths";
import { listPublishedCollectionVersionPages } from "@/lib/collections/queries";
import { listPublicReactionKeysCached, listPublicSpeciesKeysCached, listPublicVersionPagesCached } from "@/lib/reactions/cached";
import { reactionPath } from "@/lib/reactions/paths";

/**
 * The sitemap of every public page, split into files of at most SITEMAP_PAGE_SIZE addresses (the
 * sitemaps protocol's limit is 50 000 per file) and listed by a sitemap index at /sitemap.xml,
 * which robots.txt names. app/sitemaps/sitemap.ts serves the files (Next's generateSitemaps:
 * /sitemaps/sitemap/<n>.xml), app/sitemap.xml/route.ts the index.
 */
export const SITEMAP_PAGE_SIZE = 50_000;

/** Where the files are served, by number. */
export const sitemapFilePath = (id: number) => `/sitemaps/sitemap/${id}.xml`;

/** The pages anyone may read that never change their address. */
const STATIC_PUBLIC_PATHS = ["/", "/reactions", "/classes", "/search", "/collections", "/analyse", "/docs/api", "/docs/deposit-format"];

/** Every public page: the fixed pages, every class, every public reaction by key, its species, every published or retracted version, every published collection version. */
export async function listSitemapEntries(): Promise<MetadataRoute.Sitemap> {
  const base = appUrl();
  const [versions, reactions, species, collections] = await Promise.all([
    listPublicVersionPagesCached(),
    listPublicReactionKeysCached(),
    listPublicSpeciesKeysCached(),
    listPublishedCollectionVersionPages(),
  ]);
  return [
    ...STATIC_PUBLIC_PATHS.map((path) => ({ url: `${base}${path}` })),
    ...REACTION_CLASSES.map((c) => ({ url: `${base}${classPath(c.id)}` })),
    ...reactions.map((key) => ({ url: `${base}${reactionPath(key)}` })),
    ...species.map((key) => ({ url: `${base}${speciesPath(key)}` })),
    ...versions.map((v) => ({ url: `${base}${versionPath(v.datasetId, v.number)}`, ...(v.changed ? { lastModified: v.changed } : {}) })),
    ...collections.map((c) => ({
      url: `${base}${collectionVersionPath(c.collectionId, c.number)}`,
      ...(c.publishedAt ? { lastModified: c.publishedAt } : {}),
    })),
  ];
}

/** The numbers of the sitemap files (at least one, even with nothing public yet). */
export async function listSitemapIds({ pageSize = SITEMAP_PAGE_SIZE }: { pageSize?: number } = {}): Promise<number[]> {
  const count = Math.max(1, Math.ceil((await listSitemapEntries()).length / pageSize));
  return Array.from({ length: count }, (_, i) => i);
}

/** The addresses of file `id` (empty past the last one). */
export async function getSitemapPage({
  id,
  pageSize = SITEMAP_PAGE_SIZE,
}: {
  id: number;
  pageSize?: number;
}): Promise<MetadataRoute.Sitemap> {
  return (await listSitemapEntries()).slice(id * pageSize, (id + 1) * pageSize);
}

const escapeXml = (s: string) =>
  s.replace(/[<>&'"]/g, (c) => ({ "<": "&lt;", ">": "&gt;", "&": "&amp;", "'": "&apos;", '"': "&quot;" })[c]!);

/** The sitemap index (sitemaps.org protocol 0.9) naming every file. */
export async function renderSitemapIndex({ pageSize = SITEMAP_PAGE_SIZE }: { pageSize?: number } = {}): Promise<string> {
  const base = appUrl();
  const ids = await listSitemapIds({ pageSize });
  return [
    '<?xml version="1.0" encoding="UTF-8"?>',
    '<sitemapindex xmlns="http://www.sitemaps.org/schemas/sitemap/0.9">',
    ...ids.map((id) => `<sitemap><loc>${escapeXml(`${base}${sitemapFilePath(id)}`)}</loc></sitemap>`),
    "</sitemapindex>",
    "",
  ].join("\n");
}
