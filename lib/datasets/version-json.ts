import "server-only";
import type { AnalysisResult } from "@/lib/kinetics";
import { getLatestAnalysis, listDecisions } from "./queries";
import type { VersionDto } from "./queries";

export const FIT_CAUTION =
  "Extrapolation outside the measured temperature range is unreliable, and safety-critical use (reactor, storage, process hazards) needs qualified review under local codes.";

/**
 * A stored analysis result that pages can draw: the fit and its band. Re-fits and older engines may
 * have stored less (an error, flags only); pages then show no fit rather than failing.
 */
export function drawableFit(result: unknown): AnalysisResult | null {
  const r = result as Partial<AnalysisResult> | null | undefined;
  return r?.arrhenius?.params && Array.isArray(r.band?.T) ? (r as AnalysisResult) : null;
}

/** The API's view of one version: its document, state, identifiers, checks and decisions. */
export async function versionToJson(version: VersionDto, { withDecisions }: { withDecisions: boolean }) {
  const analysis = await getLatestAnalysis({ versionId: version.id });
  return {
    id: version.id,
    datasetId: version.datasetId,
    number: version.number,
    state: version.state,
    title: version.title,
    lockVersion: version.lockVersion,
    versionIdentifier: version.versionIdentifier,
    payloadSha256: version.payloadSha256,
    publishedAt: version.publishedAt,
    retraction: version.retractedAt ? { at: version.retractedAt, notice: version.retractionNotice } : null,
    document: version.payload,
    analysis: analysis ? { engineVersion: analysis.engineVersion, result: analysis.result, checks: analysis.checks } : null,
    decisions: withDecisions ? await listDecisions({ versionId: version.id }) : undefined,
    caution: FIT_CAUTION,
  };
}
