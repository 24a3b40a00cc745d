/**
 * A CSL-JSON item in every citation format the app offers, rendered by citation-js (no
 * hand-written formatter): formatted references in four CSL styles shipped in lib/citation/styles
 * (written by scripts/citation-styles.ts from the registry's bundle of the open CSL styles),
 * BibTeX, RIS and CSL-JSON. Server-side: the style files are read from the project folder once.
 */
import { createHash } from "node:crypto";
import { readFileSync } from "node:fs";
import path from "node:path";
import { Cite, plugins } from "@citation-js/core";
import "@citation-js/plugin-csl";
import "@citation-js/plugin-bibtex";
import "@citation-js/plugin-ris";
import type { CslItem, CslName } from "./csl";

/** CSL variables a shipped style never prints for a dataset (its style file has no rule that reads them). */
type IgnoredVariable = "version" | "publisher" | "status" | "DOI";

/**
 * The styles offered: our id (API `style=`), the label on screen, the CSL style file and the
 * variables that file ignores for a dataset. Every reference must name the version, the publisher
 * a retraction and the identifier, so for those styles only (see styleItem): the version and the
 * retraction go into the title as "(version 2, retracted)", the publisher into `container-title`,
 * which the ACS file prints after the title, and the DOI into the address (`https://doi.org/…`),
 * which the Vancouver file prints instead of any DOI. tests/unit/citation/formats.test.ts checks each file still ignores
 * what is listed here.
 */
export const CITATION_STYLES = [
  { id: "apa", label: "APA", file: "apa.csl", ignores: ["status"] },
  { id: "vancouver", label: "Vancouver", file: "vancouver.csl", ignores: ["version", "status", "DOI"] },
  { id: "harvard", label: "Harvard", file: "harvard-cite-them-right.csl", ignores: ["version", "status"] },
  { id: "acs", label: "American Chemical Society", file: "american-chemical-society.csl", ignores: ["version", "publisher", "status"] },
] as const satisfies readonly { id: string; label: string; file: string; ignores: readonly IgnoredVariable[] }[];

export type CitationStyleId = (typeof CITATION_STYLES)[number]["id"];
export const CITATION_STYLE_IDS = CITATION_STYLES.map((s) => s.id) as [CitationStyleId, ...CitationStyleId[]];
export const DEFAULT_STYLE: CitationStyleId = "apa";

/** The machine formats, with their media types (registered or in common use) and file extensions. */
export const CITATION_FORMATS = {
  bibtex: { label: "BibTeX", mediaType: "application/x-bibtex", ext: "bib" },
  ris: { label: "RIS", mediaType: "application/x-research-info-systems", ext: "ris" },
  "csl-json": { label: "CSL-JSON", mediaType: "application/vnd.citationstyles.csl+json", ext: "json" },
  text: { label: "Formatted reference", mediaType: "text/plain", ext: "txt" },
} as const;

export type CitationFormat = keyof typeof CITATION_FORMATS;
export const CITATION_FORMAT_IDS = Object.keys(CITATION_FORMATS) as [CitationFormat, ...CitationFormat[]];

const STYLES_DIR = path.join(process.cwd(), "lib/citation/styles");
/** citation-js keeps registered styles per process; ours carry a prefix so they never shadow its built-in ones. */
const registered = new Set<string>();

function templateName(style: CitationStyleId): string {
  const name = `arrhenia-${style}`;
  if (!registered.has(name)) {
    const file = CITATION_STYLES.find((s) => s.id === style)!.file;
    plugins.config.get("@csl").styles.add(name, readFileSync(path.join(STYLES_DIR, file), "utf8"));
    registered.add(name);
  }
  return name;
}

/**
 * The item as one style is given it: what the style's file ignores (CITATION_STYLES `ignores`) put
 * where it prints — the version and a retraction appended to the title, the publisher as
 * `container-title`, the DOI as the address. Styles that print them get the item unchanged.
 */
export function styleItem(item: CslItem, style: CitationStyleId): CslItem {
  const ignores: readonly IgnoredVariable[] = CITATION_STYLES.find((s) => s.id === style)!.ignores;
  const notes = [
    ...(ignores.includes("version") && item.version ? [`version ${item.version}`] : []),
    ...(ignores.includes("status") && item.status === "retracted" ? ["retracted"] : []),
  ];
  const changes: Partial<CslItem> = {
    ...(notes.length ? { title: `${item.title} (${notes.join(", ")})` } : {}),
    ...(ignores.includes("publisher") && item.publisher && !item["container-title"] ? { "container-title": item.publisher } : {}),
    ...(ignores.includes("DOI") && item.DOI ? { URL: `https://doi.org/${item.DOI}` } : {}),
  };
  return Object.keys(changes).length ? { ...item, ...changes } : item;
}

/**
 * Formatted references already made, by style and item (the text is a function of the two alone, so
 * nothing ever invalidates an entry): citeproc takes several ms per reference, and a harvest page,
 * a version's DataCite record and its registration format the same source reference again and again.
 */
const formatted = new Map<string, string>();
const FORMATTED_KEPT = 5000;

/** A formatted reference, as plain text, in one of the four styles (no list number or trailing newline). */
export function formatReference(item: CslItem, style: CitationStyleId): string {
  const key = `${style}\n${JSON.stringify(item)}`;
  const kept = formatted.get(key);
  if (kept !== undefined) return kept;
  const text = new Cite(styleItem(item, style)).format("bibliography", { format: "text", template: templateName(style), lang: "en-US" });
  // Numeric styles number the one entry ("1. ", "(1) "): a single reference stands on its own.
  const value = text.trim().replace(/^(\(1\)|\[1\]|1\.)\s+/, "");
  if (formatted.size >= FORMATTED_KEPT) formatted.delete(formatted.keys().next().value!);
  formatted.set(key, value);
  return value;
}

/**
 * BibTeX: an `@misc` entry (the type every BibTeX style knows), the version written in `note`
 * since BibTeX has no version field, and the month without its day.
 */
export function formatBibtex(item: CslItem): string {
  const year = item.issued?.["date-parts"]?.[0];
  const forBibtex: CslItem = {
    ...item,
    ...(item.author ? { author: item.author.map(bibtexSafeName) } : {}),
    ...(item.DOI ? { DOI: verbatimSafe(item.DOI) } : {}),
    ...(item.URL ? { URL: verbatimSafe(item.URL) } : {}),
    ...(year ? { issued: { "date-parts": [year.slice(0, 2)] } } : {}),
    ...(noteOf(item) ? { note: noteOf(item) } : {}),
  };
  return new Cite(forBibtex).format("bibtex").trim() + "\n";
}

/**
 * BibTeX's special characters as citation-js writes them in a person's name (its escaping, from
 * @citation-js/plugin-bibtex's command table): a brace or backslash in a value would otherwise end
 * the field or start a command.
 */
const BIBTEX_SPECIAL: Record<string, string> = {
  "\\": "\\textbackslash{}",
  "{": "\\textbraceleft{}",
  "}": "\\textbraceright{}",
  $: "\\textdollar{}",
  _: "\\textunderscore{}",
  "^": "\\textasciicircum{}",
  "~": "\\textasciitilde{}",
  "&": "\\&",
  "%": "\\%",
  "#": "\\#",
};

/** A text written into BibTeX as is, escaped as citation-js escapes a person's name. */
export function escapeBibtexText(text: string): string {
  return text.replace(/[\\{}$_^~&%#]/g, (c) => BIBTEX_SPECIAL[c]!);
}

/**
 * An organisation's name (one literal) escaped before citation-js gets it: citation-js writes a
 * literal name inside braces unescaped, where a "}" would close the field early.
 */
function bibtexSafeName(name: CslName): CslName {
  return "literal" in name ? { literal: escapeBibtexText(name.literal) } : name;
}

/** DOI and URL are written verbatim (no escapes exist there): braces and backslashes percent-encoded, as in a URL. */
function verbatimSafe(value: string): string {
  return value.replace(/[{}\\]/g, (c) => `%${c.charCodeAt(0).toString(16).toUpperCase()}`);
}

/** What BibTeX's and RIS's note says: the version (neither format has a field for it in a dataset entry) and a retraction. */
function noteOf(item: CslItem): string | null {
  const parts = [...(item.version ? [`Version ${item.version}`] : []), ...(item.status === "retracted" ? ["Retracted"] : [])];
  return parts.length ? parts.join(". ") : null;
}

/**
 * RIS's ID tag holds at most 20 characters (the RIS specification; citation-js cuts longer ones),
 * so a RIS record gets an id of its own that fits whole: the citation key without its "arrhenia_"
 * prefix (`ARH_4F7K_9QXM_v2`), or, when that is still longer, its first 11 characters and 8 hex digits of
 * its SHA-256 — stable, and different for different keys.
 */
export function risRecordId(item: CslItem): string {
  const key = String(item["citation-key"] ?? item.id).replace(/^arrhenia_/, "");
  if (key.length <= RIS_ID_MAX) return key;
  return `${key.slice(0, 11)}_${createHash("sha256").update(key).digest("hex").slice(0, 8)}`;
}
const RIS_ID_MAX = 20;

/** A RIS tag line: two capitals (or a capital and a digit), two spaces, a dash. */
const RIS_TAG = /^[A-Z][A-Z0-9] {2}-/;

/**
 * RIS (type DATA, the version as ET, the record id whole: risRecordId; a retraction in the note), one line per tag: citation-js folds long values at 70
 * characters onto untagged lines, which readers take as a new, unknown line; the folds are joined
 * back (the item's values hold no line break of their own, see buildCslItem).
 */
export function formatRis(item: CslItem): string {
  const lines: string[] = [];
  const note = item.status === "retracted" ? noteOf(item) : null;
  const forRis: CslItem = { ...item, id: risRecordId(item), ...(note ? { note } : {}) };
  for (const line of new Cite(forRis).format("ris").trim().split(/\r?\n/)) {
    if (RIS_TAG.test(line) || !lines.length) lines.push(line);
    else lines[lines.length - 1] += line;
  }
  // RIS dates are YYYY/MM/DD/other with two-digit month and day; citation-js writes 2026/12/3/.
  return lines.map(padRisDate).join("\n") + "\n";
}

/** "DA  - 2026/12/3/" → "DA  - 2026/12/03/" (also PY, Y1, Y2): month and day of a RIS date in two digits. */
function padRisDate(line: string): string {
  const m = /^(DA|PY|Y1|Y2) {2}- (\d{4})\/(\d{1,2})?\/(\d{1,2})?\/(.*)$/.exec(line);
  if (!m) return line;
  const two = (x: string | undefined) => (x === undefined ? "" : x.padStart(2, "0"));
  return `${m[1]}  - ${m[2]}/${two(m[3])}/${two(m[4])}/${m[5]}`;
}

/** CSL-JSON: an array of one item, as CSL processors read it. */
export function formatCslJson(item: CslItem): string {
  return JSON.stringify([item], null, 2) + "\n";
}

/** One item in one format (`text` in the given style). */
export function formatCitation(item: CslItem, format: CitationFormat, style: CitationStyleId = DEFAULT_STYLE): string {
  switch (format) {
    case "bibtex":
      return formatBibtex(item);
    case "ris":
      return formatRis(item);
    case "csl-json":
      return formatCslJson(item);
    case "text":
      return formatReference(item, style) + "\n";
  }
}

/**
 * What the Cite panel of a version page gets from the server for one item: the identifier and the
 * machine formats (our own writers, fractions of a ms). Formatted references are not rendered with
 * the page: citeproc takes about 4 ms a reference, a third of a first-time page; the panel fetches
 * them (GET /api/v1/datasets/:id/citation/references) in the style the reader picks.
 */
export interface RenderedCitation {
  identifier: string | null;
  bibtex: string;
  ris: string;
  cslJson: string;
}

export function renderCitation(item: CslItem): RenderedCitation {
  return {
    identifier: typeof item.DOI === "string" ? item.DOI : null,
    bibtex: formatBibtex(item),
    ris: formatRis(item),
    cslJson: formatCslJson(item),
  };
}

/**
 * Registers the styles and builds citeproc's engine for each once (about a second in all): called
 * when the citation route loads, which scripts/warm-up.ts makes happen before the server opens, so
 * no reader's request pays it.
 */
export function warmCitationStyles(): void {
  const item: CslItem = {
    id: "warm-up",
    type: "dataset",
    title: "Warm-up",
    author: [{ family: "Warm", given: "Up" }],
    issued: { "date-parts": [[2026]] },
  };
  for (const s of CITATION_STYLES) formatReference(item, s.id);
  formatBibtex(item);
  formatRis(item);
}
