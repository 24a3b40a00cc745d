/**
 * The editor's form: a deposit document with every number kept as the text the person typed, so
 * that "1.2e-" mid-keystroke survives until it is corrected; numbers are read by lib/number-text.ts
 * (decimal commas too, as /analyse and the table import read them). formToDocument turns it back into
 * a document (unreadable numbers go to the server as text; the editor flags them at once with the same
 * pointer and the server's own message there is not shown again), documentToForm loads a stored one.
 */
import { parseNumberText, readNumberText } from "@/lib/number-text";
import type { CslReference, DepositDocument, DepositPoint, PointUncertainty } from "@/lib/deposits/types";
import {
  DEFAULT_LICENCE,
  DEPOSIT_SCHEMA_ID,
  type ConfidenceLevel,
  type FitModelId,
  type IdentifierKind,
  type LicenceId,
  type MethodCategoryId,
  type PhaseId,
  type ReactionClassId,
  type RelationTypeId,
  type UncertaintyKind,
} from "@/lib/deposits/vocabulary";
import type { FieldError } from "@/lib/errors";
import { getCanonicalRateConstantUnit } from "@/lib/kinetics/units";
import type { ReactionOrder } from "@/lib/kinetics/types";

export interface SpeciesRow {
  name: string;
  smiles: string;
  inchi: string;
  coefficient: string;
}

export interface CreatorRow {
  name: string;
  orcid: string;
  affiliation: string;
}

export interface FundingRow {
  funder: string;
  awardId: string;
  awardTitle: string;
}

/** One data row; `uConfidence` "" means the document does not state one (read as 1σ). */
export interface PointRow {
  T: string;
  k: string;
  u: string;
  uKind: UncertaintyKind;
  uConfidence: ConfidenceLevel | "";
  pressure: string;
  bathGas: string;
  note: string;
}

export interface RelatedRow {
  kind: IdentifierKind;
  identifier: string;
  relation: RelationTypeId;
}

export type PressureMode = "none" | "single" | "range";

export interface EditorForm {
  /** The document's `$schema`, kept when it had one. */
  schemaRef?: string;
  title: string;
  description: string;
  /** Comma separated. */
  keywords: string;
  license: LicenceId;
  creators: CreatorRow[];
  funding: FundingRow[];
  reaction: {
    reactants: SpeciesRow[];
    products: SpeciesRow[];
    productsUnknown: boolean;
    productsUnknownReason: string;
    class: ReactionClassId | "";
    order: ReactionOrder;
    phase: PhaseId;
    solventName: string;
    solventSmiles: string;
    solventInchi: string;
    surface: string;
  };
  method: { category: MethodCategoryId | ""; technique: string; detection: string; notes: string };
  conditions: { pressureMode: PressureMode; pressure: string; pressureMin: string; pressureMax: string; bathGas: string; notes: string };
  /** `pressure` is written to the document only when some pressure is given. */
  units: { k: string; T: string; pressure: string };
  points: PointRow[];
  reportedFit: {
    enabled: boolean;
    model: FitModelId;
    A: string;
    n: string;
    Ea: string;
    EaUnit: string;
    T0: string;
    Tmin: string;
    Tmax: string;
    /** Unit of Tmin and Tmax, chosen beside them (K by default, whatever units.T is). */
    rangeUnit: string;
  };
  source: {
    doi: string;
    locator: string;
    refType: string;
    refTitle: string;
    /** "Family, Given; Family, Given"; a name without a comma is kept whole (an organisation). */
    refAuthors: string;
    refJournal: string;
    refYear: string;
    /** Every other CSL-JSON field of a loaded reference, kept as it was. */
    refExtra: Record<string, unknown>;
  };
  relatedIdentifiers: RelatedRow[];
}

/** The signed-in person, offered as the first creator of a new deposit. */
export interface PersonDefaults {
  name: string;
  orcid?: string | null;
  affiliation?: string | null;
}

export const blankSpecies = (): SpeciesRow => ({ name: "", smiles: "", inchi: "", coefficient: "1" });
export const blankCreator = (): CreatorRow => ({ name: "", orcid: "", affiliation: "" });
export const blankFunding = (): FundingRow => ({ funder: "", awardId: "", awardTitle: "" });
export const blankRelated = (): RelatedRow => ({ kind: "doi", identifier: "", relation: "described_by" });
export function blankPoint(kind: UncertaintyKind = "absolute", confidence: ConfidenceLevel | "" = ""): PointRow {
  return { T: "", k: "", u: "", uKind: kind, uConfidence: confidence, pressure: "", bathGas: "", note: "" };
}

/**
 * A new deposit: gas-phase, second order, K and cm³ molecule⁻¹ s⁻¹, CC-BY-4.0, the signed-in person
 * as first creator, one empty reactant and product, and no points yet.
 */
export function blankForm(person?: PersonDefaults): EditorForm {
  return {
    schemaRef: DEPOSIT_SCHEMA_ID,
    title: "",
    description: "",
    keywords: "",
    license: DEFAULT_LICENCE,
    creators: [{ name: person?.name ?? "", orcid: person?.orcid ?? "", affiliation: person?.affiliation ?? "" }],
    funding: [],
    reaction: {
      reactants: [blankSpecies()],
      products: [blankSpecies()],
      productsUnknown: false,
      productsUnknownReason: "",
      class: "",
      order: 2,
      phase: "gas",
      solventName: "",
      solventSmiles: "",
      solventInchi: "",
      surface: "",
    },
    method: { category: "experiment", technique: "", detection: "", notes: "" },
    conditions: { pressureMode: "none", pressure: "", pressureMin: "", pressureMax: "", bathGas: "", notes: "" },
    units: { k: getCanonicalRateConstantUnit(2), T: "K", pressure: "Torr" },
    points: [],
    reportedFit: {
      enabled: false,
      model: "arrhenius",
      A: "",
      n: "",
      Ea: "",
      EaUnit: "kJ mol-1",
      T0: "",
      Tmin: "",
      Tmax: "",
      rangeUnit: "K",
    },
    source: { doi: "", locator: "", refType: "article-journal", refTitle: "", refAuthors: "", refJournal: "", refYear: "", refExtra: {} },
    relatedIdentifiers: [],
  };
}

/** A number as the editor shows it; "" for none. */
export function numberText(n: number | undefined | null): string {
  return n === undefined || n === null ? "" : String(n);
}

function text(s: string | undefined | null): string {
  return s ?? "";
}

type SpeciesLike = { name?: string; smiles?: string; inchi?: string; coefficient?: number };

function speciesToRow(s: SpeciesLike): SpeciesRow {
  return { name: text(s.name), smiles: text(s.smiles), inchi: text(s.inchi), coefficient: numberText(s.coefficient) };
}

export function pointToRow(p: DepositPoint): PointRow {
  // loose(): an incomplete draft may keep a cell as the text its author typed.
  return {
    T: loose(p.T),
    k: loose(p.k),
    u: loose(p.uncertainty?.value),
    uKind: p.uncertainty?.kind ?? "absolute",
    uConfidence: p.uncertainty?.confidence ?? "",
    pressure: loose(p.pressure),
    bathGas: text(p.bathGas),
    note: text(p.note),
  };
}

function authorText(a: { family?: string; given?: string; literal?: string }): string {
  return a.literal ?? [a.family, a.given].filter(Boolean).join(", ");
}

const REFERENCE_FIELDS = new Set(["type", "title", "author", "container-title"]);

/** A stored document that may be incomplete (a draft saved before it was valid): any part may be missing. */
type StoredDocument = DepositDocument | Record<string, unknown>;

/** Text of a value the form shows in a text field: numbers and strings as they are, anything else blank. */
function loose(v: unknown): string {
  return typeof v === "string" ? v : typeof v === "number" ? String(v) : "";
}

function list<T>(v: unknown): T[] {
  return Array.isArray(v) ? (v as T[]) : [];
}

/** Loads a stored document into the form; parts an incomplete draft lacks come from the blank form. */
export function documentToForm(stored: StoredDocument): EditorForm {
  // Every part is read defensively: an incomplete draft may hold anything its author typed.
  const doc = stored as Partial<DepositDocument> & { [key: string]: unknown };
  const blank = blankForm();
  const pressure = doc.conditions?.pressure;
  const ref = doc.source?.reference;
  const refExtra: Record<string, unknown> = {};
  if (ref) for (const [key, value] of Object.entries(ref)) if (!REFERENCE_FIELDS.has(key)) refExtra[key] = value;
  const fit = doc.reportedFit;
  const rx: Partial<DepositDocument["reaction"]> = doc.reaction ?? {};
  const method: Partial<DepositDocument["method"]> = doc.method ?? {};
  return {
    schemaRef: doc.$schema,
    title: loose(doc.title),
    description: loose(doc.description),
    keywords: list<string>(doc.keywords).join(", "),
    license: doc.license ?? DEFAULT_LICENCE,
    creators: list<Partial<DepositDocument["creators"][number]>>(doc.creators).map((c) => ({
      name: loose(c.name),
      orcid: loose(c.orcid),
      affiliation: loose(c.affiliation),
    })),
    funding: list<Partial<NonNullable<DepositDocument["funding"]>[number]>>(doc.funding).map((f) => ({
      funder: loose(f.funder),
      awardId: loose(f.awardId),
      awardTitle: loose(f.awardTitle),
    })),
    reaction: {
      reactants: list<SpeciesLike>(rx.reactants).map(speciesToRow),
      products: list<SpeciesLike>(rx.products).map(speciesToRow),
      productsUnknown: rx.productsUnknown !== undefined,
      productsUnknownReason: loose(rx.productsUnknown?.reason),
      class: rx.class ?? blank.reaction.class,
      order: rx.order ?? blank.reaction.order,
      phase: rx.phase ?? blank.reaction.phase,
      solventName: loose(rx.solvent?.name),
      solventSmiles: loose(rx.solvent?.smiles),
      solventInchi: loose(rx.solvent?.inchi),
      surface: loose(rx.surface),
    },
    method: {
      category: method.category ?? "",
      technique: loose(method.technique),
      detection: loose(method.detection),
      notes: loose(method.notes),
    },
    conditions: {
      pressureMode: pressure === undefined ? "none" : pressure.value !== undefined ? "single" : "range",
      pressure: loose(pressure?.value),
      pressureMin: loose(pressure?.min),
      pressureMax: loose(pressure?.max),
      bathGas: loose(doc.conditions?.bathGas),
      notes: loose(doc.conditions?.notes),
    },
    units: { k: doc.units?.k ?? blank.units.k, T: doc.units?.T ?? blank.units.T, pressure: doc.units?.pressure ?? blank.units.pressure },
    points: list<DepositPoint>(doc.points).map(pointToRow),
    reportedFit: fit
      ? {
          enabled: true,
          model: fit.model ?? blank.reportedFit.model,
          A: loose(fit.A),
          n: loose(fit.n),
          Ea: loose(fit.Ea),
          EaUnit: fit.EaUnit ?? blank.reportedFit.EaUnit,
          T0: loose(fit.T0),
          Tmin: loose(fit.Tmin),
          Tmax: loose(fit.Tmax),
          // A document without a range unit gives its range in units.T (the format's rule before the unit existed).
          rangeUnit: fit.rangeUnit ?? doc.units?.T ?? "K",
        }
      : blank.reportedFit,
    source: {
      doi: loose(doc.source?.doi),
      locator: loose(doc.source?.locator),
      refType: ref?.type ?? blank.source.refType,
      refTitle: loose(ref?.title),
      refAuthors: list<{ family?: string; given?: string; literal?: string }>(ref?.author).map(authorText).join("; "),
      refJournal: loose(ref?.["container-title"]),
      refYear: loose(ref?.issued?.["date-parts"]?.[0]?.[0]),
      refExtra,
    },
    relatedIdentifiers: list<Partial<RelatedRow>>(doc.relatedIdentifiers).map((r) => ({
      kind: r.kind ?? "doi",
      identifier: loose(r.identifier),
      relation: r.relation ?? "described_by",
    })),
  };
}

/** Collects the numbers the form could not read, each with the pointer the server would use. */
class Reader {
  readonly problems: FieldError[] = [];

  /** A number, or the text itself when unreadable (so the schema reports it too), or undefined when blank. */
  number(value: string, pointer: string): number | string | undefined {
    const t = value.trim();
    if (t === "") return undefined;
    const read = readNumberText(t);
    if (read.ok) return read.value;
    // An example only where the text is no number at all; an ambiguous or doubly separated one already says what to write.
    const example = read.problem.endsWith("is not a number") ? "; write a number such as 298.15, 1.2e-11 or 1,2e-11" : "";
    this.problems.push({ pointer, value: t, message: `${read.problem}${example}.` });
    return t;
  }
}

function put<T extends object, K extends keyof T>(target: T, key: K, value: T[K] | undefined | "") {
  if (value !== undefined && value !== "") target[key] = value as T[K];
}

function speciesOut(rows: SpeciesRow[], base: string, r: Reader) {
  return rows.map((row, i) => {
    const s: Record<string, unknown> = {};
    put(s, "name", row.name.trim());
    put(s, "smiles", row.smiles.trim());
    put(s, "inchi", row.inchi.trim());
    put(s, "coefficient", r.number(row.coefficient, `${base}/${i}/coefficient`));
    return s;
  });
}

function pointOut(row: PointRow, i: number, r: Reader): Record<string, unknown> {
  const p: Record<string, unknown> = {};
  // T and k are required: a blank cell goes as "" so the server names the row rather than the list.
  p.T = r.number(row.T, `/points/${i}/T`) ?? "";
  p.k = r.number(row.k, `/points/${i}/k`) ?? "";
  const u = r.number(row.u, `/points/${i}/uncertainty`);
  if (u !== undefined) {
    const uncertainty: Record<string, unknown> = { kind: row.uKind, value: u };
    if (row.uConfidence) uncertainty.confidence = row.uConfidence;
    p.uncertainty = uncertainty;
  }
  put(p, "pressure", r.number(row.pressure, `/points/${i}/pressure`));
  put(p, "bathGas", row.bathGas.trim());
  put(p, "note", row.note.trim());
  return p;
}

function authorsOut(authors: string): CslReference["author"] {
  return authors
    .split(";")
    .map((a) => a.trim())
    .filter(Boolean)
    .map((a) => {
      const comma = a.indexOf(",");
      if (comma < 0) return { literal: a };
      const given = a.slice(comma + 1).trim();
      return given ? { family: a.slice(0, comma).trim(), given } : { family: a.slice(0, comma).trim() };
    });
}

function referenceOut(s: EditorForm["source"], r: Reader): Record<string, unknown> | undefined {
  const hasAny = s.refTitle.trim() || s.refAuthors.trim() || s.refJournal.trim() || s.refYear.trim() || Object.keys(s.refExtra).length > 0;
  if (!hasAny) return undefined;
  const ref: Record<string, unknown> = { type: s.refType || "article-journal", title: s.refTitle.trim() };
  const authors = authorsOut(s.refAuthors);
  if (authors && authors.length) ref.author = authors;
  put(ref, "container-title", s.refJournal.trim());
  const extra = { ...s.refExtra };
  const year = r.number(s.refYear, "/source/reference/issued");
  const storedParts = (extra.issued as CslReference["issued"])?.["date-parts"];
  delete extra.issued;
  if (year !== undefined) {
    // Keep a stored month and day while the year is unchanged.
    ref.issued = storedParts?.[0]?.[0] === year ? { "date-parts": storedParts } : { "date-parts": [[year]] };
  }
  return { ...ref, ...extra };
}

/**
 * The document the form describes, and the numbers it could not read (pointer, message). Blank
 * optional fields are left out; blank required ones are sent empty so the server names them.
 */
export function formToDocument(form: EditorForm): { document: DepositDocument; problems: FieldError[] } {
  const r = new Reader();
  const doc: Record<string, unknown> = {};
  put(doc, "$schema", form.schemaRef);
  doc.title = form.title.trim();
  doc.description = form.description;
  const keywords = form.keywords
    .split(",")
    .map((k) => k.trim())
    .filter(Boolean);
  if (keywords.length) doc.keywords = keywords;
  doc.license = form.license;
  doc.creators = form.creators.map((c) => {
    const out: Record<string, unknown> = { name: c.name.trim() };
    put(out, "orcid", c.orcid.trim());
    put(out, "affiliation", c.affiliation.trim());
    return out;
  });
  if (form.funding.length) {
    doc.funding = form.funding.map((f) => {
      const out: Record<string, unknown> = { funder: f.funder.trim() };
      put(out, "awardId", f.awardId.trim());
      put(out, "awardTitle", f.awardTitle.trim());
      return out;
    });
  }

  const rx = form.reaction;
  const reaction: Record<string, unknown> = {
    reactants: speciesOut(rx.reactants, "/reaction/reactants", r),
    products: rx.productsUnknown
      ? speciesOut(
          rx.products.filter((p) => p.name.trim() || p.smiles.trim() || p.inchi.trim()),
          "/reaction/products",
          r,
        )
      : speciesOut(rx.products, "/reaction/products", r),
  };
  if (rx.productsUnknown) reaction.productsUnknown = { reason: rx.productsUnknownReason.trim() };
  put(reaction, "class", rx.class);
  reaction.order = rx.order;
  reaction.phase = rx.phase;
  if (rx.phase === "liquid") {
    const solvent: Record<string, unknown> = { name: rx.solventName.trim() };
    put(solvent, "smiles", rx.solventSmiles.trim());
    put(solvent, "inchi", rx.solventInchi.trim());
    reaction.solvent = solvent;
  }
  if (rx.phase === "surface") put(reaction, "surface", rx.surface.trim());
  doc.reaction = reaction;

  const method: Record<string, unknown> = {};
  put(method, "category", form.method.category);
  method.technique = form.method.technique.trim();
  put(method, "detection", form.method.detection.trim());
  put(method, "notes", form.method.notes.trim());
  doc.method = method;

  const c = form.conditions;
  const conditions: Record<string, unknown> = {};
  if (c.pressureMode === "single") conditions.pressure = { value: r.number(c.pressure, "/conditions/pressure/value") ?? "" };
  if (c.pressureMode === "range")
    conditions.pressure = {
      min: r.number(c.pressureMin, "/conditions/pressure/min") ?? "",
      max: r.number(c.pressureMax, "/conditions/pressure/max") ?? "",
    };
  put(conditions, "bathGas", c.bathGas.trim());
  put(conditions, "notes", c.notes.trim());
  if (Object.keys(conditions).length) doc.conditions = conditions;

  const points = form.points.map((p, i) => pointOut(p, i, r));
  const units: Record<string, unknown> = { k: form.units.k, T: form.units.T };
  if (c.pressureMode !== "none" || points.some((p) => p.pressure !== undefined)) units.pressure = form.units.pressure;
  doc.units = units;
  doc.points = points;

  const f = form.reportedFit;
  if (f.enabled) {
    const fit: Record<string, unknown> = { model: f.model, A: r.number(f.A, "/reportedFit/A") ?? "" };
    if (f.model === "modified_arrhenius") fit.n = r.number(f.n, "/reportedFit/n") ?? "";
    fit.Ea = r.number(f.Ea, "/reportedFit/Ea") ?? "";
    fit.EaUnit = f.EaUnit;
    put(fit, "T0", r.number(f.T0, "/reportedFit/T0"));
    put(fit, "Tmin", r.number(f.Tmin, "/reportedFit/Tmin"));
    put(fit, "Tmax", r.number(f.Tmax, "/reportedFit/Tmax"));
    if (fit.Tmin !== undefined || fit.Tmax !== undefined) fit.rangeUnit = f.rangeUnit;
    doc.reportedFit = fit;
  }

  const source: Record<string, unknown> = {};
  put(source, "doi", form.source.doi.trim());
  const reference = referenceOut(form.source, r);
  if (reference) source.reference = reference;
  put(source, "locator", form.source.locator.trim());
  doc.source = source;

  if (form.relatedIdentifiers.length)
    doc.relatedIdentifiers = form.relatedIdentifiers.map((x) => ({ kind: x.kind, identifier: x.identifier.trim(), relation: x.relation }));

  return { document: doc as unknown as DepositDocument, problems: r.problems };
}

/** A point's uncertainty as the document states it, when the row holds a readable one. */
export function rowUncertainty(row: PointRow): PointUncertainty | undefined {
  const v = parseNumberText(row.u);
  if (v === null) return undefined;
  return row.uConfidence ? { kind: row.uKind, value: v, confidence: row.uConfidence } : { kind: row.uKind, value: v };
}
