import { appUrl } from "@/lib/config";
import { formatRange } from "@/lib/format";
import { compose, type MailMessage } from "./templates";

/** `superseded`: a newer version of a collection member's dataset was published (told to the collection's owner and watchers). */
export type WatchEvent = "published" | "retracted" | "flags_changed" | "superseded";

/** One event of one version, as a notification tells it. */
/** One version as a notification tells it (lib/watches/queries.ts reads it). */
export interface NewsVersion {
  datasetId: number;
  number: number;
  title: string;
  equation: string;
  pointCount: number;
  tMin: number | null;
  tMax: number | null;
  identifier: string | null;
  retractionNotice: string | null;
  /** The dataset's newest published version when it is newer than this one (what replaces a retracted version). */
  newer: { number: number; title: string } | null;
  flags: string[];
}

/** One event of one version, as a notification tells it. */
export interface WatchNews {
  event: WatchEvent;
  version: NewsVersion;
}

/** A watch's stop link: what it ends, and its signed token. */
export interface StopLink {
  label: string;
  token: string;
}

export const stopUrl = (token: string) => `${appUrl()}/watches/stop?token=${encodeURIComponent(token)}`;
const versionUrl = (v: WatchNews["version"]) => `${appUrl()}/datasets/${v.datasetId}/v${v.number}`;

/** The subject line of one event. */
export function watchNewsSubject({ event, version: v }: WatchNews): string {
  if (event === "published") return `New on Arrhenia: ${v.title} (version ${v.number})`;
  if (event === "retracted") return `Retracted: ${v.title} (version ${v.number})`;
  if (event === "superseded") return `Superseded: ${v.title} (version ${v.number})`;
  return `Checks changed: ${v.title} (version ${v.number})`;
}

/** What happened, in one paragraph. */
export function watchNewsText({ event, version: v }: WatchNews): string {
  const id = v.identifier ? ` Identifier: ${v.identifier}.` : "";
  if (event === "published") {
    const range = v.tMin !== null ? ` over ${formatRange(v.tMin, v.tMax, "K")}` : "";
    const replaces = v.number > 1 ? ` It replaces version ${v.number - 1} of the dataset.` : "";
    return `“${v.title}”, version ${v.number}, was published: ${v.equation}, ${v.pointCount} ${v.pointCount === 1 ? "point" : "points"}${range}.${replaces}${id}`;
  }
  if (event === "retracted") {
    const reason = v.retractionNotice ? ` The reason given: ${v.retractionNotice}` : "";
    const replaced = v.newer
      ? ` Version ${v.newer.number} of the dataset (“${v.newer.title}”) replaces it.`
      : " No newer version of the dataset replaces it.";
    return `Version ${v.number} of “${v.title}” (${v.equation}) was retracted.${reason}${/[.!?]$/.test(reason) || !reason ? "" : "."}${replaced} Its page stays, marked as retracted.${id}`;
  }
  if (event === "superseded") {
    const replaced = v.newer
      ? `version ${v.newer.number} (“${v.newer.title}”) was published and replaces it`
      : "a newer version was published";
    return `Version ${v.number} of “${v.title}” (${v.equation}) is superseded: ${replaced}. A published collection keeps version ${v.number}; a new revision of the collection can take the newer one.${id}`;
  }
  const flags = v.flags.length > 0 ? v.flags.join(", ") : "none";
  return `A re-fit of “${v.title}”, version ${v.number} (${v.equation}), changed its flags; they are now: ${flags}. The dataset's page says what each means.${id}`;
}

const because = (reasons: string[]) => `You hear of it because you watch ${reasons.join(" and ")}.`;
const stopParagraphs = (stops: StopLink[]) => stops.map((s) => `To stop watching ${s.label}: ${stopUrl(s.token)}`);

/** One event, mailed when it happens. With one watch behind it, the mail also carries a one-click stop (RFC 8058). */
export function watchEventMail({
  to,
  name,
  news,
  reasons,
  stops,
}: {
  to: string;
  name: string;
  news: WatchNews;
  reasons: string[];
  stops: StopLink[];
}): MailMessage {
  const message = compose(to, watchNewsSubject(news), name, [watchNewsText(news), because(reasons), ...stopParagraphs(stops)], {
    label: "Open the dataset",
    url: versionUrl(news.version),
  });
  if (stops.length !== 1) return message;
  return {
    ...message,
    headers: {
      "List-Unsubscribe": `<${appUrl()}/api/watches/stop?token=${encodeURIComponent(stops[0].token)}>`,
      "List-Unsubscribe-Post": "List-Unsubscribe=One-Click",
    },
  };
}

/** A day's events in one mail. */
export function watchDigestMail({
  to,
  name,
  items,
  stops,
}: {
  to: string;
  name: string;
  items: { news: WatchNews; reasons: string[] }[];
  stops: StopLink[];
}): MailMessage {
  const paragraphs = items.map(({ news, reasons }) => `${watchNewsText(news)} ${because(reasons)} ${versionUrl(news.version)}`);
  return compose(
    to,
    `Arrhenia: ${items.length} ${items.length === 1 ? "change" : "changes"} to what you watch`,
    name,
    [...paragraphs, "You chose one mail a day; you can change that on the page of what you watch.", ...stopParagraphs(stops)],
    { label: "What you watch", url: `${appUrl()}/watches` },
  );
}
