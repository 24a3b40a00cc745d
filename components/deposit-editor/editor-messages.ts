/**
 * THE translation of problems into the editor's words. Problems reach the editor from the deposit
 * schema (ajv, through lib/deposits/translate-errors.ts: "Points must have at least 2 entries (it
 * has 1)."), from zod at the API (POST /api/v1/analyses: "at least two points are needed"), from the
 * semantic checks and from the form's own number reading. Each keeps its JSON pointer; its text is
 * put here into the words of the form the person sees: rows (not "points" or "entries"), the
 * field's own name, and where it is (section, row, field).
 */
import type { FieldError } from "@/lib/errors";
import { describePointer, lowerFirst, upperFirst } from "@/lib/deposits/messages";
import { OTHER_CONDITIONS_LABEL } from "@/lib/deposits/field-labels";

/** Singular words for the items of the document's lists, as the form names them. */
export const ITEM_WORDS: Record<string, string> = {
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
export const FIELD_WORDS: Record<string, string> = {
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

const NUMBER_WORDS = ["no", "one", "two", "three", "four", "five", "six", "seven", "eight", "nine", "ten"];
const countWord = (n: number) => NUMBER_WORDS[n] ?? n.toLocaleString("en-GB");
const unescape = (segment: string) => segment.replace(/~1/g, "/").replace(/~0/g, "~");
const plural = (item: string, n: number) => (n === 1 ? item : item === "entry" ? "entries" : item === "person" ? "people" : `${item}s`);

/** The list a pointer names (its last segment): "/points" → "row". */
function itemWordAt(pointer: string): string {
  return ITEM_WORDS[unescape(pointer.split("/").pop() ?? "")] ?? "entry";
}

/**
 * The message split into the subject the schema's translation put first and the rest:
 * "Point 7: rate constant must be > 0" → { row: true, predicate: "must be > 0" }; "Points must have …"
 * → { row: false, predicate: "must have …" }; a message without such a subject → { subject: false }.
 */
function splitSubject(pointer: string, message: string): { subject: boolean; row: boolean; predicate: string } {
  const { prefix, label } = describePointer(pointer);
  const withRow = prefix ? [`${prefix}: ${lowerFirst(label)} `, `${prefix}: ${label} `, `${prefix}: `] : [];
  for (const s of withRow) if (message.startsWith(s)) return { subject: true, row: true, predicate: message.slice(s.length) };
  for (const s of [`${label} `, `${lowerFirst(label)} `])
    if (message.startsWith(s)) return { subject: true, row: false, predicate: message.slice(s.length) };
  return { subject: false, row: false, predicate: message };
}

const sentence = (text: string) => (/[.!?]$/.test(text) ? text : `${text}.`);

type Rule = [RegExp, (m: RegExpExecArray, pointer: string) => string];

/** Schema and zod wordings → the form's words. The first that matches wins. */
const RULES: Rule[] = [
  // ajv minItems / maxItems, and zod's array bounds.
  [
    /^must have at least (\d+) (?:entry|entries) \(it has (\d+)\)/,
    (m, p) =>
      `Add at least ${countWord(+m[1])} ${plural(itemWordAt(p), +m[1])} (${+m[2] === 0 ? "there are none yet" : `there ${+m[2] === 1 ? "is" : "are"} ${countWord(+m[2])}`})`,
  ],
  [/^Too small: expected array to have >=?\s*(\d+) items?/i, (m, p) => `Add at least ${countWord(+m[1])} ${plural(itemWordAt(p), +m[1])}`],
  [/^at least two points are needed/i, () => "Add at least two rows with a temperature and a rate constant"],
  [/^must be a list of \{T, k\} points/i, () => "Add at least two rows with a temperature and a rate constant"],
  [
    /^can have at most ([\d,]+) entries \(it has ([\d,]+|more)\)/,
    (m, p) => `Keep at most ${m[1]} ${plural(itemWordAt(p), 2)} (there are ${m[2]}); split the data into several datasets`,
  ],
  [/^at most ([\d,]+) points per request/i, (m) => `Keep at most ${m[1]} rows to see the fit while typing; saving still works`],
  // Lengths of text.
  [/^must be at least (\d+) characters long \(got .*\)/, (m) => `Write at least ${countWord(+m[1])} characters`],
  [/^must not be empty/, () => "Write something here"],
  [/^must contain a character other than spaces/, () => "Write something other than spaces"],
  // zod's generic words.
  [/^Invalid input: expected number, received (\w+)/i, () => "Write a number here"],
  [/^Invalid input: expected string, received (\w+)/i, () => "Write text here"],
  [/^Too small: expected number to be >(=?)\s*(-?[\d.e+-]+)/i, (m) => `Write a number ${m[1] ? "of at least" : "greater than"} ${m[2]}`],
  [/^Too big: expected number to be <(=?)\s*(-?[\d.e+-]+)/i, (m) => `Write a number ${m[1] ? "of at most" : "less than"} ${m[2]}`],
  [/^must be a (?:finite )?number/i, () => "Write a number here"],
  [/^unexpected property “(.*)”/, (m) => `“${m[1]}” is not part of the deposit format; remove it`],
  [/^Invalid option: expected one of (.*)$/i, (m) => `Choose one of ${m[1].replace(/\|/g, ", ")}`],
];

/** The rule sentence for a predicate, or null when no rule knows it. */
function ruleSentence(pointer: string, predicate: string): string | null {
  for (const [pattern, say] of RULES) {
    const m = pattern.exec(predicate);
    if (m) return sentence(say(m, pointer));
  }
  return null;
}

/**
 * What is wrong, in the form's words, for a list that says where beside it:
 * "Points must have at least 2 entries (it has 1)." at /points → "Add at least two rows (there is one)."
 * A field's own sentence ("Title is too short.") is kept; a row's subject ("Point 7: rate constant")
 * is left to the where.
 */
export function plainWhat(pointer: string, message: string): string {
  const { subject, row, predicate } = splitSubject(pointer, message.trim());
  const rule = ruleSentence(pointer, predicate);
  if (rule) return rule;
  if (subject && !row) return sentence(message.trim());
  return sentence(upperFirst(predicate));
}

/**
 * Fields whose own name alone would mislead, by their path (list positions as "*"): the words for
 * that field, standing for every segment after the last list item ("units/pressure" is the pressure
 * unit, not the pressure; "conditions/pressure/value" a pressure value).
 */
const PATH_WORDS: Record<string, string> = {
  $schema: "deposit format version",
  "units/k": "rate-constant unit",
  "units/T": "temperature unit",
  "units/pressure": "pressure unit",
  "conditions/pressure": "pressure",
  "conditions/pressure/value": "pressure value",
  "conditions/pressure/min": "lowest pressure",
  "conditions/pressure/max": "highest pressure",
  "conditions/notes": lowerFirst(OTHER_CONDITIONS_LABEL),
  "method/notes": "notes on the method",
  "reaction/class": "reaction class",
  "reaction/order": "reaction order",
  "reaction/solvent/name": "solvent name",
  "reaction/solvent/smiles": "solvent SMILES",
  "reaction/solvent/inchi": "solvent InChI",
  "reaction/productsUnknown/reason": "why the products are not identified",
  "points/*/T": "T",
  "points/*/k": "k",
  "points/*/uncertainty": "uncertainty",
  "points/*/uncertainty/value": "uncertainty",
  "points/*/uncertainty/kind": "uncertainty stated as",
  "points/*/uncertainty/confidence": "what the uncertainty covers",
  "reportedFit/model": "model",
  "source/reference/type": "kind of publication",
  "source/reference/title": "title of the publication",
  "source/reference/issued": "year",
  "source/reference/author/*/family": "family name",
  "source/reference/author/*/given": "given names",
  "source/reference/author/*/literal": "name (an organisation)",
  "relatedIdentifiers/*/kind": "kind of identifier",
  "relatedIdentifiers/*/relation": "how it is related",
};

/** Segments that only group fields (their section already says it). */
const GROUPS = ["reaction", "method", "conditions", "units", "source", "reportedFit"];

/**
 * Where inside its section a pointer is, in the form's words: "/points/3/k" → "row 4, k";
 * "/creators/2/orcid" → "person 3, ORCID"; "/units/pressure" → "pressure unit"; the section's own
 * list ("/points") → "".
 */
export function whereInSection(pointer: string): string {
  const segments = pointer.split("/").slice(1).map(unescape);
  const words: string[] = [];
  const generic: string[] = [];
  let groupStart = 0;
  for (let i = 0; i < segments.length; i++) {
    const s = segments[i];
    const next = segments[i + 1];
    generic.push(/^\d+$/.test(s) ? "*" : s);
    if (next !== undefined && /^\d+$/.test(next) && ITEM_WORDS[s]) {
      words.push(`${ITEM_WORDS[s]} ${Number(next) + 1}`);
      generic.push("*");
      groupStart = words.length;
      i++;
      continue;
    }
    const named = PATH_WORDS[generic.join("/")];
    if (named !== undefined) {
      // The whole field from the last list item on, and nothing deeper (a year's date-parts, say).
      words.splice(groupStart, words.length - groupStart, named);
      if (!Object.keys(PATH_WORDS).some((k) => k.startsWith(`${generic.join("/")}/`))) break;
      continue;
    }
    if (i === segments.length - 1 || !GROUPS.includes(s)) words.push(FIELD_WORDS[s] ?? s);
  }
  return words.filter(Boolean).join(", ");
}

/**
 * A problem shown beside its input or row: where (row, field) and what, one sentence:
 * "Point 7: rate constant must be greater than 0 (got -1)." at /points/6/k → "Row 7, k: must be greater than 0 (got -1)."
 */
export function plainBeside(pointer: string, message: string): string {
  const where = upperFirst(whereInSection(pointer));
  const { subject, row, predicate } = splitSubject(pointer, message.trim());
  const rule = ruleSentence(pointer, predicate);
  if (rule) return where ? `${where}: ${lowerFirst(rule)}` : rule;
  // "Title is too short." beside the title already says what and where.
  if (subject && !row) return sentence(message.trim());
  return where ? sentence(`${where}: ${predicate}`) : sentence(upperFirst(predicate));
}

/** The same error with its text translated; the pointer is kept as it came. */
export function plainFieldError(error: FieldError): FieldError {
  return { ...error, message: plainBeside(error.pointer, error.message) };
}
