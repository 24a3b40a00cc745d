/**
 * Controlled lists of the deposit document: reaction classes, licences, method categories,
 * technique suggestions, relation types. The JSON Schema (schemas/deposit.v1.schema.json) repeats
 * the ids as enums so that outside validators need no code; a unit test keeps the two in step.
 */

/** Stable `$id` of the deposit document schema, version 1. A constant: documents cite it. */
export const DEPOSIT_SCHEMA_ID = "https://arrhenia.invalid/schemas/deposit/v1.json";

/** Most points one dataset may hold. */
export const MAX_POINTS = 100_000;

/** Fewest points one dataset may hold. */
export const MIN_POINTS = 2;

/** Reaction classes: kebab-case id (stored, in the schema) and the label shown on screens. */
export const REACTION_CLASSES = [
  { id: "hydrogen-abstraction", label: "H-atom abstraction", hint: "A radical or atom removes a hydrogen atom: OH + CH₄ → H₂O + CH₃." },
  { id: "addition", label: "Addition", hint: "Two species join across a multiple bond: OH + C₂H₄ → HOCH₂CH₂." },
  { id: "elimination", label: "Elimination", hint: "A small molecule leaves, forming a multiple bond: C₂H₅Cl → C₂H₄ + HCl." },
  { id: "bond-fission", label: "Bond fission", hint: "One molecule breaks into two fragments: C₂H₆ → 2 CH₃." },
  { id: "recombination", label: "Recombination", hint: "Two radicals or atoms combine: CH₃ + CH₃ → C₂H₆." },
  { id: "isomerisation", label: "Isomerisation", hint: "One species rearranges into another of the same formula." },
  { id: "substitution", label: "Substitution", hint: "One group replaces another: Cl + CH₃Br → CH₃Cl + Br." },
  {
    id: "radical-disproportionation",
    label: "Disproportionation",
    hint: "Two radicals exchange an atom to give two closed-shell products.",
  },
  { id: "electron-transfer", label: "Electron transfer", hint: "An electron moves from one species to another." },
  { id: "insertion", label: "Insertion", hint: "An atom or carbene inserts into a bond: O(¹D) + CH₄ → CH₃OH." },
  { id: "other", label: "Other", hint: "None of the above; say more in the description." },
] as const;

export type ReactionClassId = (typeof REACTION_CLASSES)[number]["id"];

/**
 * Ids used before the classes were renamed. Published versions keep them in their frozen
 * documents (the payload's hash covers them); screens read them through `reactionClassFor`, and a
 * new document that still uses one is refused with the id to write instead.
 */
export const RETIRED_REACTION_CLASS_IDS: Readonly<Record<string, ReactionClassId>> = {
  h_abstraction: "hydrogen-abstraction",
  bond_fission: "bond-fission",
  disproportionation: "radical-disproportionation",
  electron_transfer: "electron-transfer",
};

/** The class an id stands for, current or retired; undefined for anything else. */
export function reactionClassFor(id: unknown): (typeof REACTION_CLASSES)[number] | undefined {
  if (typeof id !== "string") return undefined;
  const current = Object.hasOwn(RETIRED_REACTION_CLASS_IDS, id) ? RETIRED_REACTION_CLASS_IDS[id] : id;
  return REACTION_CLASSES.find((c) => c.id === current);
}

/**
 * Licences a dataset may carry (SPDX ids). Open data and content licences only: the repository is
 * open, so non-commercial and no-derivatives terms are not offered.
 */
export const LICENCES = [
  { id: "CC-BY-4.0", label: "Creative Commons Attribution 4.0" },
  { id: "CC0-1.0", label: "Creative Commons Zero 1.0 (public domain dedication)" },
  { id: "CC-BY-SA-4.0", label: "Creative Commons Attribution-ShareAlike 4.0" },
  { id: "CC-BY-3.0", label: "Creative Commons Attribution 3.0" },
  { id: "CC-BY-SA-3.0", label: "Creative Commons Attribution-ShareAlike 3.0" },
  { id: "ODC-By-1.0", label: "Open Data Commons Attribution 1.0" },
  { id: "ODbL-1.0", label: "Open Data Commons Open Database Licence 1.0" },
  { id: "PDDL-1.0", label: "Open Data Commons Public Domain Dedication and Licence 1.0" },
  { id: "CDLA-Permissive-2.0", label: "Community Data Licence Agreement – Permissive 2.0" },
  { id: "CDLA-Sharing-1.0", label: "Community Data Licence Agreement – Sharing 1.0" },
] as const;

export type LicenceId = (typeof LICENCES)[number]["id"];

/** Licence assumed when a document names none. */
export const DEFAULT_LICENCE: LicenceId = "CC-BY-4.0";

export const PHASES = [
  { id: "gas", label: "Gas phase" },
  { id: "liquid", label: "Liquid (solution)" },
  { id: "surface", label: "Surface" },
] as const;

export type PhaseId = (typeof PHASES)[number]["id"];

/** How the rate constants were obtained; the ids stay as the deposit format names them, the labels are ours. */
export const METHOD_CATEGORIES = [
  { id: "experiment", label: "Measured", hint: "Rate constants measured in the laboratory." },
  { id: "theory", label: "Calculated", hint: "Rate constants computed, e.g. from transition-state or master-equation calculations." },
  { id: "evaluation", label: "Evaluated from other work", hint: "Values recommended after weighing other published sources." },
] as const;

export type MethodCategoryId = (typeof METHOD_CATEGORIES)[number]["id"];

/** Suggestions offered for the free-text technique field; any other wording is accepted. */
export const TECHNIQUE_SUGGESTIONS = [
  "pulsed laser photolysis",
  "flash photolysis",
  "discharge flow",
  "shock tube",
  "flow reactor",
  "static reactor",
  "relative rate",
  "pulse radiolysis",
  "stopped flow",
  "jet-stirred reactor",
  "transition state theory",
  "variational transition state theory",
  "master equation",
  "trajectory calculations",
  "critical evaluation of published data",
] as const;

export const UNCERTAINTY_KINDS = [
  { id: "absolute", label: "Absolute (same unit as k)" },
  { id: "relative", label: "Relative, in percent of k" },
  { id: "factor", label: "Factor f (k/f to k·f)" },
] as const;

export type UncertaintyKind = (typeof UNCERTAINTY_KINDS)[number]["id"];

/** How many standard deviations a stated uncertainty covers. */
export const CONFIDENCE_LEVELS = [
  { id: "1sigma", label: "1σ (about 68 %)", coverage: 1 },
  { id: "2sigma", label: "2σ (about 95 %)", coverage: 2 },
] as const;

export type ConfidenceLevel = (typeof CONFIDENCE_LEVELS)[number]["id"];

export const RELATION_TYPES = [
  { id: "described_by", label: "Described in", hint: "A publication that describes these data." },
  { id: "supplement_to", label: "Supplements", hint: "These data accompany that item." },
  { id: "derived_from", label: "Derived from", hint: "These data were computed or extracted from that item." },
  { id: "updates", label: "Updates", hint: "These data correct or extend that item." },
  { id: "compared_with", label: "Compared with", hint: "These data are compared with that item." },
  { id: "cites", label: "Cites", hint: "Any other item these data refer to." },
] as const;

export type RelationTypeId = (typeof RELATION_TYPES)[number]["id"];

export const IDENTIFIER_KINDS = [
  { id: "doi", label: "DOI" },
  { id: "url", label: "Web address" },
] as const;

export type IdentifierKind = (typeof IDENTIFIER_KINDS)[number]["id"];

export const FIT_MODELS = [
  { id: "arrhenius", label: "Arrhenius (no temperature power, n = 0)" },
  { id: "modified_arrhenius", label: "Modified Arrhenius (with the power n of T/T0)" },
] as const;

export type FitModelId = (typeof FIT_MODELS)[number]["id"];
