import { appUrl } from "@/lib/config";
import { feedEntries, renderAtomFeed, type FeedVersion } from "./atom";

/** The HTTP answer carrying a page's Atom feed. */
export function atomResponse({ title, pagePath, versions }: { title: string; pagePath: string; versions: FeedVersion[] }): Response {
  const site = appUrl();
  const xml = renderAtomFeed({
    title,
    pageUrl: `${site}${pagePath}`,
    feedUrl: `${site}${pagePath}/feed.xml`,
    entries: feedEntries(versions, site),
    // A feed with no entry yet: the start of the epoch says "nothing has happened", and never changes.
    emptySince: "1970-01-01T00:00:00.000Z",
  });
  return new Response(xml, {
    headers: { "content-type": "application/atom+xml; charset=utf-8", "cache-control": "public, max-age=0, must-revalidate" },
  });
}
