/**
 * "Not ready to submit": every problem of a draft (numbers the editor cannot read, and what the
 * server found on the last save) as a list in the order of the form, each saying where it is in
 * plain words and which input to take the person to.
 */
import type { FieldError } from "@/lib/errors";
import { plainWhat, whereInSection } from "./editor-messages";
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

/** "/points/3/k" → "Rate constants, row 4, k"; "" → "The document as a whole". */
export function describeWhere(pointer: string): string {
  const section = sectionOf(pointer);
  const title = SECTIONS.find((s) => s.id === section)?.title ?? "The document as a whole";
  return [title, whereInSection(pointer)].filter(Boolean).join(", ");
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
      message: plainWhat(e.pointer, e.message),
      targetId: field !== null ? fieldId(field) : section ? sectionAnchor(section) : null,
      row: field !== null ? pointRowOf(field) : null,
    });
  });
  // A stable sort: within a section, problems keep the order they were found in.
  return items.sort((a, b) => sectionRank(a.pointer) - sectionRank(b.pointer));
}
