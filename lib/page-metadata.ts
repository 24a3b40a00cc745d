import type { Metadata } from "next";
import { appUrl } from "@/lib/config";

/** The site's name in titles and link previews. */
export const SITE_NAME = "Arrhenia";

/**
 * A public page's metadata: its title, a one-sentence description, the canonical URL on APP_URL
 * (read at request time, so one build serves any address) and the OpenGraph tags of link previews.
 */
export function publicPageMetadata({
  title,
  description,
  path,
  type = "website",
  feedPath,
}: {
  title: string;
  description: string;
  /** The page's path, starting with "/" (query strings never belong to a canonical URL here). */
  path: string;
  type?: "website" | "article";
  /** The page's Atom feed, announced to feed readers as an alternate. */
  feedPath?: string;
}): Metadata {
  const url = `${appUrl()}${path}`;
  return {
    title,
    description,
    alternates: { canonical: url, ...(feedPath ? { types: { "application/atom+xml": `${appUrl()}${feedPath}` } } : {}) },
    openGraph: { title: `${title} · ${SITE_NAME}`, description, url, siteName: SITE_NAME, type, locale: "en_GB" },
  };
}

/** What a missing page says in the tab (no canonical URL: there is no page). */
export const NOT_FOUND_METADATA: Metadata = { title: "Not found", robots: { index: false } };
