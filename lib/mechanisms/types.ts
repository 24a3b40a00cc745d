/**
 * A kinetic mechanism as read from a file: its species, its reactions (every one, checked or not)
 * and the problems found on the way, each with its line and column.
 */

/** Where in the file (1-based line and column, as an editor shows them). */
export interface TextPlace {
  line: number;
  column: number;
}

/** A line the reader could not use, or a keyword it does not know; the rest of the file is still read. */
export interface MechanismProblem extends TextPlace {
  message: string;
}

export interface MechanismSpecies {
  name: string;
  /** Elemental composition when the file states it (Cantera YAML `composition`), else null. */
  composition: Record<string, number> | null;
  line: number;
}

/** One species on one side of an equation, by its name in the mechanism. */
export interface MechanismParticipant {
  name: string;
  coefficient: number;
}

/**
 * How a reaction's rate is given. Only `elementary` (a modified Arrhenius expression) is compared with
 * the evidence; every other kind is listed as not checked yet.
 */
export type MechanismRateType = "elementary" | "three-body" | "falloff" | "chemically-activated" | "pressure-table" | "chebyshev" | "other";

/** k = A T^b exp(−Ea/RT), T in K; A in canonical units for its order (molecule, cm, s), Ea in J mol⁻¹. */
export interface MechanismRate {
  A: number;
  b: number;
  Ea: number;
}

export interface MechanismReaction {
  /** 1-based position among the file's reactions. */
  index: number;
  line: number;
  /** The equation as written in the file. */
  equation: string;
  reactants: MechanismParticipant[];
  products: MechanismParticipant[];
  reversible: boolean;
  rateType: MechanismRateType;
  /** Molecularity of the forward direction (third body counted), 1–3 when it has a canonical unit. */
  order: number;
  /** The forward rate in canonical units; null when the rate type is not checked or the rate could not be read. */
  rate: MechanismRate | null;
  duplicate: boolean;
  /** Why it is not checked (rate type, explicit orders, unreadable numbers); null when it is checked. */
  notChecked: string | null;
}

export type MechanismFormat = "cantera-yaml" | "plain-text";

export interface ParsedMechanism {
  format: MechanismFormat;
  species: MechanismSpecies[];
  reactions: MechanismReaction[];
  problems: MechanismProblem[];
  /** The elements an ELEMENTS block declares (symbols as formulas write them: "Cl"); absent when none is declared. */
  elements?: string[];
  /** The units the file declared, in words, for the report. */
  units: { rateConstant: string; energy: string };
}
