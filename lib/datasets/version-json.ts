import "server-only";
import { getLatestAnalysis, listDecisions } from "./queries";
import type { VersionDto } from "./queries";

export const FIT_CAUTION =
  "Extrapolation outside the measured temperature range is unreliable, and safety-critical use (reactor, storage, process hazards) needs qualified review under local codes.";

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
