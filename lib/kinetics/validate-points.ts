/**
 * Checks shared by the single-dataset analysis and the consensus: reaction order and points.
 */
import { AnalysisError } from "./analysis-error";
import type { RatePoint, ReactionOrder } from "./types";

/** Throw unless order is 1, 2 or 3. */
export function assertReactionOrder(order: unknown, datasetId?: string): asserts order is ReactionOrder {
  if (order !== 1 && order !== 2 && order !== 3) {
    throw new AnalysisError("invalid_order", `${prefix(datasetId)}Reaction order must be 1, 2 or 3 (got ${describe(order)}).`, {
      datasetId,
    });
  }
}

/**
 * Throw an {@link AnalysisError} naming the first point whose T, k or sigmaLnK is not a positive
 * finite number. Returns whether every point states sigmaLnK (null/undefined mean "not stated").
 */
export function checkPoints(points: unknown, datasetId?: string): { allSigma: boolean; someSigma: boolean } {
  if (!Array.isArray(points)) {
    throw new AnalysisError("invalid_input", `${prefix(datasetId)}points must be an array of { T, k } objects.`, { datasetId });
  }
  let withSigma = 0;
  for (let i = 0; i < points.length; i++) {
    const pt = points[i] as Partial<RatePoint> | null;
    if (pt === null || typeof pt !== "object") {
      throw new AnalysisError("invalid_point", `${where(i, datasetId)} is not an object with T and k.`, { pointIndex: i, datasetId });
    }
    if (!isPositiveFinite(pt.T)) {
      throw new AnalysisError(
        "invalid_point",
        `${where(i, datasetId)} has temperature T = ${describe(pt.T)}; temperatures must be positive finite numbers in kelvin.`,
        { pointIndex: i, datasetId },
      );
    }
    if (!isPositiveFinite(pt.k)) {
      throw new AnalysisError(
        "invalid_point",
        `${where(i, datasetId)} has rate constant k = ${describe(pt.k)}; rate constants must be positive finite numbers (a logarithm is taken).`,
        { pointIndex: i, datasetId },
      );
    }
    if (pt.sigmaLnK !== undefined && pt.sigmaLnK !== null) {
      if (!isPositiveFinite(pt.sigmaLnK)) {
        throw new AnalysisError(
          "invalid_point",
          `${where(i, datasetId)} has uncertainty sigmaLnK = ${describe(pt.sigmaLnK)}; it must be a positive finite number (or left out).`,
          { pointIndex: i, datasetId },
        );
      }
      withSigma++;
    }
  }
  return { allSigma: points.length > 0 && withSigma === points.length, someSigma: withSigma > 0 };
}

/** "Point 3 (points[2])", written only for a message (every point is checked, few are wrong). */
function where(i: number, datasetId?: string): string {
  return `${prefix(datasetId)}Point ${i + 1} (points[${i}])`;
}

function isPositiveFinite(v: unknown): v is number {
  return typeof v === "number" && Number.isFinite(v) && v > 0;
}

function prefix(datasetId?: string): string {
  return datasetId === undefined ? "" : `Dataset ${datasetId}: `;
}

/** Readable rendering of a bad value for messages. */
export function describe(v: unknown): string {
  if (v === undefined) return "missing";
  if (v === null) return "null";
  if (typeof v === "string") return JSON.stringify(v);
  return String(v);
}
