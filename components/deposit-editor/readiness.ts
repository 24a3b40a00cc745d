/**
 * "Not ready to submit": every problem of a draft (numbers the editor cannot read, and what the
 * server found on the last save) as a list in the order of the form, each saying where it is in
 * plain words and which input to take the person to.
 */
import type { FieldError } from "@/lib/errors";
import type { EditorForm } from "./form-model";
import { fieldId, pointRowOf, resolveFieldPointer, SECTIONS, sectionAnchor, sectionOf } from "./pointers";

export interface ReadinessItem {
  pointer: string;
  /** Where the problem is, e.g. "Rate constants, row 4, k". */
  where: string;
  message: string;
  /** The element to focus (an input's id, else its section's anchor); null for the document as a whole. */
  targetId: string | null;
  /** The data row to bring on screen first, for rows outside the table's window. */
  row: number | null;
}

/** Singular words for the items of the document's lists. */
const ITEM_WORDS: Record<string, string> = {
  points: "row",
  reactants: "reactant",
  products: "product",
  creators: "person",
  funding: "grant",
  relatedIdentifiers: "linked record",
  author: "author",
  keywords: "keyword",
};

/** Plain names of fields whose property names are not words. */
const FIELD_WORDS: Record<string, string> = {
  title: "title",
  description: "description",
  keywords: "keywords",
  license: "licence",
  smiles: "SMILES",
  inchi: "InChI",
  coefficient: "coefficient",
  uncertainty: "uncertainty",
  bathGas: "bath gas",
  productsUnknown: "products not identified",
  EaUnit: "unit of Ea",
  Tmin: "valid from",
  Tmax: "valid up to",
  rangeUnit: "unit of the valid range",
  doi: "DOI",
  locator: "pages or article number",
  "container-title": "journal",
  issued: "year",
  awardId: "award number",
  awardTitle: "award title",
  orcid: "ORCID",
  k: "k",
  T: "T",
  // The data section's table itself: its section title says enough.
  points: "",
};

const unescape = (segment: string) => segment.replace(/~1/g, "/").replace(/~0/g, "~");

/** "/points/3/k" → "Rate constants, row 4, k"; "" → "The document as a whole". */
export function describeWhere(pointer: string): string {
  const section = sectionOf(pointer);
  const title = SECTIONS.find((s) => s.id === section)?.title ?? "The document as a whole";
  const segments = pointer.split("/").slice(1).map(unescape);
  const words: string[] = [];
  for (let i = 0; i < segments.length; i++) {
    const s = segments[i];
    const next = segments[i + 1];
    if (next !== undefined && /^\d+$/.test(next) && ITEM_WORDS[s]) {
      words.push(`${ITEM_WORDS[s]} ${Number(next) + 1}`);
      i++;
    } else if (i === segments.length - 1 || !["reaction", "method", "conditions", "units", "source", "reportedFit"].includes(s)) {
      words.push(FIELD_WORDS[s] ?? s);
    }
  }
  return [title, ...words].filter(Boolean).join(", ");
}

const NUMBER_WORDS = ["no", "one", "two", "three", "four", "five", "six", "seven", "eight", "nine", "ten"];
const countWord = (n: number) => NUMBER_WORDS[n] ?? String(n);

/**
 * The schema's length rules in plain words for the list (the list already says where):
 * "Technique must be at least 2 characters long (got "")" → "Write at least two characters.",
 * "Points must have at least 2 entries (it has 0)" → "Add at least two rows." Other messages are kept.
 */
export function plainMessage(pointer: string, message: string): string {
  let m = /must be at least (\d+) characters long \(got .*\)\.?$/.exec(message);
  if (m) return `Write at least ${countWord(Number(m[1]))} characters.`;
  m = /must have at least (\d+) (?:entry|entries) \(it has \d+\)\.?$/.exec(message);
  if (m) {
    const n = Number(m[1]);
    const item = ITEM_WORDS[unescape(pointer.split("/").pop() ?? "")] ?? "entry";
    return `Add at least ${countWord(n)} ${n === 1 ? item : item === "entry" ? "entries" : `${item}s`}.`;
  }
  return message;
}

const sectionRank = (pointer: string) => {
  const i = SECTIONS.findIndex((s) => s.id === sectionOf(pointer));
  return i < 0 ? -1 : i;
};

/** The problems of a draft in the order of the form (the document as a whole first), each once. */
export function readinessItems(errors: FieldError[], form: EditorForm): ReadinessItem[] {
  const seen = new Set<string>();
  const items: ReadinessItem[] = [];
  errors.forEach((e) => {
    const key = `${e.pointer}\n${e.message}`;
    if (seen.has(key)) return;
    seen.add(key);
    const field = resolveFieldPointer(e.pointer, form);
    const section = sectionOf(e.pointer);
    items.push({
      pointer: e.pointer,
      where: describeWhere(e.pointer),
      message: plainMessage(e.pointer, e.message),
      targetId: field !== null ? fieldId(field) : section ? sectionAnchor(section) : null,
      row: field !== null ? pointRowOf(field) : null,
    });
  });
  // A stable sort: within a section, problems keep the order they were found in.
  return items.sort((a, b) => sectionRank(a.pointer) - sectionRank(b.pointer));
}
