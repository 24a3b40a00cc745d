import { parseIdentifier } from "@/lib/identifiers/series-code";
/**
 * What the search text means, before any database is asked (pure). `parseQueryText` splits the
 * text into a shape — everything, free text, a species term, a reaction pattern, a reaction key —
 * and says, for each species term, which readings it may have; lib/search/resolve-query.ts then
 * looks the terms up (names, formulas, InChIKeys) and canonicalises structures with RDKit.
 *
 * Rules, in order:
 * 1. "" → everything.
 * 2. A reaction key as this repository writes them (InChIKeys joined by "+", sides by ">>") → that reaction.
 * 3. An arrow ("->", "→", "=>", "<=>", "⇌", or "=" with spaces around it) → a reaction pattern:
 *    reactant terms on the left, product terms on the right; "*" on a side (or nothing right of the
 *    arrow) means "anything else there".
 * 4. Terms joined by "+" → a pattern of reactants only, any products ("OH + CH4", "OH+CH4"; "OH + *" =
 *    every reaction of OH). A plus inside brackets or at a term's end is a charge ("[O+]", "C+").
 *    A term's leading count is its coefficient ("2 CH3", "2CH3" → CH3).
 * 5. One term without spaces → a species term; text with spaces is a species only when it is a
 *    name ("nitric oxide"); anything that names no species → free text. A pattern (3, 4) with a term
 *    that names no species is free text too, the whole text ("Tanaka OH + methane 2019").
 *
 * Subscript and superscript digits and signs are read as the plain ones ("CH₄" = CH4, "O(¹D)" = O(1D)).
 *
 * Ambiguity: a term is read every way it can be (a name or synonym, a Hill formula — also written
 * in another order, "OH" = HO, or in lower case, "ch4" —, a SMILES, an InChI, an InChIKey) and the readings are united:
 * "C" is both the SMILES of methane and the formula of a carbon atom, so it finds both. A term that
 * can only be a structure (InChI=…, or SMILES punctuation such as brackets, "=", "#", "@", with no
 * letter outside brackets that a SMILES cannot write there) and does not parse is an error for the
 * reader, never silently free text; "O(1D)", "k(T)" or "RRKM/master", whose letters no SMILES writes
 * so, are words.
 */

export type QueryShape =
  | { kind: "all" }
  /** `name`: the whole text may still be one species' name with spaces ("nitric oxide"), tried first. */
  | { kind: "text"; text: string; name: SpeciesTerm }
  | { kind: "species"; term: SpeciesTerm }
  | { kind: "reaction"; reactants: SpeciesTerm[]; products: SpeciesTerm[]; otherReactants: boolean }
  | { kind: "reactionKey"; key: string };

/** One species term and the readings it may have. */
export interface SpeciesTerm {
  /** As typed. */
  text: string;
  /** May be a name or synonym (looked up case-insensitively). */
  name: boolean;
  /** The Hill formula the text reads as, when it reads as a formula ("OH" → "HO"). */
  formula: string | null;
  /** May be a SMILES (RDKit decides). */
  smiles: boolean;
  /** Looks like a structure only (SMILES punctuation): a parse failure is the reader's error. */
  structureOnly: boolean;
  /** "InChI=…": only an InChI. */
  inchi: boolean;
  /** A standard InChIKey. */
  inchiKey: boolean;
}

const INCHI_KEY = /^[A-Z]{14}-[A-Z]{10}-[A-Z]$/;
const REACTION_KEY =
  /^(\d+(\.\d+)?\*)?[A-Z]{14}-[A-Z]{10}-[A-Z](\+(\d+(\.\d+)?\*)?[A-Z]{14}-[A-Z]{10}-[A-Z])*>>(\*|(\d+(\.\d+)?\*)?[A-Z]{14}-[A-Z]{10}-[A-Z](\+(\d+(\.\d+)?\*)?[A-Z]{14}-[A-Z]{10}-[A-Z])*)$/;
const ARROW = /\s*(?:<=>|->|→|⇌|=>)\s*|\s+=\s+/;
// Subscript and superscript characters as typed by those who copy a formula from a page.
const SCRIPT_CHARACTERS: Record<string, string> = Object.fromEntries([
  ..."₀₁₂₃₄₅₆₇₈₉".split("").map((c, i) => [c, String(i)]),
  ..."⁰¹²³⁴⁵⁶⁷⁸⁹".split("").map((c, i) => [c, String(i)]),
  ["₊", "+"],
  ["⁺", "+"],
  ["₋", "-"],
  ["⁻", "-"],
]);
const SCRIPTS = new RegExp(`[${Object.keys(SCRIPT_CHARACTERS).join("")}]`, "g");

/** The text with subscript and superscript digits and signs written plainly ("CH₄" → "CH4"). */
export function plainScripts(text: string): string {
  return text.replace(SCRIPTS, (c) => SCRIPT_CHARACTERS[c]);
}
// Characters a SMILES may hold; anything else (a space, a comma, a letter like "j") is not one.
const SMILES_CHARS = /^[A-Za-z0-9@+\-[\]()=#$%/\\.:*]+$/;
// Outside bracket atoms a SMILES writes only the organic subset (B C N O P S F Cl Br I, aromatic b c n o p s)
// and punctuation: a plain word like "hydroxyl" or "CH4" is no SMILES, and RDKit is not asked.
const ORGANIC_SUBSET_ONLY = /^(?:Cl|Br|[BCNOPSFI]|[bcnops]|[^A-Za-z])*$/;

/** True when `text` (SMILES characters only) could be a SMILES by its atoms outside brackets. */
export function mayBeSmiles(text: string): boolean {
  const outside = text.replace(/\[[^\]]*\]/g, "");
  return !/[[\]]/.test(outside) && ORGANIC_SUBSET_ONLY.test(outside);
}

// Punctuation only a structure has: a term with these is not a name or a formula.
const STRUCTURE_PUNCTUATION = /[[\]()=#@/\\$%]/;
// Element symbols a formula may use (two-letter ones first so "Cl" is not C + l).
const FORMULA = /^(?:[A-Z][a-z]?\d*)+$/;
const ELEMENT = /([A-Z][a-z]?)(\d*)/g;
const KNOWN_ELEMENTS = new Set(
  "H He Li Be B C N O F Ne Na Mg Al Si P S Cl Ar K Ca Sc Ti V Cr Mn Fe Co Ni Cu Zn Ga Ge As Se Br Kr Rb Sr Y Zr Nb Mo Tc Ru Rh Pd Ag Cd In Sn Sb Te I Xe Cs Ba La Ce Pr Nd Pm Sm Eu Gd Tb Dy Ho Er Tm Yb Lu Hf Ta W Re Os Ir Pt Au Hg Tl Pb Bi Po At Rn".split(
    " ",
  ),
);

/** The formula the text reads as, in Hill order (C, H, then alphabetical; without C all alphabetical), or null. */
export function readFormula(text: string): string | null {
  if (!FORMULA.test(text)) return null;
  const counts = new Map<string, number>();
  for (const [, symbol, digits] of text.matchAll(ELEMENT)) {
    if (!KNOWN_ELEMENTS.has(symbol)) return null;
    const n = digits ? Number(digits) : 1;
    if (n === 0) return null;
    counts.set(symbol, (counts.get(symbol) ?? 0) + n);
  }
  const symbols = [...counts.keys()];
  const hasCarbon = counts.has("C");
  const rank = (s: string) => (hasCarbon && s === "C" ? 0 : hasCarbon && s === "H" ? 1 : 2);
  symbols.sort((a, b) => rank(a) - rank(b) || (a < b ? -1 : a > b ? 1 : 0));
  return symbols.map((s) => (counts.get(s) === 1 ? s : `${s}${counts.get(s)}`)).join("");
}

/** The readings of one species term (see the rules above). */
export function readSpeciesTerm(raw: string): SpeciesTerm {
  const text = raw.trim();
  if (text.startsWith("InChI="))
    return { text, name: false, formula: null, smiles: false, structureOnly: true, inchi: true, inchiKey: false };
  if (INCHI_KEY.test(text)) return { text, name: false, formula: null, smiles: false, structureOnly: false, inchi: false, inchiKey: true };
  // Structure punctuation with atoms a SMILES may write: a structure only, so that a malformed one
  // gets RDKit's reason. Letters no SMILES writes outside brackets ("O(1D)", "k(T)", "RRKM/master")
  // make it words.
  const structureOnly = STRUCTURE_PUNCTUATION.test(text) && SMILES_CHARS.test(text) && mayBeSmiles(text);
  return {
    text,
    name: !structureOnly,
    // A formula in lower case ("ch4", "oh") is read in capitals too; "hcl" reads as none.
    formula: structureOnly ? null : (readFormula(text) ?? (/^[a-z0-9]+$/.test(text) ? readFormula(text.toUpperCase()) : null)),
    smiles: !/\s/.test(text) && SMILES_CHARS.test(text) && mayBeSmiles(text),
    structureOnly,
    inchi: false,
    inchiKey: false,
  };
}

/** A reaction side's terms: split at every "+" outside brackets that has a term on both sides. */
function splitAtPlus(side: string): string[] {
  const parts: string[] = [];
  let depth = 0;
  let start = 0;
  for (let i = 0; i < side.length; i += 1) {
    const c = side[i];
    if (c === "[") depth += 1;
    else if (c === "]") depth = Math.max(0, depth - 1);
    else if (c === "+" && depth === 0 && side.slice(start, i).trim() && side.slice(i + 1).trim() && !/^\s*[+\]]/.test(side.slice(i + 1))) {
      parts.push(side.slice(start, i));
      start = i + 1;
    }
  }
  parts.push(side.slice(start));
  return parts;
}

/** A term without its leading count ("2 CH3", "2CH3" → "CH3"). */
const withoutCoefficient = (term: string) => term.replace(/^\d+\s*(?=[A-Za-z[(*])/, "");

function termsOf(side: string): { terms: SpeciesTerm[]; wildcard: boolean } {
  const parts = splitAtPlus(side)
    .map((p) => withoutCoefficient(p.trim()))
    .filter(Boolean);
  return { terms: parts.filter((p) => p !== "*").map(readSpeciesTerm), wildcard: parts.includes("*") || parts.length === 0 };
}

/**
 * The identifier of this repository the whole search text is (a version's or a dataset's DOI, with
 * or without "doi:" or the resolver's address), normalised; null for anything else — a paper's DOI is searched as words.
 */
export function repositoryIdentifierIn(q: string): string | null {
  const text = q.trim();
  if (!/^(doi:\s*|https?:\/\/(dx\.)?doi\.org\/)?10\.\d{4,9}\//i.test(text)) return null;
  const parsed = parseIdentifier(text);
  return parsed.ok ? parsed.identifier : null;
}

/** The shape of the search text (rules at the top of this file). */
export function parseQueryText(q: string): QueryShape {
  const text = plainScripts(q.trim());
  if (!text) return { kind: "all" };
  if (REACTION_KEY.test(text)) return { kind: "reactionKey", key: text };
  // An arrow splits once; "=>" inside a SMILES cannot occur ("=" then ">" is not SMILES).
  const arrow = ARROW.exec(text);
  if (arrow) {
    const left = termsOf(text.slice(0, arrow.index));
    const right = termsOf(text.slice(arrow.index + arrow[0].length));
    if (left.terms.length || right.terms.length) {
      return { kind: "reaction", reactants: left.terms, products: right.terms, otherReactants: left.wildcard || left.terms.length === 0 };
    }
  }
  if (splitAtPlus(text).length > 1) {
    const { terms, wildcard } = termsOf(text);
    if (terms.length) return { kind: "reaction", reactants: terms, products: [], otherReactants: wildcard };
  }
  if (!/\s/.test(text)) return { kind: "species", term: readSpeciesTerm(text) };
  return { kind: "text", text, name: readSpeciesTerm(text) };
}

/** How the search text is read, in words, as /docs/api publishes them; keep them true to the code above. */
export const SEARCH_QUERY_RULES: readonly string[] = [
  "Nothing typed: every published dataset.",
  "A reaction key (InChIKeys joined by `+`, the sides by `>>`): that reaction.",
  "An arrow (`->`, `→`, `=>`, `<=>`, `⇌`, or `=` with spaces around it): a reaction pattern, reactants on the left, products on the right: `CH4 -> CH3` finds reactions with methane among the reactants and methyl among the products. A side with `*` or nothing means anything there.",
  "Terms joined by `+` (with or without spaces; a plus inside brackets or ending a term is a charge): reactants only, in any order, any products: `OH + CH4` or `OH+CH4`; `OH + *` finds every reaction with OH among the reactants. A term's leading count is its coefficient (`2 CH3`).",
  "Subscript and superscript digits read as plain ones (`CH₄` = `CH4`).",
  "One species: a name or synonym (any case), a formula (Hill order or another: `OH` reads as HO; in lower case too: `ch4`), a SMILES (`C`), an InChI (`InChI=1S/CH4/h1H4`) or an InChIKey. SMILES and InChI are canonicalised and matched by InChIKey; a term is read every way it can be and the readings are united (`C` is methane's SMILES and a carbon atom's formula). Datasets whose reaction has the species on either side match.",
  "Anything else is free text over titles, equations, species names and formulas (weighted most), keywords, creators and technique, then descriptions and source references, with English word stemming; a name misspelt by a letter or two still matches.",
  "A term that can only be a structure (an InChI, or a SMILES with brackets, `=`, `#`, `@` and only atoms a SMILES writes there) and cannot be read is refused with 400 naming `q`; `O(1D)` or `k(T)`, whose letters no SMILES writes so, are words.",
];
