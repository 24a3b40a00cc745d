import "server-only";
import { CAUTION } from "@/lib/analyses/analyse-request";
import { extrapolationOf, GAS_CONSTANT, REFERENCE_TEMPERATURE, type AnalysisResult, type ArrheniusFit } from "@/lib/kinetics";
import { t95 } from "@/lib/kinetics/distributions";
import { getLatestAnalysis, listDecisions } from "./queries";
import type { VersionDto } from "./queries";

/** The one caution sentence (lib/analyses/analyse-request.ts), under the name pages and downloads use. */
export const FIT_CAUTION = CAUTION;

/**
 * A stored analysis result that pages can draw: the fit and its band. Re-fits and older engines may
 * have stored less (an error, flags only); pages then show no fit rather than failing.
 */
export function drawableFit(result: unknown): AnalysisResult | null {
  const r = result as Partial<AnalysisResult> | null | undefined;
  return r?.arrhenius?.params && Array.isArray(r.band?.T) && r.band.T.length > 1 ? withCurrentFields(r as AnalysisResult) : null;
}

type StoredFit = Partial<Pick<ArrheniusFit, "scaleFactor" | "residualSDLnK" | "residuals" | "fitted">> & {
  residualSD: number | null;
};

/**
 * A stored result with the fields engines before kinetics-2 did not write, derived from what they
 * did write (the band spans the measured range; the covariance gives k at mid-range). Per-point
 * residuals and fitted values cannot be derived and stay empty. Messages of such flags are shown
 * as stored (formatFlagMessage).
 */
function withCurrentFields(r: AnalysisResult): AnalysisResult {
  const Tmin = r.band.T[0];
  const Tmax = r.band.T[r.band.T.length - 1];
  const spread = <F extends StoredFit>(f: F) => ({
    ...f,
    scaleFactor: f.scaleFactor !== undefined ? f.scaleFactor : r.weighted ? f.residualSD : null,
    residualSDLnK: f.residualSDLnK !== undefined ? f.residualSDLnK : r.weighted ? null : f.residualSD,
    residuals: f.residuals ?? [],
    fitted: f.fitted ?? [],
  });
  const a = r.arrhenius;
  const arrhenius: ArrheniusFit = {
    ...spread(a),
    k298: a.k298?.extrapolated !== undefined ? a.k298 : { ...a.k298, ...extrapolationOf(REFERENCE_TEMPERATURE, Tmin, Tmax) },
    kMid: a.kMid ?? arrheniusFromCovariance(a, 2 / (1 / Tmin + 1 / Tmax)),
  };
  return {
    ...r,
    arrhenius,
    modifiedArrhenius: r.modifiedArrhenius ? spread(r.modifiedArrhenius) : null,
    curvature: r.curvature
      ? { ...r.curvature, dfNum: r.curvature.dfNum ?? 1, dfDenom: r.curvature.dfDenom ?? r.n - 3, exact: r.curvature.exact ?? false }
      : null,
  };
}

/** Arrhenius k at T with its 95 % interval from the stored parameters and covariance. */
function arrheniusFromCovariance(a: ArrheniusFit, T: number): ArrheniusFit["kMid"] {
  const x = -1 / (GAS_CONSTANT * T);
  const lnk = a.params.lnA + a.params.Ea * x;
  const finite = (v: number) => (Number.isFinite(v) ? v : null);
  const c = a.covariance;
  if (!c || a.dof <= 0) return { T, value: finite(Math.exp(lnk)), lower: null, upper: null };
  const half = t95(a.dof) * Math.sqrt(Math.max(0, c[0][0] + 2 * x * c[0][1] + x * x * c[1][1]));
  return { T, value: finite(Math.exp(lnk)), lower: finite(Math.exp(lnk - half)), upper: finite(Math.exp(lnk + half)) };
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
