import type { CitationSubject } from "./csl";

/** What the citation of a version needs from the stored version (its frozen document and row). */
export interface CitableVersion {
  datasetId: number;
  number: number;
  title: string;
  versionIdentifier: string | null;
  publishedAt: Date | null;
  payload: Record<string, unknown>;
  /** Lifecycle state: a `retracted` version is cited as such. */
  state?: string;
  retractedAt?: Date | null;
}

/** The retraction a citation mentions, or null. */
function retractionOf(version: CitableVersion): CitationSubject["retracted"] {
  return version.state === "retracted" ? { at: version.retractedAt ?? null } : null;
}

/** Creators' names as deposited, in their order. */
export function creatorNames(payload: Record<string, unknown>): string[] {
  const creators = Array.isArray(payload.creators) ? payload.creators : [];
  return creators.flatMap((c) => (c && typeof c === "object" && typeof c.name === "string" && c.name.trim() ? [c.name.trim()] : []));
}

/** "Cite this version": the version identifier, its title, creators, date and number. Pure. */
export function versionCitationSubject(version: CitableVersion, url: string): CitationSubject {
  return {
    kind: "version",
    identifier: version.versionIdentifier,
    title: version.title,
    creators: creatorNames(version.payload),
    publishedAt: version.publishedAt,
    versionNumber: version.number,
    url,
    retracted: retractionOf(version),
  };
}

/**
 * "Cite every version": the series identifier, described by the newest public version (title and
 * creators) and dated by the first publication, as the series' registration metadata is. Pure.
 */
export function seriesCitationSubject(
  newest: CitableVersion,
  { seriesIdentifier, firstPublishedAt, url }: { seriesIdentifier: string | null; firstPublishedAt: Date | null; url: string },
): CitationSubject {
  return {
    kind: "series",
    identifier: seriesIdentifier,
    title: newest.title,
    creators: creatorNames(newest.payload),
    publishedAt: firstPublishedAt ?? newest.publishedAt,
    versionNumber: null,
    url,
    // The series describes its newest published version; only when every version is retracted is that one retracted.
    retracted: retractionOf(newest),
  };
}
