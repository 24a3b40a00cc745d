import type { MetadataRoute } from "next";
import { appUrl } from "@/lib/config";

export const dynamic = "force-dynamic";

// GET /robots.txt — public pages are open to crawlers; people's own pages, review, admin and the API are not.
export default function robots(): MetadataRoute.Robots {
  const base = appUrl();
  return {
    rules: {
      userAgent: "*",
      allow: "/",
      disallow: ["/api/", "/deposits", "/mechanisms", "/review", "/admin", "/settings", "/invitations", "/sign-in", "/sign-up"],
    },
    sitemap: `${base}/sitemap.xml`,
  };
}
