import { z } from "zod";
import {
  AnalysisError,
  UnitError,
  analyseDataset,
  getCanonicalRateConstantUnit,
  toCanonicalRateConstant,
  toKelvin,
  type AnalysisResult,
  type ReactionOrder,
} from "@/lib/kinetics";
import { AppError, type FieldError } from "@/lib/errors";

export const MAX_POINTS = 100_000;
/** Largest accepted request body: 100 000 points with uncertainties fit comfortably. */
export const MAX_BODY_BYTES = 12 * 1024 * 1024;

export const CAUTION =
  "Extrapolation outside the measured temperature range is unreliable, and safety-critical use (reactor, storage, process hazards) needs qualified review under local codes.";

const finite = z.number({ error: "must be a number" }).finite("must be a finite number");

/** Body of POST /api/v1/analyses; shared by the route, the /analyse page and the API document. */
export const analysisRequestSchema = z
  .object({
    points: z
      .array(z.object({ T: finite, k: finite, sigmaLnK: finite.optional() }).strict(), { error: "must be a list of {T, k} points" })
      .min(2, "at least two points are needed")
      .max(MAX_POINTS, `at most ${MAX_POINTS.toLocaleString("en")} points per request`),
    order: z.union([z.literal(1), z.literal(2), z.literal(3)], { error: "order must be 1, 2 or 3" }),
    T0: finite.positive().optional(),
    units: z.object({ k: z.string().optional(), T: z.string().optional() }).strict().optional(),
  })
  .strict();

export type AnalysisRequest = z.infer<typeof analysisRequestSchema>;

export interface AnalysisResponse {
  units: { k: string; T: "K"; Ea: "J mol-1"; dS: "J mol-1 K-1" };
  analysis: AnalysisResult;
  caution: string;
}

/**
 * Converts the points to canonical units and runs the engine. Unit and analysis errors become
 * 422s that point at the offending field or row.
 */
export function runAnalysisOrThrow(request: AnalysisRequest): AnalysisResponse {
  const order = request.order as ReactionOrder;
  const kUnit = request.units?.k ?? getCanonicalRateConstantUnit(order);
  const TUnit = request.units?.T ?? "K";
  const points = [];
  for (let i = 0; i < request.points.length; i++) {
    const p = request.points[i];
    let T: number;
    let k: number;
    try {
      T = toKelvin(p.T, TUnit);
    } catch (err) {
      throw toProblem(err, i === 0 && err instanceof UnitError && err.code === "unknown_unit" ? "/units/T" : `/points/${i}/T`, p.T);
    }
    try {
      k = toCanonicalRateConstant(p.k, kUnit, order);
    } catch (err) {
      throw toProblem(
        err,
        err instanceof UnitError && (err.code === "unknown_unit" || err.code === "order_mismatch") ? "/units/k" : `/points/${i}/k`,
        p.k,
      );
    }
    points.push(p.sigmaLnK === undefined ? { T, k } : { T, k, sigmaLnK: p.sigmaLnK });
  }
  try {
    const analysis = analyseDataset({ points, order, ...(request.T0 ? { T0: request.T0 } : {}) });
    return { units: { k: getCanonicalRateConstantUnit(order), T: "K", Ea: "J mol-1", dS: "J mol-1 K-1" }, analysis, caution: CAUTION };
  } catch (err) {
    if (err instanceof AnalysisError) {
      const pointer = err.pointIndex !== undefined ? `/points/${err.pointIndex}` : err.code === "invalid_order" ? "/order" : "/points";
      throw new AppError("validation_failed", err.message, [{ pointer, message: err.message }]);
    }
    throw err;
  }
}

function toProblem(err: unknown, pointer: string, value: unknown): AppError {
  if (err instanceof UnitError || err instanceof AnalysisError) {
    const fe: FieldError = { pointer, message: err.message, value };
    return new AppError("validation_failed", err.message, [fe]);
  }
  return err instanceof AppError ? err : new AppError("internal", "Unit conversion failed");
}
