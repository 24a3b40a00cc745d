/**
 * Matching a mechanism to Arrhenia's species and reactions. Species: the person's own choice
 * first, then the name among a species' names (case-insensitive), then the elemental composition
 * (YAML states it; a plain-text name that reads as a formula, such as "CH3" or "H2O2", gives one).
 * Several species with one composition (isomers), or none, is left for the person to choose; so is a composition whose
 * only species is in an excited state (O(1D) for a mechanism's "O"), which no composition can tell from the ground state.
 * Reactions: by reaction key in both directions; only data of the mechanism's forward direction
 * are compared with its forward rate, a reverse-direction reaction is marked.
 */
import { marksExcitedState } from "@/lib/chem/excited-state";
export { marksExcitedState };
import { formatHillFormula } from "@/lib/chem/hill-formula";
import { reactionKey } from "@/lib/chem/reaction-key";
import type { MechanismParticipant, MechanismReaction, ParsedMechanism } from "./types";

/** A species of Arrhenia as matching needs it. */
export interface CatalogueSpecies {
  inchiKey: string;
  formula: string;
  /** Display name first, then the other names it was given. */
  names: string[];
}

export type SpeciesMatchBy = "choice" | "name" | "composition" | "ambiguous" | "none";

export interface SpeciesMatch {
  name: string;
  by: SpeciesMatchBy;
  inchiKey: string | null;
  /** Formula used for the composition match (Hill order), when known. */
  formula: string | null;
  /** The species to choose from when ambiguous (or the one chosen). */
  candidates: { inchiKey: string; formula: string; name: string }[];
}

/**
 * Elements a mechanism written in capitals may spell when it declares none: those of combustion and atmospheric
 * mechanisms (common practice; from memory). Declared elements (an ELEMENTS block) replace them.
 */
const USUAL_MECHANISM_ELEMENTS = ["H", "C", "O", "N", "S", "F", "Cl", "Br", "I", "P", "Si", "B", "Ar", "He", "Ne", "Kr", "Xe"];

/**
 * Element counts from a name that reads as a formula ("CH3", "H2O2", "C2H5OH"); null otherwise. A name in capitals
 * (the classic layout's habit: "HCL", "C2H5CL", "CH2O") is read with the elements the mechanism declares, two-letter
 * symbols first ("CL" is chlorine when Cl is declared; "CO" is carbon and oxygen unless cobalt is).
 */
export function compositionFromName(name: string, elements: readonly string[] | null = null): Record<string, number> | null {
  if (/^(?:[A-Z][a-z]?\d*)+$/.test(name) && !(/^[A-Z\d]+$/.test(name) && /[A-Z]{2}/.test(name))) {
    const out: Record<string, number> = {};
    for (const m of name.matchAll(/([A-Z][a-z]?)(\d*)/g)) out[m[1]] = (out[m[1]] ?? 0) + (m[2] ? Number(m[2]) : 1);
    return out;
  }
  if (!/^[A-Z][A-Z\d]*$/.test(name)) return null;
  const allowed = new Set((elements?.length ? elements : USUAL_MECHANISM_ELEMENTS).map(elementSymbol));
  const read = (at: number): [string, number][] | null => {
    if (at === name.length) return [];
    for (const width of [2, 1]) {
      const symbol = elementSymbol(name.slice(at, at + width));
      if (symbol.length !== width || !allowed.has(symbol)) continue;
      const digits = /^\d*/.exec(name.slice(at + width))![0];
      const rest = read(at + width + digits.length);
      if (rest) return [[symbol, digits ? Number(digits) : 1], ...rest];
    }
    return null;
  };
  const parts = read(0);
  if (!parts || parts.some(([, n]) => n === 0)) return null;
  const out: Record<string, number> = {};
  for (const [symbol, n] of parts) out[symbol] = (out[symbol] ?? 0) + n;
  return out;
}

/** An element symbol as written in formulas: "CL" → "Cl", "c" → "C". */
const elementSymbol = (s: string) => (s.length === 2 ? s[0].toUpperCase() + s[1].toLowerCase() : s.toUpperCase());

/** Hill formula of a composition with element symbols written as mechanisms do (AR, Ar). */
export function hillFormulaOf(composition: Record<string, number>): string {
  const normalised: Record<string, number> = {};
  for (const [symbol, count] of Object.entries(composition)) {
    const s = symbol.length === 2 ? symbol[0].toUpperCase() + symbol[1].toLowerCase() : symbol.toUpperCase();
    normalised[s] = (normalised[s] ?? 0) + count;
  }
  return formatHillFormula(normalised);
}

/** Every species name the mechanism uses, with its composition or formula when known. */
export function mechanismSpeciesNames(mechanism: ParsedMechanism): { name: string; formula: string | null }[] {
  const composition = new Map(mechanism.species.map((s) => [s.name, s.composition]));
  const names = new Set<string>(mechanism.species.map((s) => s.name));
  for (const r of mechanism.reactions) for (const p of [...r.reactants, ...r.products]) names.add(p.name);
  return [...names].map((name) => {
    const c = composition.get(name) ?? compositionFromName(name, mechanism.elements ?? null);
    return { name, formula: c ? hillFormulaOf(c) : null };
  });
}

/**
 * Each name → a species: `choices` (name → InChIKey, the person's own), then `byName` (lower-case
 * name → species having it), then `byFormula` (Hill formula → species).
 */
export function matchSpecies({
  names,
  choices,
  byName,
  byFormula,
}: {
  names: readonly { name: string; formula: string | null }[];
  /** name → the InChIKey chosen, or the species chosen as the report shows it. */
  choices: ReadonlyMap<string, string | SpeciesMatch["candidates"][number]>;
  byName: ReadonlyMap<string, readonly CatalogueSpecies[]>;
  byFormula: ReadonlyMap<string, readonly CatalogueSpecies[]>;
}): SpeciesMatch[] {
  const brief = (s: CatalogueSpecies) => ({ inchiKey: s.inchiKey, formula: s.formula, name: s.names[0] ?? s.formula });
  return names.map(({ name, formula }) => {
    const chosen = choices.get(name);
    if (typeof chosen === "string") return { name, by: "choice", inchiKey: chosen, formula, candidates: [] };
    if (chosen) return { name, by: "choice", inchiKey: chosen.inchiKey, formula, candidates: [chosen] };
    const named = unique(byName.get(name.toLowerCase()) ?? []);
    // A name several species share is only settled by the composition, when that picks one of them.
    const narrowed = named.length > 1 && formula ? named.filter((s) => s.formula === formula) : named;
    if (narrowed.length === 1) return { name, by: "name", inchiKey: narrowed[0].inchiKey, formula, candidates: [brief(narrowed[0])] };
    const sameFormula = formula ? unique(byFormula.get(formula) ?? []) : [];
    // The composition alone never tells an electronic state: only a species of the name's own kind (ground state for
    // a plain name) is taken, and only when it is the one such species; otherwise the person chooses.
    const sameKind = sameFormula.filter((s) => isExcitedSpecies(s) === marksExcitedState(name));
    if (named.length === 0 && sameKind.length === 1 && !marksExcitedState(name))
      return { name, by: "composition", inchiKey: sameKind[0].inchiKey, formula, candidates: [brief(sameKind[0])] };
    const candidates = unique([...named, ...sameFormula]).map(brief);
    return { name, by: candidates.length ? "ambiguous" : "none", inchiKey: null, formula, candidates };
  });
}

/** A species every name of which marks an excited state (its names, not its structure, say so: an InChI cannot). */
function isExcitedSpecies(s: CatalogueSpecies): boolean {
  return s.names.length > 0 && s.names.every(marksExcitedState);
}

function unique(list: readonly CatalogueSpecies[]): CatalogueSpecies[] {
  const seen = new Set<string>();
  return list.filter((s) => !seen.has(s.inchiKey) && seen.add(s.inchiKey));
}

export interface ReactionKeys {
  forward: string;
  reverse: string;
}

/**
 * The reaction keys of a mechanism reaction in both directions, or why there are none: a species
 * not matched, or a third body (a "+ M" reaction is not one of Arrhenia's keyed reactions).
 */
export function mechanismReactionKeys(
  reaction: MechanismReaction,
  inchiKeyOf: ReadonlyMap<string, string | null>,
): { keys: ReactionKeys } | { unmatched: string[] } {
  const side = (participants: readonly MechanismParticipant[]) =>
    participants.map((p) => ({ inchiKey: inchiKeyOf.get(p.name) ?? "", coefficient: p.coefficient }));
  const unmatched = [...reaction.reactants, ...reaction.products].filter((p) => !inchiKeyOf.get(p.name)).map((p) => p.name);
  if (unmatched.length) return { unmatched: [...new Set(unmatched)] };
  const reactants = side(reaction.reactants);
  const products = side(reaction.products);
  return { keys: { forward: reactionKey({ reactants, products }), reverse: reactionKey({ reactants: products, products: reactants }) } };
}

export interface ReactionMatch {
  /** The stored reaction in the mechanism's forward direction: its data are compared. */
  forward: { reactionId: number; key: string } | null;
  /** The stored reaction of the reverse direction, marked in the report; its data are never compared with the forward rate. */
  reverse: { reactionId: number; key: string } | null;
}

/** A mechanism reaction's stored reactions in either direction. */
export function matchReaction(keys: ReactionKeys, reactionIdOf: ReadonlyMap<string, number>): ReactionMatch {
  const find = (key: string) => {
    const reactionId = reactionIdOf.get(key);
    return reactionId === undefined ? null : { reactionId, key };
  };
  return { forward: find(keys.forward), reverse: keys.reverse === keys.forward ? null : find(keys.reverse) };
}
