/**
 * From the JSON pointer of a problem (server or editor) to the place the editor shows it: the
 * input at that pointer, else the nearest enclosing one the editor renders ("/points/3/uncertainty/value"
 * → the uncertainty cell of row 4), else nowhere — then it belongs in the summary at the top.
 */
import type { FieldError } from "@/lib/errors";
import type { EditorForm } from "./form-model";
import { plainBeside } from "./editor-messages";

export type SectionId = "about" | "reaction" | "method" | "conditions" | "data" | "fit" | "source" | "credit";

export const SECTIONS: { id: SectionId; title: string }[] = [
  { id: "about", title: "Title and summary" },
  { id: "reaction", title: "Reaction" },
  { id: "method", title: "How k was obtained" },
  { id: "conditions", title: "Conditions" },
  { id: "data", title: "Rate constants" },
  { id: "fit", title: "The authors' expression" },
  { id: "source", title: "Where the numbers were published" },
  { id: "credit", title: "People, grants and links" },
];

/** The element id of the input for a pointer: "/reaction/reactants/0/smiles" → "field-reaction-reactants-0-smiles". */
export function fieldId(pointer: string): string {
  return `field${pointer.replace(/[^A-Za-z0-9]+/g, "-")}`;
}

export function sectionAnchor(section: SectionId): string {
  return `section-${section}`;
}

type Rule = [RegExp, (form: EditorForm, m: RegExpExecArray) => boolean];

const always = () => true;
const within =
  (list: (f: EditorForm, m: RegExpExecArray) => unknown[], group = 1) =>
  (f: EditorForm, m: RegExpExecArray) =>
    Number(m[group]) < list(f, m).length;
const anyPointPressure = (f: EditorForm) => f.points.some((p) => p.pressure.trim() !== "");

/** Every pointer the editor renders an input (or a group message) for, and when it is on screen. */
const RULES: Rule[] = [
  [/^\/(title|description|keywords|license|creators)$/, always],
  [/^\/creators\/(\d+)\/(name|orcid|affiliation)$/, within((f) => f.creators)],
  [/^\/funding\/(\d+)\/(funder|awardId|awardTitle)$/, within((f) => f.funding)],
  [/^\/reaction\/(reactants|products)$/, always],
  [
    /^\/reaction\/(reactants|products)\/(\d+)\/(name|smiles|inchi|coefficient)$/,
    within((f, m) => f.reaction[m[1] as "reactants" | "products"], 2),
  ],
  [/^\/reaction\/productsUnknown\/reason$/, (f) => f.reaction.productsUnknown],
  [/^\/reaction\/(class|order|phase)$/, always],
  [/^\/reaction\/solvent\/(name|smiles|inchi)$/, (f) => f.reaction.phase === "liquid"],
  [/^\/reaction\/surface$/, (f) => f.reaction.phase === "surface"],
  [/^\/method\/(category|technique|detection|notes)$/, always],
  [/^\/conditions\/pressure$/, (f) => f.conditions.pressureMode !== "none"],
  [/^\/conditions\/pressure\/value$/, (f) => f.conditions.pressureMode === "single"],
  [/^\/conditions\/pressure\/(min|max)$/, (f) => f.conditions.pressureMode === "range"],
  [/^\/conditions\/(bathGas|notes)$/, always],
  [/^\/units\/pressure$/, (f) => f.conditions.pressureMode !== "none" || anyPointPressure(f)],
  [/^\/units\/(k|T)$/, always],
  [/^\/points$/, always],
  [/^\/points\/(\d+)(\/(T|k|uncertainty|note|pressure|bathGas))?$/, within((f) => f.points)],
  [/^\/reportedFit(\/(model|A|Ea|EaUnit|Tmin|Tmax|rangeUnit))?$/, (f) => f.reportedFit.enabled],
  [/^\/reportedFit\/n$/, (f) => f.reportedFit.enabled && f.reportedFit.model === "modified_arrhenius"],
  [/^\/reportedFit\/T0$/, (f) => f.reportedFit.enabled && (f.reportedFit.model === "modified_arrhenius" || f.reportedFit.T0.trim() !== "")],
  [/^\/source\/(doi|locator)$/, always],
  [/^\/source\/reference\/(type|title|author|container-title|issued)$/, always],
  [/^\/relatedIdentifiers\/(\d+)\/(kind|identifier|relation)$/, within((f) => f.relatedIdentifiers)],
];

/** Where a problem about a whole group is best shown: "needs a SMILES or an InChI" beside the SMILES. */
function alias(pointer: string): string | undefined {
  let m: RegExpExecArray | null;
  if ((m = /^\/reaction\/(reactants|products)\/(\d+)$/.exec(pointer))) return `${pointer}/smiles`;
  if ((m = /^\/(creators|funding|relatedIdentifiers)\/(\d+)$/.exec(pointer)))
    return `${pointer}/${m[1] === "creators" ? "name" : m[1] === "funding" ? "funder" : "identifier"}`;
  switch (pointer) {
    case "/source":
      return "/source/doi";
    case "/source/reference":
      return "/source/reference/title";
    case "/reaction/solvent":
      return "/reaction/solvent/name";
    case "/reaction/productsUnknown":
      return "/reaction/productsUnknown/reason";
    case "/units":
      return "/units/k";
  }
  return undefined;
}

function rendered(pointer: string, form: EditorForm): boolean {
  for (const [re, visible] of RULES) {
    const m = re.exec(pointer);
    if (m) return visible(form, m);
  }
  return false;
}

/** The pointer of the input (or group) that shows a problem at `pointer`, or null when none does. */
export function resolveFieldPointer(pointer: string, form: EditorForm): string | null {
  let p = pointer;
  while (p !== "") {
    const a = alias(p);
    if (a && rendered(a, form)) return a;
    if (rendered(p, form)) return p;
    p = p.slice(0, p.lastIndexOf("/"));
  }
  return null;
}

/** The section a pointer belongs to; null for the document as a whole. */
export function sectionOf(pointer: string): SectionId | null {
  const [, first, second] = pointer.split("/");
  switch (first) {
    case "title":
    case "description":
    case "keywords":
    case "license":
      return "about";
    case "creators":
    case "funding":
    case "relatedIdentifiers":
      return "credit";
    case "reaction":
      return "reaction";
    case "method":
      return "method";
    case "conditions":
      return "conditions";
    case "units":
      return second === "pressure" ? "conditions" : "data";
    case "points":
      return "data";
    case "reportedFit":
      return "fit";
    case "source":
      return "source";
    default:
      return null;
  }
}

/** Zero-based row of a pointer into the points ("/points/3/k" → 3), or null. */
export function pointRowOf(pointer: string): number | null {
  const m = /^\/points\/(\d+)(\/|$)/.exec(pointer);
  return m ? Number(m[1]) : null;
}

export interface GroupedErrors {
  /** Messages by the pointer of the input that shows them. */
  byField: Map<string, string[]>;
  /** Problems no input shows, with their section (null: the document as a whole). */
  unplaced: { error: FieldError; section: SectionId | null }[];
}

/** Sorts problems into "beside an input" and "in the summary"; the same message is kept once per place. */
export function groupErrors(errors: FieldError[], form: EditorForm): GroupedErrors {
  const byField = new Map<string, string[]>();
  const unplaced: GroupedErrors["unplaced"] = [];
  for (const error of errors) {
    const field = resolveFieldPointer(error.pointer, form);
    if (field === null) {
      unplaced.push({ error, section: sectionOf(error.pointer) });
      continue;
    }
    // Beside the input, in the form's words with the row and field it is about (editor-messages.ts).
    const message = plainBeside(error.pointer, error.message);
    const list = byField.get(field) ?? [];
    if (!list.includes(message)) list.push(message);
    byField.set(field, list);
  }
  return { byField, unplaced };
}

/**
 * Every problem the editor shows, each once: the form's own (a number it cannot read), the last
 * save's (schema and checks) and the stored checks that block submission. The server reads an
 * unreadable cell as text and says "must be a number" at the same pointer; the form already said
 * what is wrong there, in more words, so the server's is left out.
 */
export function mergeProblems(local: FieldError[], server: FieldError[], checks: FieldError[] = []): FieldError[] {
  const own = new Set(local.map((e) => e.pointer));
  // The pointer or any pointer it lies within (/points/2/uncertainty/value within /points/2/uncertainty).
  const reported = (pointer: string) => {
    for (let p = pointer; p; p = p.slice(0, p.lastIndexOf("/"))) if (own.has(p)) return true;
    return false;
  };
  const kept = own.size ? server.filter((e) => !reported(e.pointer)) : server;
  return [...local, ...kept, ...checks];
}

/** Whether a problem shown at `field` is about the value at `pointer` or inside it (edits clear those). */
export function isWithin(field: string, pointer: string): boolean {
  return field === pointer || field.startsWith(`${pointer}/`);
}
