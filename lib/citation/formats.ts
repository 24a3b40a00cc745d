/**
 * A CSL-JSON item in every citation format the app offers, rendered by citation-js (no
 * hand-written formatter): formatted references in four CSL styles shipped in lib/citation/styles
 * (written by scripts/citation-styles.ts from the registry's bundle of the open CSL styles),
 * BibTeX, RIS and CSL-JSON. Server-side: the style files are read from the project folder once.
 */
import { readFileSync } from "node:fs";
import path from "node:path";
import { Cite, plugins } from "@citation-js/core";
import "@citation-js/plugin-csl";
import "@citation-js/plugin-bibtex";
import "@citation-js/plugin-ris";
import type { CslItem } from "./csl";

/** The styles offered: our id (API `style=`), the label on screen and the CSL style file. */
export const CITATION_STYLES = [
  { id: "apa", label: "APA", file: "apa.csl" },
  { id: "vancouver", label: "Vancouver", file: "vancouver.csl" },
  { id: "harvard", label: "Harvard", file: "harvard-cite-them-right.csl" },
  { id: "acs", label: "American Chemical Society", file: "american-chemical-society.csl" },
] as const;

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

/** A formatted reference, as plain text, in one of the four styles (no list number or trailing newline). */
export function formatReference(item: CslItem, style: CitationStyleId): string {
  const text = new Cite(item).format("bibliography", { format: "text", template: templateName(style), lang: "en-US" });
  // Numeric styles number the one entry ("1. ", "(1) "): a single reference stands on its own.
  return text.trim().replace(/^(\(1\)|\[1\]|1\.)\s+/, "");
}

/**
 * BibTeX: an `@misc` entry (the type every BibTeX style knows), the version written in `note`
 * since BibTeX has no version field, and the month without its day.
 */
export function formatBibtex(item: CslItem): string {
  const year = item.issued?.["date-parts"]?.[0];
  const forBibtex: CslItem = {
    ...item,
    ...(year ? { issued: { "date-parts": [year.slice(0, 2)] } } : {}),
    ...(item.version ? { note: `Version ${item.version}` } : {}),
  };
  return new Cite(forBibtex).format("bibtex").trim() + "\n";
}

/** A RIS tag line: two capitals (or a capital and a digit), two spaces, a dash. */
const RIS_TAG = /^[A-Z][A-Z0-9] {2}-/;

/**
 * RIS (type DATA, the version as ET), one line per tag: citation-js folds long values at 70
 * characters onto untagged lines, which readers take as a new, unknown line; the folds are joined
 * back (the item's values hold no line break of their own, see buildCslItem).
 */
export function formatRis(item: CslItem): string {
  const lines: string[] = [];
  for (const line of new Cite(item).format("ris").trim().split(/\r?\n/)) {
    if (RIS_TAG.test(line) || !lines.length) lines.push(line);
    else lines[lines.length - 1] += line;
  }
  return lines.join("\n") + "\n";
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

/** Everything the Cite panel shows for one item. */
export interface RenderedCitation {
  identifier: string | null;
  references: { style: CitationStyleId; label: string; text: string }[];
  bibtex: string;
  ris: string;
  cslJson: string;
}

/** Rendered citations of recent items: a published version's citation never changes, and rendering all of it costs tens of ms. */
const rendered = new Map<string, RenderedCitation>();
const RENDERED_KEPT = 500;

export function renderCitation(item: CslItem): RenderedCitation {
  const key = JSON.stringify(item);
  const kept = rendered.get(key);
  if (kept) return kept;
  const value: RenderedCitation = {
    identifier: typeof item.DOI === "string" ? item.DOI : null,
    references: CITATION_STYLES.map((s) => ({ style: s.id, label: s.label, text: formatReference(item, s.id) })),
    bibtex: formatBibtex(item),
    ris: formatRis(item),
    cslJson: formatCslJson(item),
  };
  if (rendered.size >= RENDERED_KEPT) rendered.delete(rendered.keys().next().value!);
  rendered.set(key, value);
  return value;
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
