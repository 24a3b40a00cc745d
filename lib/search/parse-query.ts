/**
 * What the search text means, before any database is asked (pure). `parseQueryText` splits the
 * text into a shape — everything, free text, a species term, a reaction pattern, a reaction key —
 * and says, for each species term, which readings it may have; lib/search/resolve-query.ts then
 * looks the terms up (names, formulas, InChIKeys) and canonicalises structures with RDKit.
 *
 * Rules, in order:
 * 1. "" → everything.
 * 2. A reaction key as this repository writes them (InChIKeys joined by "+", sides by ">>") → that reaction.
 * 3. An arrow ("->", "→", "=>") → a reaction pattern: reactant terms on the left, product terms on the
 *    right; "*" on a side (or nothing right of the arrow) means "anything else there".
 * 4. Terms joined by " + " (a plus with spaces around it: "[O+]" and "C+" stay one SMILES) → a
 *    pattern of reactants only, any products ("OH + CH4"; "OH + *" = every reaction of OH).
 * 5. One term without spaces → a species term; text with spaces is a species only when it is a
 *    name ("nitric oxide"); anything that names no species → free text. A pattern (3, 4) with a term
 *    that names no species is free text too, the whole text ("Tanaka OH + methane 2019").
 *
 * Ambiguity: a term is read every way it can be (a name or synonym, a Hill formula — also written
 * in another order, "OH" = HO —, a SMILES, an InChI, an InChIKey) and the readings are united:
 * "C" is both the SMILES of methane and the formula of a carbon atom, so it finds both. A term that
 * can only be a structure (InChI=…, or SMILES punctuation such as brackets, "=", "#", "@") and does
 * not parse is an error for the reader, never silently free text.
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
const ARROW = /\s*(?:->|→|=>)\s*/;
const PLUS = /\s+\+\s+/;
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
// Two or more words of letters joined by "/" (a technique's "RRKM/master"): text, when no SMILES reads so.
const SLASHED_WORDS = /^[A-Za-z]{2,}(?:\/[A-Za-z]{2,})+$/;
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
  // Words joined by slashes ("RRKM/master", "LIF/PLP") are words, unless they could be a SMILES's atoms.
  const slashedWords = SLASHED_WORDS.test(text) && !mayBeSmiles(text);
  const structureOnly = !slashedWords && STRUCTURE_PUNCTUATION.test(text) && SMILES_CHARS.test(text);
  return {
    text,
    name: !structureOnly,
    formula: structureOnly ? null : readFormula(text),
    // A structure-only term goes to RDKit whatever its letters, so that a malformed one gets RDKit's reason.
    smiles: !/\s/.test(text) && SMILES_CHARS.test(text) && (structureOnly || mayBeSmiles(text)),
    structureOnly,
    inchi: false,
    inchiKey: false,
  };
}

function termsOf(side: string): { terms: SpeciesTerm[]; wildcard: boolean } {
  const parts = side
    .split(PLUS)
    .map((p) => p.trim())
    .filter(Boolean);
  return { terms: parts.filter((p) => p !== "*").map(readSpeciesTerm), wildcard: parts.includes("*") || parts.length === 0 };
}

/** The shape of the search text (rules at the top of this file). */
export function parseQueryText(q: string): QueryShape {
  const text = q.trim();
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
  if (PLUS.test(` ${text} `) && text.split(PLUS).length > 1) {
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
  "An arrow (`->`, `→` or `=>`): a reaction pattern, reactants on the left, products on the right: `CH4 -> CH3` finds reactions with methane among the reactants and methyl among the products. A side with `*` or nothing means anything there.",
  "Terms joined by ` + ` (a plus with spaces around it): reactants only, in any order, any products: `OH + CH4`; `OH + *` finds every reaction with OH among the reactants.",
  "One species: a name or synonym (any case), a formula (Hill order or another: `OH` reads as HO), a SMILES (`C`), an InChI (`InChI=1S/CH4/h1H4`) or an InChIKey. SMILES and InChI are canonicalised and matched by InChIKey; a term is read every way it can be and the readings are united (`C` is methane's SMILES and a carbon atom's formula). Datasets whose reaction has the species on either side match.",
  "Anything else is free text over titles, equations, species names and formulas (weighted most), keywords, creators and technique, then descriptions and source references, with English word stemming; a name misspelt by a letter or two still matches.",
  "A term that can only be a structure (an InChI, or a SMILES with brackets, `=`, `#`, `@`) and cannot be read is refused with 400 naming `q`.",
];
