import "server-only";
import { ChemError, describeSpecies } from "@/lib/chem";
import { AppError } from "@/lib/errors";
import { parseQueryText, repositoryIdentifierIn, type SpeciesTerm } from "./parse-query";
import { findSpeciesKeysIn, speciesLexicon, type SpeciesLexicon } from "./lexicon";
import type { ParsedQuery } from "./types";

/** A 400 about the search text, naming `q`. */
function badQuery(message: string): AppError {
  return new AppError("bad_request", message, [{ pointer: "/q", parameter: "q", message }]);
}

/** The structure a term spells, by RDKit: its InChIKey, null when it is not one; throws when it can only be one and is malformed. */
async function structureKey(term: SpeciesTerm, hasOtherReadings: boolean): Promise<string | null> {
  if (!term.smiles && !term.inchi) return null;
  try {
    const identity = await describeSpecies(term.inchi ? { inchi: term.text } : { smiles: term.text });
    return identity.inchiKey;
  } catch (err) {
    if (!(err instanceof ChemError)) throw err;
    if (term.inchi) throw badQuery(`q: ${err.message}`);
    if (term.structureOnly && !hasOtherReadings)
      throw badQuery(`q: “${term.text}” looks like a SMILES but is not a valid one: ${err.message}`);
    return null;
  }
}

/** Every InChIKey one term may mean: the union of its readings (parse-query.ts says why). */
async function resolveTerms(lexicon: SpeciesLexicon, terms: SpeciesTerm[]): Promise<string[][]> {
  const found = findSpeciesKeysIn(lexicon, {
    names: terms.filter((t) => t.name).map((t) => t.text),
    formulas: terms.map((t) => t.formula).filter((f): f is string => f !== null),
  });
  const out: string[][] = [];
  for (const term of terms) {
    const keys = new Set<string>([
      ...(found.get(`name:${term.text}`) ?? []),
      ...(term.formula ? (found.get(`formula:${term.formula}`) ?? []) : []),
    ]);
    if (term.inchiKey) keys.add(term.text);
    const structure = await structureKey(term, keys.size > 0);
    if (structure) keys.add(structure);
    out.push([...keys].sort());
  }
  return out;
}

const quote = (s: string) => `“${s}”`;

function listWords(items: string[]): string {
  return items.length <= 1 ? (items[0] ?? "") : `${items.slice(0, -1).join(", ")} and ${items[items.length - 1]}`;
}

/**
 * The search text, understood: the parsed query engines take, and what was understood in words
 * (shown above the results and returned by the API). A malformed SMILES or InChI is a 400 naming `q`.
 */
export async function resolveQuery(q: string): Promise<{ parsed: ParsedQuery; words: string }> {
  // An identifier of this repository pasted as it is printed: /search opens it (app/search/page.tsx); the API says where.
  const identifier = repositoryIdentifierIn(q);
  if (identifier)
    throw badQuery(`q: “${q.trim()}” is an identifier of this repository, not a search: /id/${identifier} opens what it names`);
  const shape = parseQueryText(q);
  switch (shape.kind) {
    case "all":
      return { parsed: { kind: "all" }, words: "Every published dataset" };
    case "reactionKey":
      return { parsed: shape, words: `The reaction with the key ${shape.key}` };
    case "text": {
      const lexicon = await speciesLexicon();
      const [keys] = await resolveTerms(lexicon, [{ ...shape.name, smiles: false, formula: null, structureOnly: false }]);
      if (keys.length)
        return { parsed: { kind: "species", term: shape.text, inchiKeys: keys }, words: speciesWords(lexicon, shape.text, keys) };
      return { parsed: { kind: "text", text: shape.text }, words: `Text ${quote(shape.text)}` };
    }
    case "species": {
      const lexicon = await speciesLexicon();
      const [keys] = await resolveTerms(lexicon, [shape.term]);
      if (!keys.length) return { parsed: { kind: "text", text: shape.term.text }, words: `Text ${quote(shape.term.text)}` };
      return { parsed: { kind: "species", term: shape.term.text, inchiKeys: keys }, words: speciesWords(lexicon, shape.term.text, keys) };
    }
    case "reaction": {
      const lexicon = await speciesLexicon();
      const reactants = await resolveTerms(lexicon, shape.reactants);
      const products = await resolveTerms(lexicon, shape.products);
      const unknown = [...shape.reactants, ...shape.products]
        .filter((_, i) => [...reactants, ...products][i].length === 0)
        .map((t) => quote(t.text));
      // A term that names no species ("NewUser test OH + methane") makes the pattern a title's words, not a reaction.
      if (unknown.length) {
        const text = q.trim();
        return {
          parsed: { kind: "text", text },
          words: `Text ${quote(text)} (${listWords(unknown)} ${unknown.length === 1 ? "names" : "name"} no species here, so the words are searched)`,
        };
      }
      const r = shape.reactants.map((t) => quote(t.text));
      const p = shape.products.map((t) => quote(t.text));
      let words = r.length
        ? // "Among": other reactants are allowed whether or not "*" was written ("CH4 -> *" finds OH + CH4 too).
          `Reactions with ${listWords(r)} among the reactants, others allowed`
        : "Reactions";
      words += p.length ? `${r.length ? " and" : " with"} ${listWords(p)} among the products` : ", any products";
      return { parsed: { kind: "reaction", reactants, products, otherReactants: shape.otherReactants }, words };
    }
  }
}

/** A species known only from drafts has no display name here (the lexicon holds public species only): its key shows. */
function speciesWords(lexicon: SpeciesLexicon, term: string, keys: string[]): string {
  const shown = keys.map((k) => lexicon.displayName.get(k) ?? k);
  return `Datasets with ${quote(term)} on either side of the reaction (${keys.length === 1 ? shown[0] : `${keys.length} species: ${listWords(shown)}`})`;
}
