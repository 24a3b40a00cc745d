/**
 * The deposit document: schema validation with plain-English errors, table import, and
 * normalisation to canonical points for the kinetics engine.
 */
export { EXAMPLE_DEPOSIT } from "./example";
export {
  MAX_IMPORT_ERRORS,
  MAX_UPLOAD_BYTES,
  PREVIEW_ROWS,
  applyMapping,
  assertUploadSize,
  checkUploadSize,
  guessColumnRole,
  inspectTable,
  type ApplyMappingOptions,
  type ColumnMapping,
  type InspectedTable,
} from "./import-table";
export { normalisePoints, sigmaLnKOf, toAnalysisInput, type CanonicalPoint, type DepositAnalysisInput } from "./normalise";
export { depositSchema } from "./schema";
export type * from "./types";
export {
  MAX_DOCUMENT_BYTES,
  MAX_VALIDATION_ERRORS,
  parseAndValidateDeposit,
  parseDepositJson,
  validateDeposit,
  type ValidationResult,
} from "./validate";
export * from "./vocabulary";
export { utf8ByteLength } from "./byte-length";
