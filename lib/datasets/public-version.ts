import "server-only";
import { appUrl } from "@/lib/config";
import { citationLine } from "@/lib/citation/citation-line";
import { versionCitationSubject } from "@/lib/citation/subjects";
import type { DepositDocument } from "@/lib/deposits/types";
import { DEFAULT_LICENCE } from "@/lib/identifiers/datacite";
import { versionPath } from "@/lib/identifiers/paths";
import { getCanonicalRateConstantUnit } from "@/lib/kinetics/units";
import type { PointsAbout } from "./point-export";
import { buildPointRows, residualModel } from "./point-table";
import { getLatestAnalysis, getVersionPointRows, type VersionDto } from "./queries";
import { versionForAnyoneOf } from "./request-cache";
import { drawableFit, FIT_CAUTION } from "./version-json";

/** The states whose versions anyone may read; every other version is not found (never forbidden). */
const PUBLIC_STATES = new Set(["published", "retracted"]);

/** True for a version anyone may read. */
export const isPublicVersion = (v: Pick<VersionDto, "state">) => PUBLIC_STATES.has(v.state);

/** The citation line of a public version, as its page and downloads write it. */
export function citeVersion(
  version: Pick<VersionDto, "datasetId" | "title" | "number" | "versionIdentifier" | "publishedAt" | "payload" | "state" | "retractedAt">,
): string {
  return citationLine(versionCitationSubject(version, `${appUrl()}${versionPath(version.datasetId, version.number)}`));
}

/**
 * One published or retracted version with its data table rows and the header of its downloads;
 * null for any other version (draft, submitted, in review, returned, declined) or none at all.
 */
export async function getPublicVersionPoints({ versionId }: { versionId: number }) {
  const found = await versionForAnyoneOf(versionId);
  if (!found || !isPublicVersion(found.version)) return null;
  const version = found.version;
  const doc = version.payload as unknown as DepositDocument;
  const [stored, analysisRow] = await Promise.all([getVersionPointRows({ versionId }), getLatestAnalysis({ versionId })]);
  const analysis = drawableFit(analysisRow?.result);
  const rows = buildPointRows(doc, stored, analysis);
  const about: PointsAbout = {
    versionIdentifier: version.versionIdentifier,
    title: version.title,
    versionNumber: version.number,
    state: version.state,
    retraction: version.state === "retracted" ? { at: version.retractedAt?.toISOString() ?? null, notice: version.retractionNotice } : null,
    licence: doc.license ?? DEFAULT_LICENCE,
    citation: citeVersion(version),
    landingPage: `${appUrl()}${versionPath(version.datasetId, version.number)}`,
    caution: FIT_CAUTION,
    otherConditions: doc.conditions?.notes ?? null,
    canonicalUnits: { T: "K", k: getCanonicalRateConstantUnit(doc.reaction.order), pressure: "Pa" },
    residuals: analysis
      ? { model: residualModel(analysis), weighted: analysis.weighted, engineVersion: analysisRow?.engineVersion ?? null }
      : null,
  };
  return { version, doc, analysis, rows, about };
}

/** The download's file name: the version identifier's code and number, else the dataset and version numbers. */
export function pointsFileName(version: Pick<VersionDto, "versionIdentifier" | "datasetId" | "number">, ext: "csv" | "json"): string {
  const code = version.versionIdentifier
    ?.split("/")
    .slice(1)
    .join("-")
    .replace(/[^A-Za-z0-9.-]+/g, "-");
  return `${code || `dataset-${version.datasetId}-v${version.number}`}-points.${ext}`;
}
