/**
 * The body of POST /api/v1/analyses for the rows of the editor: every row with a readable T and k,
 * in the document's units, with σ(ln k) from its stated uncertainty exactly as the stored analysis
 * computes it (lib/deposits/normalise). `rows` maps each posted point back to its table row.
 */
import { parseNumberText } from "@/lib/number-text";
import { sigmaLnKOf } from "@/lib/deposits/normalise";
import type { ReactionOrder } from "@/lib/kinetics/types";
import { rowUncertainty, type PointRow } from "./form-model";

export interface AnalysisRequestBody {
  points: { T: number; k: number; sigmaLnK?: number }[];
  order: ReactionOrder;
  units: { k: string; T: string };
}

export interface BuiltAnalysisRequest {
  body: AnalysisRequestBody;
  /** Zero-based table row of each posted point. */
  rows: number[];
  /** Rows left out because T or k is blank or unreadable. */
  skipped: number;
}

function validSigma(row: PointRow, k: number): number | undefined {
  const u = rowUncertainty(row);
  if (!u || !(u.kind === "factor" ? u.value > 1 : u.value > 0)) return undefined;
  const s = sigmaLnKOf({ k, uncertainty: u });
  return s !== undefined && Number.isFinite(s) && s > 0 ? s : undefined;
}

export function buildAnalysisRequest(points: PointRow[], order: ReactionOrder, units: { k: string; T: string }): BuiltAnalysisRequest {
  const out: AnalysisRequestBody["points"] = [];
  const rows: number[] = [];
  points.forEach((row, i) => {
    const T = parseNumberText(row.T);
    const k = parseNumberText(row.k);
    if (T === null || k === null) return;
    const sigmaLnK = k > 0 ? validSigma(row, k) : undefined;
    out.push(sigmaLnK === undefined ? { T, k } : { T, k, sigmaLnK });
    rows.push(i);
  });
  return { body: { points: out, order, units: { k: units.k, T: units.T } }, rows, skipped: points.length - out.length };
}

/** FNV-1a of a string, as a short query key for a body that may be megabytes long. */
export function hashText(text: string): string {
  let h = 0x811c9dc5;
  for (let i = 0; i < text.length; i++) {
    h ^= text.charCodeAt(i);
    h = Math.imul(h, 0x01000193);
  }
  return `${(h >>> 0).toString(16)}-${text.length}`;
}
