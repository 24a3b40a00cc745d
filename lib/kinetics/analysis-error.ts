/** Stable codes of {@link AnalysisError}; the API maps them to 422 responses. */
export type AnalysisErrorCode =
  | "invalid_input"
  | "invalid_order"
  | "invalid_point"
  | "too_few_points"
  | "too_few_temperatures"
  | "invalid_reference_temperature"
  | "invalid_reported_fit"
  | "mixed_orders"
  | "weights_out_of_range";

/**
 * Input that cannot be analysed. The message is written for the person who deposited the data;
 * `pointIndex` (zero-based) and `datasetId` locate the offending value when there is one.
 */
export class AnalysisError extends Error {
  readonly code: AnalysisErrorCode;
  readonly pointIndex?: number;
  readonly datasetId?: string;

  constructor(code: AnalysisErrorCode, message: string, where: { pointIndex?: number; datasetId?: string } = {}) {
    super(message);
    this.name = "AnalysisError";
    this.code = code;
    if (where.pointIndex !== undefined) this.pointIndex = where.pointIndex;
    if (where.datasetId !== undefined) this.datasetId = where.datasetId;
  }
}
