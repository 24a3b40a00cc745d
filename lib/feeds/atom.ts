/**
 * Atom feeds (RFC 4287) of what happens to the public datasets of one reaction or one reaction
 * class: each published version is an entry, and its retraction a second one. Built with the
 * `feed` package; pure (no database), so the wording and the XML are unit-tested.
 */
import { Feed } from "feed";
import { formatRange } from "@/lib/format";
import { xmlSafeText } from "@/lib/text/clean";

/** One public version of a dataset, as a feed reads it. */
export interface FeedVersion {
  datasetId: number;
  number: number;
  title: string;
  equation: string;
  identifier: string | null;
  pointCount: number;
  tMin: number | null;
  tMax: number | null;
  /** ISO 8601. */
  publishedAt: string;
  retractedAt: string | null;
  retractionNotice: string | null;
}

export interface FeedEntry {
  id: string;
  kind: "published" | "retracted";
  title: string;
  link: string;
  at: string;
  summary: string;
}

/** Most entries a feed carries: the newest ones (a reader that polls daily never misses one). */
export const FEED_ENTRIES = 100;

/**
 * The entries of a list of versions, newest first: a publication for each, and a retraction for
 * each retracted one. Entry ids are the version's address (a fragment for the retraction), so
 * a reader sees each event once however often it polls.
 */
export function feedEntries(versions: readonly FeedVersion[], siteUrl: string): FeedEntry[] {
  const entries: FeedEntry[] = [];
  for (const v of versions) {
    const link = `${siteUrl}/datasets/${v.datasetId}/v${v.number}`;
    const what = `${v.pointCount} ${v.pointCount === 1 ? "point" : "points"}${v.tMin !== null ? ` over ${formatRange(v.tMin, v.tMax, "K")}` : ""}`;
    const identifier = v.identifier ? ` Identifier: ${v.identifier}.` : "";
    const replaces = v.number > 1 ? ` It is version ${v.number} of the dataset and replaces version ${v.number - 1}.` : "";
    entries.push({
      id: link,
      kind: "published",
      title: `Published: ${v.title} (version ${v.number})`,
      link,
      at: v.publishedAt,
      summary: `${v.equation}: ${what}.${replaces}${identifier}`,
    });
    if (v.retractedAt) {
      entries.push({
        id: `${link}#retracted`,
        kind: "retracted",
        title: `Retracted: ${v.title} (version ${v.number})`,
        link,
        at: v.retractedAt,
        summary: `${v.equation}: this version was retracted${v.retractionNotice ? ` — ${v.retractionNotice}` : ""}. Its page stays, marked as retracted.${identifier}`,
      });
    }
  }
  // Newest first; at one instant a retraction before its publication.
  entries.sort((a, b) => b.at.localeCompare(a.at) || (a.kind === b.kind ? 0 : a.kind === "retracted" ? -1 : 1));
  return entries.slice(0, FEED_ENTRIES);
}

/** Plain text in an Atom element of type "html": markup characters written as text, characters XML cannot carry dropped. */
const html = (text: string) => xmlSafeText(text).replace(/&/g, "&amp;").replace(/</g, "&lt;").replace(/>/g, "&gt;");

/** The Atom document of one page's events. `updated` is the newest entry's time (or `emptySince` when there is none). */
export function renderAtomFeed({
  title,
  pageUrl,
  feedUrl,
  entries,
  emptySince,
}: {
  title: string;
  pageUrl: string;
  feedUrl: string;
  entries: readonly FeedEntry[];
  emptySince: string;
}): string {
  const feed = new Feed({
    // The feed's own title is a plain text element, which the package escapes itself.
    title: xmlSafeText(title),
    id: feedUrl,
    link: pageUrl,
    feedLinks: { atom: feedUrl },
    updated: new Date(entries[0]?.at ?? emptySince),
    generator: "Arrhenia",
    copyright: "Each dataset carries its own licence, named on its page.",
  });
  for (const e of entries) {
    feed.addItem({ title: html(e.title), id: e.id, link: e.link, date: new Date(e.at), description: html(e.summary) });
  }
  return feed.atom1();
}
