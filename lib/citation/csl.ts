/**
 * THE citation builder: what a published version (or its whole series) is, as one CSL-JSON item.
 * Every citation the app writes starts here — the one-line citation of pages and downloads, the
 * formatted references, BibTeX, RIS and CSL-JSON. Pure: no I/O.
 */
import { normaliseDoi } from "@/lib/identifiers/datacite";
import { creatorName } from "./names";
import { mapStrings, oneLineText } from "@/lib/text/clean";

/** The publisher every citation names. */
export const PUBLISHER = "Arrhenia";

/** A CSL-JSON name: family and given parts, or one literal. */
export type CslName = { family: string; given?: string; "non-dropping-particle"?: string; suffix?: string } | { literal: string };

/** A CSL-JSON item (CSL 1.0.2 variables); fields beyond the ones named are kept as given. */
export interface CslItem {
  id: string;
  type: string;
  title: string;
  author?: CslName[];
  issued?: { "date-parts": number[][] };
  publisher?: string;
  version?: string;
  DOI?: string;
  URL?: string;
  "citation-key"?: string;
  [field: string]: unknown;
}

/** What a citation is of: one version, or every version under the series identifier. */
export interface CitationSubject {
  kind: "version" | "series";
  /** The version identifier, or the series identifier; null only for data minted before identifiers. */
  identifier: string | null;
  title: string;
  /** Creators as deposited ("Family, Given" or "Given Family"). */
  creators: string[];
  /** Publication of the version (a series: of its first version). */
  publishedAt: Date | null;
  /** The version's number; a series carries none. */
  versionNumber: number | null;
  /** The landing page (absolute URL). */
  url: string;
  /** Set when the version cited was retracted (a series: when every version was). */
  retracted?: { at: Date | null } | null;
}

/**
 * A creator's name as deposited → CSL name parts ("Tanaka, Emi" and "Emi Tanaka" both give family
 * Tanaka; an organisation's name is one literal), from the same parts DataCite's creators take (names.ts).
 */
export function cslName(name: string): CslName {
  const parts = creatorName(name);
  if (parts.kind === "organisation") return { literal: parts.name };
  return {
    family: parts.family,
    ...(parts.given ? { given: parts.given } : {}),
    ...(parts.particle ? { "non-dropping-particle": parts.particle } : {}),
    ...(parts.suffix ? { suffix: parts.suffix } : {}),
  };
}

/**
 * A stable citation key from the identifier (`arrhenia_ARH_4F7K_9QXM_v2`), else from the title's first word
 * and year. Letters, digits and underscores only: BibTeX keys with other characters are rewritten by
 * citation-js and refused by some BibTeX tools.
 */
export function citationKey(subject: Pick<CitationSubject, "identifier" | "title" | "publishedAt" | "versionNumber" | "kind">): string {
  const code = subject.identifier?.split("/").slice(1).join("-") ?? "";
  const base = code
    ? `arrhenia-${code}`
    : `arrhenia-${subject.title.split(/\s+/)[0] ?? "dataset"}${subject.publishedAt?.getUTCFullYear() ?? ""}`;
  // "…/ARH-4F7K-9QXM/2" already ends in its number; legacy ".v2" forms keep theirs.
  const key = subject.kind === "version" && subject.versionNumber !== null && code ? base.replace(/-(\d+)$/, "-v$1") : base;
  return key.replace(/[^A-Za-z0-9]+/g, "_").replace(/^_+|_+$/g, "");
}

/** The CSL-JSON item of a version or a series. */
export function buildCslItem(subject: CitationSubject): CslItem {
  const d = subject.publishedAt;
  const key = citationKey(subject);
  // Every field one clean line: a line break would start a new tag in RIS, a control character breaks XML.
  return mapStrings<CslItem>(
    {
      id: key,
      "citation-key": key,
      type: "dataset",
      title: subject.title.trim(),
      author: subject.creators.map(cslName),
      ...(d ? { issued: { "date-parts": [[d.getUTCFullYear(), d.getUTCMonth() + 1, d.getUTCDate()]] } } : {}),
      publisher: PUBLISHER,
      ...(subject.kind === "version" && subject.versionNumber !== null ? { version: String(subject.versionNumber) } : {}),
      ...(subject.identifier ? { DOI: subject.identifier } : {}),
      URL: subject.url,
      // CSL 1.0.2's `status` variable lists "retracted" among its examples (from memory); styles that ignore it get it in formats.ts.
      ...(subject.retracted ? { status: "retracted" } : {}),
    },
    oneLineText,
  );
}

/**
 * The source publication a deposit names, as a CSL-JSON item (its own CSL reference, with the DOI
 * added when given apart); null when it names none.
 */
export function sourceCslItem(source: { doi?: unknown; reference?: unknown } | undefined): CslItem | null {
  if (!source) return null;
  const doi = normaliseDoi(source.doi);
  const ref = source.reference && typeof source.reference === "object" ? (source.reference as Record<string, unknown>) : null;
  if (ref && typeof ref.title === "string" && ref.title.trim()) {
    const refDoi = normaliseDoi(ref.DOI) ?? doi;
    return mapStrings(
      {
        ...ref,
        id: "source",
        type: typeof ref.type === "string" ? ref.type : "article-journal",
        title: ref.title,
        ...(refDoi ? { DOI: refDoi } : {}),
      } as CslItem,
      oneLineText,
    );
  }
  return null;
}

/** The name parts of a CSL name, as written in a one-line citation ("Tanaka, Emi"). */
function nameText(n: CslName): string {
  if ("literal" in n) return n.literal;
  const family = [n["non-dropping-particle"], n.family].filter(Boolean).join(" ");
  return [family, n.given, n.suffix].filter(Boolean).join(", ");
}

/**
 * The one-line citation a version's page and its downloads carry, from the CSL item:
 * creators, year, title, version, publisher and identifier.
 *
 * @example citationLine(buildCslItem({ kind: "version", identifier: "10.5072/ARH-4F7K-9QXM/2", title: "OH + CH4", creators: ["Emi Tanaka"], … }))
 * // "Tanaka, Emi (2026). OH + CH4. Version 2. Arrhenia. doi:10.5072/ARH-4F7K-9QXM/2"
 */
export function citationLineOf(item: CslItem): string {
  const who = item.author?.length ? item.author.map(nameText).join("; ") : "Anonymous";
  const year = item.issued?.["date-parts"]?.[0]?.[0];
  const title = item.title.trim();
  const end = /[.?!]$/.test(title) ? "" : ".";
  const version = item.version ? ` Version ${item.version}.` : "";
  const status = item.status === "retracted" ? " Retracted." : "";
  return `${who} (${year ?? "n.d."}). ${title}${end}${version}${status} ${item.publisher ?? PUBLISHER}.${item.DOI ? ` doi:${item.DOI}` : ""}`;
}
