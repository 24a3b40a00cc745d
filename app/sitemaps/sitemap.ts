import type { MetadataRoute } from "next";
import { getSitemapPage, listSitemapIds } from "@/lib/sitemap";

// Read at request time: the list changes with every publication (cached data, invalidated then).
export const dynamic = "force-dynamic";

/** The files of the sitemap; during the build there is no database to count from (requests count afresh). */
export async function generateSitemaps() {
  if (process.env.NEXT_PHASE === "phase-production-build") return [{ id: 0 }];
  return (await listSitemapIds()).map((id) => ({ id }));
}

// GET /sitemaps/sitemap/<n>.xml — the n-th file of at most 50 000 public pages (listed by /sitemap.xml).
export default async function sitemap(props: { id: Promise<string> }): Promise<MetadataRoute.Sitemap> {
  return getSitemapPage({ id: Number(await props.id) });
}
