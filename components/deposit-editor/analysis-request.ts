/**
 * The body of POST /api/v1/analyses for the rows of the editor: every row with a readable T and k,
 * in the document's units, with σ(ln k) from its stated uncertainty exactly as the stored analysis
 * computes it (lib/deposits/normalise). `rows` maps each posted point back to its table row.
 */
import { parseNumberText } from "@/lib/number-text";
import { sigmaLnKOf } from "@/lib/deposits/normalise";
import { toKelvin } from "@/lib/kinetics/units";
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
  /**
   * Zero-based table rows with a readable T and k that no fit can take (T at or below absolute zero
   * in its unit, k zero or negative): left out so the other rows are still fitted; the table's own
   * message beside the cell says what is wrong.
   */
  unfittable: number[];
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
  const unfittable: number[] = [];
  const kelvin = (T: number) => {
    try {
      return toKelvin(T, units.T);
    } catch {
      return Number.NaN; // below absolute zero, or a unit the editor would refuse anyway
    }
  };
  points.forEach((row, i) => {
    const T = parseNumberText(row.T);
    const k = parseNumberText(row.k);
    if (T === null || k === null) return;
    if (!(kelvin(T) > 0) || !(k > 0)) {
      unfittable.push(i);
      return;
    }
    const sigmaLnK = k > 0 ? validSigma(row, k) : undefined;
    out.push(sigmaLnK === undefined ? { T, k } : { T, k, sigmaLnK });
    rows.push(i);
  });
  return {
    body: { points: out, order, units: { k: units.k, T: units.T } },
    rows,
    skipped: points.length - out.length - unfittable.length,
    unfittable,
  };
}

/** The rows left out of the live fit because no fit can take their values; the table says why beside each cell. */
export function unfittableWords(rows: readonly number[]): string {
  const shown = rows.slice(0, 5).map((i) => i + 1);
  const more = rows.length - shown.length;
  const list = more > 0 ? `${shown.join(", ")} and ${more.toLocaleString("en")} more` : shown.join(shown.length === 2 ? " and " : ", ");
  return `Row${rows.length === 1 ? "" : "s"} ${list} left out of the fit: ${rows.length === 1 ? "its" : "their"} values cannot be fitted (the table says why).`;
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
