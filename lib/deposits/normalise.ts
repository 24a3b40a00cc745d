/**
 * From a validated deposit document to canonical numbers: T in K, k in the canonical unit of the
 * reaction order (s⁻¹, cm³ molecule⁻¹ s⁻¹, cm⁶ molecule⁻² s⁻¹), pressure in Pa, uncertainty as
 * σ(ln k); and from there to the input of analyseDataset. Conversions are those of
 * lib/kinetics/units (CODATA 2018 constants). Every point keeps its deposited value and unit.
 */
import {
  REFERENCE_TEMPERATURE,
  sigmaLnKFromAbsolute,
  sigmaLnKFromFactor,
  sigmaLnKFromRelative,
  toCanonicalRateConstant,
  toJoulesPerMole,
  toKelvin,
  toPascal,
  type AnalysisInput,
  type ReportedFit,
} from "@/lib/kinetics";
import type { DepositDocument, DepositPoint, PointUncertainty } from "./types";
import { CONFIDENCE_LEVELS } from "./vocabulary";

/** One point in canonical units, with what was deposited. */
export interface CanonicalPoint {
  /** Temperature, K. */
  T: number;
  /** Rate constant in the canonical unit of the reaction order. */
  k: number;
  /** Standard uncertainty of ln k (dimensionless). */
  sigmaLnK?: number;
  /** Pressure, Pa: the point's own, else the dataset's single pressure. */
  pressurePa?: number;
  /** The point's bath gas, else the dataset's. */
  bathGas?: string;
  note?: string;
  /** The numbers and units as deposited. */
  original: { T: number; k: number; unitT: string; unitK: string };
}

/** Coverage factor z of a confidence level: 1 for 1σ, 2 for 2σ. */
function coverageOf(u: PointUncertainty): number {
  return CONFIDENCE_LEVELS.find((c) => c.id === (u.confidence ?? "1sigma"))?.coverage ?? 1;
}

/**
 * σ(ln k) of one point: absolute σ_k/k, relative p/100, factor ln f — each divided by the
 * coverage z (2 for a 2σ statement) to give a standard uncertainty (GUM JCGM 100:2008 §5.1.2, §6.2).
 * k and an absolute uncertainty are in the same unit, so the ratio needs no conversion.
 */
export function sigmaLnKOf(point: Pick<DepositPoint, "k" | "uncertainty">): number | undefined {
  const u = point.uncertainty;
  if (!u) return undefined;
  const z = coverageOf(u);
  switch (u.kind) {
    case "absolute":
      return sigmaLnKFromAbsolute(point.k, u.value) / z;
    case "relative":
      return sigmaLnKFromRelative(u.value) / z;
    case "factor":
      return sigmaLnKFromFactor(u.value, z);
  }
}

/**
 * Canonical points of a validated document, in document order.
 *
 * @throws UnitError when given a document that validateDeposit would refuse (bad units, T ≤ 0 K).
 * @example normalisePoints(EXAMPLE_DEPOSIT)[0].k // 2.09e-15 (already cm³ molecule⁻¹ s⁻¹)
 */
export function normalisePoints(doc: DepositDocument): CanonicalPoint[] {
  const { units, reaction, conditions } = doc;
  const order = reaction.order;
  const datasetPressure = conditions?.pressure?.value;
  return doc.points.map((p) => {
    const T = toKelvin(p.T, units.T);
    const out: CanonicalPoint = {
      T,
      k: toCanonicalRateConstant(p.k, units.k, order),
      original: { T: p.T, k: p.k, unitT: units.T, unitK: units.k },
    };
    const sigma = sigmaLnKOf(p);
    if (sigma !== undefined) out.sigmaLnK = sigma;
    const pressure = p.pressure ?? datasetPressure;
    if (pressure !== undefined && units.pressure) out.pressurePa = toPascal(pressure, units.pressure);
    const bathGas = p.bathGas ?? conditions?.bathGas;
    if (bathGas !== undefined) out.bathGas = bathGas;
    if (p.note !== undefined) out.note = p.note;
    return out;
  });
}

/** Input of analyseDataset built from a deposit; a reported fit always states n and T0 (its range only when the document does). */
export interface DepositAnalysisInput extends AnalysisInput {
  reportedFit?: Required<Pick<ReportedFit, "A" | "n" | "Ea" | "T0">> & Pick<ReportedFit, "Tmin" | "Tmax">;
}

/**
 * The input of analyseDataset for a validated document: canonical points, the reaction order, the
 * reference temperature T0 (the reported fit's, in K, when it states one) and the reported fit
 * with A in canonical units, Ea in J mol⁻¹, T0 in K (298.15 K when not stated) and its stated
 * validity range in K.
 */
export function toAnalysisInput(doc: DepositDocument): DepositAnalysisInput {
  const points = normalisePoints(doc).map(({ T, k, sigmaLnK }) => (sigmaLnK === undefined ? { T, k } : { T, k, sigmaLnK }));
  const input: DepositAnalysisInput = { points, order: doc.reaction.order };
  const fit = doc.reportedFit;
  if (fit) {
    const T0 = fit.T0 !== undefined ? toKelvin(fit.T0, doc.units.T) : undefined;
    if (T0 !== undefined) input.T0 = T0;
    input.reportedFit = {
      A: toCanonicalRateConstant(fit.A, doc.units.k, doc.reaction.order),
      n: fit.model === "modified_arrhenius" ? (fit.n ?? 0) : 0,
      Ea: toJoulesPerMole(fit.Ea, fit.EaUnit),
      T0: T0 ?? REFERENCE_TEMPERATURE,
    };
    const rangeUnit = fit.rangeUnit ?? doc.units.T;
    if (fit.Tmin !== undefined) input.reportedFit.Tmin = toKelvin(fit.Tmin, rangeUnit);
    if (fit.Tmax !== undefined) input.reportedFit.Tmax = toKelvin(fit.Tmax, rangeUnit);
  }
  return input;
}
