import { buildCslItem, citationLineOf, type CitationSubject } from "./csl";

/**
 * The one-line citation of a published version, as its page shows it and its downloads carry it:
 * creators, the year of publication, the title, the version, the publisher and the version
 * identifier. Pure; written from the same CSL-JSON item as every other citation format.
 *
 * @example citationLine({ kind: "version", creators: ["Emi Tanaka"], publishedAt: new Date("2026-03-04"), title: "OH + CH4", versionNumber: 2, identifier: "10.5072/ARH-4F7K-9QXM/2", url: "…" })
 * // "Tanaka, Emi (2026). OH + CH4. Version 2. Arrhenia. doi:10.5072/ARH-4F7K-9QXM/2"
 */
export function citationLine(subject: CitationSubject): string {
  return citationLineOf(buildCslItem(subject));
}
