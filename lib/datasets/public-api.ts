import "server-only";
import { appUrl } from "@/lib/config";
import { versionPath } from "@/lib/identifiers/paths";
import { AppError } from "@/lib/errors";
import { parseIdOrNull } from "@/lib/ids";
import { buildPointsJson } from "./point-export";
import { getPublicVersionPoints, isPublicVersion } from "./public-version";
import { getDatasetSummary, getLatestAnalysis, getVersionWithRole, listPublicVersions } from "./queries";
import { FIT_CAUTION, versionToJson } from "./version-json";

/**
 * The REST API's public reads of datasets, by dataset id and version number as the pages are
 * addressed (/datasets/:id/v:n). Visibility is the pages' own: listPublicVersions and
 * isPublicVersion; any other version is not found, whoever asks.
 */

const NO_DATASET = "No published dataset with this id";
const NO_VERSION = "No published or retracted version with this number";

/** A dataset's public versions, newest first; 404 when it has none (or the id cannot be one). */
async function publicVersionsOrThrow(rawId: string) {
  const datasetId = parseIdOrNull(rawId);
  const versions = datasetId === null ? [] : await listPublicVersions({ datasetId });
  if (datasetId === null || !versions.length) throw new AppError("not_found", NO_DATASET);
  return { datasetId, versions };
}

/** The id of public version `n` of a dataset, or a 404. */
async function publicVersionIdOrThrow(rawId: string, rawNumber: string): Promise<number> {
  const { versions } = await publicVersionsOrThrow(rawId);
  const number = parseIdOrNull(rawNumber);
  const entry = versions.find((v) => v.number === number);
  if (!entry) throw new AppError("not_found", NO_VERSION);
  return entry.id;
}

const iso = (d: Date | null) => d?.toISOString() ?? null;

/** GET /api/v1/datasets/:id — the series: its identifier, newest public version and every public version. */
export async function getPublicDatasetJsonOrThrow(rawId: string) {
  const { datasetId, versions } = await publicVersionsOrThrow(rawId);
  const summary = await getDatasetSummary({ datasetId });
  const newest = versions.find((v) => v.state === "published") ?? versions[0];
  const found = await getVersionWithRole({ versionId: newest.id, userId: null });
  return {
    id: datasetId,
    seriesIdentifier: summary?.seriesIdentifier ?? null,
    title: found?.version.title ?? null,
    newestVersion: newest.number,
    landingPage: `${appUrl()}/datasets/${datasetId}`,
    versions: versions.map((v) => ({
      number: v.number,
      state: v.state,
      versionIdentifier: v.versionIdentifier,
      publishedAt: iso(v.publishedAt),
      retractedAt: iso(v.retractedAt),
      landingPage: `${appUrl()}${versionPath(datasetId, v.number)}`,
      href: `/api/v1/datasets/${datasetId}/versions/${v.number}`,
    })),
  };
}

/** GET /api/v1/datasets/:id/versions/:n — one public version: document, identifiers, state, analysis. */
export async function getPublicVersionJsonOrThrow(rawId: string, rawNumber: string) {
  const versionId = await publicVersionIdOrThrow(rawId, rawNumber);
  const found = await getVersionWithRole({ versionId, userId: null });
  if (!found || !isPublicVersion(found.version)) throw new AppError("not_found", NO_VERSION);
  // The lock version is the editors' concern; the public answer leaves it out.
  const json: Partial<Awaited<ReturnType<typeof versionToJson>>> = await versionToJson(found.version, { withDecisions: false });
  delete json.lockVersion;
  delete json.decisions;
  return { ...json, landingPage: `${appUrl()}${versionPath(found.version.datasetId, found.version.number)}` };
}

/** GET …/versions/:n/points — every point as the points.json download gives them. */
export async function getPublicPointsJsonOrThrow(rawId: string, rawNumber: string) {
  const loaded = await getPublicVersionPoints({ versionId: await publicVersionIdOrThrow(rawId, rawNumber) });
  if (!loaded) throw new AppError("not_found", NO_VERSION);
  return buildPointsJson(loaded.about, loaded.rows);
}

/** GET …/versions/:n/analysis — the newest re-fit of a public version, with its engine version. */
export async function getPublicAnalysisJsonOrThrow(rawId: string, rawNumber: string) {
  const versionId = await publicVersionIdOrThrow(rawId, rawNumber);
  const analysis = await getLatestAnalysis({ versionId });
  if (!analysis) throw new AppError("not_found", "This version has no analysis yet");
  return {
    engineVersion: analysis.engineVersion,
    createdAt: iso(analysis.createdAt),
    result: analysis.result,
    checks: analysis.checks,
    error: analysis.error,
    caution: FIT_CAUTION,
  };
}
