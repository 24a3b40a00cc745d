// GET /sitemap.xml — the sitemap index: every file of public pages (app/sitemaps/sitemap.ts), as robots.txt says
import { renderSitemapIndex } from "@/lib/sitemap";

export const dynamic = "force-dynamic";

export async function GET() {
  return new Response(await renderSitemapIndex(), {
    headers: { "content-type": "application/xml; charset=utf-8", "cache-control": "public, max-age=0, must-revalidate" },
  });
}
