/**
 * Arrhenia kinetics engine: pure computation on rate constants k(T). No I/O, no framework.
 * The conventions of analyseDataset (units, weights, covariance, AICc, diagnostics, band, flag
 * thresholds, null-instead-of-NaN) are listed in conventions.ts and published on /docs/api.
 * Invalid input throws {@link AnalysisError} (code, zero-based pointIndex, message for people).
 */
export { analyseDataset } from "./analyse-dataset";
export { AnalysisError, type AnalysisErrorCode } from "./analysis-error";
export {
  combineEffectsDL,
  consensus,
  matchUnitMistake,
  type CombinedEffects,
  type ComparisonPoint,
  type ConsensusArrhenius,
  type ConsensusDataset,
  type ConsensusFlag,
  type ConsensusFlagCode,
  type ConsensusMember,
  type ConsensusModifiedArrhenius,
  type ConsensusOptions,
  type ConsensusResult,
  type ConsensusShares,
  type Disagreement,
  type SupportValue,
  type UncertaintyFactor,
} from "./consensus";
export * from "./constants";
export { ANALYSIS_CONVENTIONS, CONSENSUS_CONVENTIONS } from "./conventions";
export { evaluateRateExpression, type RateExpression } from "./evaluate-expression";
export { extrapolationOf } from "./extrapolation";
export { describeExtrapolation, describeWeightedErrors, formatFlagMessage, formatP, type FlagUnits } from "./flag-text";
export { cooksDistanceBound } from "./influence-bound";
export { solveLeastSquares, LeastSquaresError, type LeastSquaresOptions, type LeastSquaresResult } from "./least-squares";
export {
  SUPPORTED_UNITS,
  UnitError,
  convertEnergy,
  convertPressure,
  convertRateConstant,
  convertRateConstantBetween,
  convertTemperature,
  displayConversion,
  fromCanonicalRateConstant,
  getCanonicalRateConstantUnit,
  normaliseUnitText,
  parseEnergyUnit,
  parsePressureUnit,
  parseRateConstantUnit,
  parseTemperatureUnit,
  sigmaLnKFromAbsolute,
  sigmaLnKFromFactor,
  sigmaLnKFromRelative,
  toCanonicalRateConstant,
  toJoulesPerMole,
  toKelvin,
  toPascal,
  type LinearUnit,
  type RateConstantUnit,
  type UnitDefinition,
  type UnitErrorCode,
  type UnitKind,
} from "./units";
export type * from "./types";
