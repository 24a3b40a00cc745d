/**
 * TypeScript shape of the deposit document, written by hand to match
 * schemas/deposit.v1.schema.json (a unit test checks the example against both).
 * Numbers are in the units the document names under `units`, not canonical units.
 */
import type { ReactionOrder } from "@/lib/kinetics";
import type {
  ConfidenceLevel,
  FitModelId,
  IdentifierKind,
  LicenceId,
  MethodCategoryId,
  PhaseId,
  ReactionClassId,
  RelationTypeId,
  UncertaintyKind,
} from "./vocabulary";

export type {
  ConfidenceLevel,
  FitModelId,
  IdentifierKind,
  LicenceId,
  MethodCategoryId,
  PhaseId,
  ReactionClassId,
  RelationTypeId,
  UncertaintyKind,
} from "./vocabulary";

export interface Creator {
  name: string;
  /** 0000-0000-0000-000X form, check digit verified. */
  orcid?: string;
  affiliation?: string;
}

export interface FundingAward {
  funder: string;
  awardId?: string;
  awardTitle?: string;
}

/** One species: at least one of `smiles` and `inchi`. */
export interface Species {
  name?: string;
  smiles?: string;
  inchi?: string;
  /** Stoichiometric coefficient, > 0; 1 when absent. */
  coefficient?: number;
}

export interface Solvent {
  name: string;
  smiles?: string;
  inchi?: string;
}

export interface Reaction {
  reactants: Species[];
  /** May be empty only when `productsUnknown` is present. */
  products: Species[];
  productsUnknown?: { reason: string };
  class: ReactionClassId;
  order: ReactionOrder;
  phase: PhaseId;
  /** Required when `phase` is "liquid". */
  solvent?: Solvent;
  surface?: string;
}

export interface Method {
  category: MethodCategoryId;
  technique: string;
  detection?: string;
  notes?: string;
}

/** One pressure (`value`) or a range (`min`, `max`), in `units.pressure`. */
export interface PressureCondition {
  value?: number;
  min?: number;
  max?: number;
}

export interface Conditions {
  pressure?: PressureCondition;
  bathGas?: string;
  notes?: string;
}

/** Unit strings as understood by lib/kinetics/units. */
export interface DepositUnits {
  k: string;
  T: string;
  pressure?: string;
}

export interface PointUncertainty {
  kind: UncertaintyKind;
  /** Absolute: in units.k; relative: percent of k; factor: f > 1. */
  value: number;
  /** "1sigma" when absent. */
  confidence?: ConfidenceLevel;
}

/** One row of data, in the document's units. */
export interface DepositPoint {
  T: number;
  k: number;
  uncertainty?: PointUncertainty;
  /** In units.pressure; overrides conditions.pressure. */
  pressure?: number;
  /** Overrides conditions.bathGas. */
  bathGas?: string;
  note?: string;
}

/** The authors' own expression: A in units.k; Ea in EaUnit; T0 in units.T; Tmin, Tmax in rangeUnit (units.T when left out). */
export interface DepositReportedFit {
  model: FitModelId;
  A: number;
  n?: number;
  Ea: number;
  EaUnit: string;
  T0?: number;
  Tmin?: number;
  Tmax?: number;
  rangeUnit?: string;
}

/** A CSL-JSON item; fields beyond the few named here are kept as given. */
export interface CslReference {
  type: string;
  title: string;
  author?: { family?: string; given?: string; literal?: string }[];
  issued?: { "date-parts"?: number[][] };
  "container-title"?: string;
  volume?: string | number;
  issue?: string | number;
  page?: string;
  publisher?: string;
  DOI?: string;
  URL?: string;
  [field: string]: unknown;
}

/** Publication of the numbers: `doi`, `reference`, or both. */
export interface Source {
  doi?: string;
  reference?: CslReference;
  /** Table or figure the numbers come from. */
  locator?: string;
}

export interface RelatedIdentifier {
  kind: IdentifierKind;
  identifier: string;
  relation: RelationTypeId;
}

/** A deposit document, version 1. */
export interface DepositDocument {
  $schema?: string;
  title: string;
  /** Markdown. */
  description: string;
  keywords?: string[];
  /** SPDX id; CC-BY-4.0 when absent (validateDeposit fills it in). */
  license?: LicenceId;
  creators: Creator[];
  funding?: FundingAward[];
  reaction: Reaction;
  method: Method;
  conditions?: Conditions;
  units: DepositUnits;
  points: DepositPoint[];
  reportedFit?: DepositReportedFit;
  source: Source;
  relatedIdentifiers?: RelatedIdentifier[];
}
