/**
 * The part of preparing a deposit that grows with the number of points — schema and semantic
 * validation, normalisation, the units-sanity window and the kinetics analysis — as one pure
 * function, so it can run on an analysis worker thread (lib/workers) rather than the request
 * thread. Species identity (RDKit) stays in prepare.ts. Returns plain data, never throws for bad
 * input: errors cross a thread boundary as data.
 */
import {
  normalisePoints,
  parseDepositJson,
  toAnalysisInput,
  validateDeposit,
  type CanonicalPoint,
  type DepositDocument,
} from "@/lib/deposits";
import type { FieldError } from "@/lib/errors";
import { AnalysisError, analyseDataset, type ReactionOrder } from "@/lib/kinetics";
import type { AnalysisSummary, StoredPoint } from "./queries";

/**
 * Plausible windows of k in canonical units per order (common practice: beyond these a unit
 * mistake is far likelier than chemistry). Outside is a warning, not an error.
 */
export const PLAUSIBLE_K: Record<ReactionOrder, [number, number, string]> = {
  1: [1e-12, 1e17, "s⁻¹"],
  2: [1e-30, 1e-5, "cm³ molecule⁻¹ s⁻¹"],
  3: [1e-45, 1e-25, "cm⁶ molecule⁻² s⁻¹"],
};

/**
 * The canonical numbers of every point, one column each (NaN where a point has none). Sent back
 * from the worker instead of 100 000 point objects: copying objects between threads costs far
 * more than copying four arrays of numbers, and the rest of each point is in the document.
 */
export interface CanonicalColumns {
  T: Float64Array;
  k: Float64Array;
  sigmaLnK: Float64Array;
  pressurePa: Float64Array;
}

export type CheckedDocument =
  | { ok: false; errors: FieldError[]; /** the text is not JSON at all */ syntax?: true }
  | {
      ok: true;
      /** The licence after defaulting; the caller already holds the rest of the document. */
      license: DepositDocument["license"];
      columns: CanonicalColumns;
      /** Checks found on the points (units sanity); balance checks are added by the caller. */
      checks: AnalysisSummary["checks"];
      /** The analysis, or the error that stopped it (reported after species problems). */
      analysis: { ok: true; result: Record<string, unknown> } | { ok: false; message: string; errors: FieldError[] };
    };

/**
 * Validate, normalise and analyse a deposit document given as JSON text (text crosses to a worker
 * thread at the cost of one copy; a parsed 100 000-point document takes most of a second).
 */
export function checkAndAnalyseDocument(text: string): CheckedDocument {
  const parsed = parseDepositJson(text);
  if (!parsed.ok) return { ok: false, errors: parsed.errors, syntax: true };
  const validation = validateDeposit(parsed.value);
  if (!validation.ok) return { ok: false, errors: validation.errors };
  const doc = validation.value;

  const checks: AnalysisSummary["checks"] = [];
  const normalised = normalisePoints(doc);
  const [lo, hi, unit] = PLAUSIBLE_K[doc.reaction.order];
  let outside = 0;
  for (const p of normalised) if (p.k < lo || p.k > hi) outside++;
  if (outside) {
    checks.push({
      code: "implausible_magnitude",
      severity: "warn",
      message: `${outside} point${outside === 1 ? "" : "s"} lie outside ${lo.toExponential(0)}–${hi.toExponential(0)} ${unit}, the usual range for order ${doc.reaction.order}; check the unit of k.`,
    });
  }

  let analysis: Extract<CheckedDocument, { ok: true }>["analysis"];
  try {
    analysis = { ok: true, result: analyseDataset(toAnalysisInput(doc)) as unknown as Record<string, unknown> };
  } catch (err) {
    if (!(err instanceof AnalysisError)) throw err;
    analysis = {
      ok: false,
      message: err.message,
      errors: [{ pointer: err.pointIndex !== undefined ? `/points/${err.pointIndex}` : "/points", message: err.message }],
    };
  }

  return { ok: true, license: doc.license, columns: toCanonicalColumns(normalised), checks, analysis };
}

export function toCanonicalColumns(points: CanonicalPoint[]): CanonicalColumns {
  const n = points.length;
  const columns: CanonicalColumns = {
    T: new Float64Array(n),
    k: new Float64Array(n),
    sigmaLnK: new Float64Array(n),
    pressurePa: new Float64Array(n),
  };
  for (let i = 0; i < n; i++) {
    const p = points[i];
    columns.T[i] = p.T;
    columns.k[i] = p.k;
    columns.sigmaLnK[i] = p.sigmaLnK ?? NaN;
    columns.pressurePa[i] = p.pressurePa ?? NaN;
  }
  return columns;
}

/**
 * The stored points of a validated document from its canonical columns. Bath gas, note and the
 * original numbers are read from the document as normalisePoints does (a unit test holds the two
 * equal).
 */
export function storedPointsFromColumns(doc: DepositDocument, columns: CanonicalColumns): StoredPoint[] {
  const { units, conditions } = doc;
  return doc.points.map((p, i) => ({
    T: columns.T[i],
    k: columns.k[i],
    sigmaLnK: Number.isNaN(columns.sigmaLnK[i]) ? undefined : columns.sigmaLnK[i],
    pressurePa: Number.isNaN(columns.pressurePa[i]) ? undefined : columns.pressurePa[i],
    bathGas: p.bathGas ?? conditions?.bathGas,
    note: p.note,
    original: { T: p.T, k: p.k, unitT: units.T, unitK: units.k },
  }));
}
