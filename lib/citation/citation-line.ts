/**
 * The one-line citation of a published version, as its page shows it and its downloads carry it:
 * creators as deposited, the year of publication, the title, the version, the publisher and the
 * version identifier. Pure. Richer formats (CSL-JSON, BibTeX, RIS) are built elsewhere.
 *
 * @example citationLine({ creators: ["Tanaka, Hiroshi"], year: 2026, title: "OH + CH4", versionNumber: 2, identifier: "10.5072/ARH-4F7K-9QXM/2" })
 * // "Tanaka, Hiroshi (2026). OH + CH4. Version 2. Arrhenia. doi:10.5072/ARH-4F7K-9QXM/2"
 */
export function citationLine({
  creators,
  year,
  title,
  versionNumber,
  identifier,
}: {
  creators: string[];
  year: number | null;
  title: string;
  versionNumber: number;
  identifier: string | null;
}): string {
  const who = creators.length ? creators.join("; ") : "Anonymous";
  const end = /[.?!]$/.test(title.trim()) ? "" : ".";
  return `${who} (${year ?? "n.d."}). ${title.trim()}${end} Version ${versionNumber}. Arrhenia.${identifier ? ` doi:${identifier}` : ""}`;
}
