/**
 * The part of preparing a deposit that grows with the number of points — schema and semantic
 * validation, normalisation, the units-sanity window and the kinetics analysis — as one pure
 * function, so it can run on an analysis worker thread (lib/workers) rather than the request
 * thread. Species identity (RDKit) stays in prepare.ts. Returns plain data, never throws for bad
 * input: errors cross a thread boundary as data.
 */
import { normalisePoints, toAnalysisInput, validateDeposit, type DepositDocument } from "@/lib/deposits";
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

export type CheckedDocument =
  | { ok: false; errors: FieldError[] }
  | {
      ok: true;
      document: DepositDocument;
      points: StoredPoint[];
      /** Checks found on the points (units sanity); balance checks are added by the caller. */
      checks: AnalysisSummary["checks"];
      /** The analysis, or the error that stopped it (reported after species problems). */
      analysis: { ok: true; result: Record<string, unknown> } | { ok: false; message: string; errors: FieldError[] };
    };

/** Validate, normalise and analyse a deposit document. */
export function checkAndAnalyseDocument(raw: unknown): CheckedDocument {
  const validation = validateDeposit(raw);
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
    analysis = { ok: false, message: err.message, errors: [{ pointer: err.pointIndex !== undefined ? `/points/${err.pointIndex}` : "/points", message: err.message }] };
  }

  const points: StoredPoint[] = normalised.map((p) => ({ T: p.T, k: p.k, sigmaLnK: p.sigmaLnK, pressurePa: p.pressurePa, bathGas: p.bathGas, note: p.note, original: p.original }));
  return { ok: true, document: doc, points, checks, analysis };
}
