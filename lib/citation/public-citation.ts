import "server-only";
import { appUrl } from "@/lib/config";
import type { listPublicVersions, VersionDto } from "@/lib/datasets/queries";
import { datasetSummaryOf, publicVersionsOf, versionForAnyoneOf } from "@/lib/datasets/request-cache";
import { seriesPath, versionPath } from "@/lib/identifiers/paths";
import { buildCslItem, sourceCslItem, type CitationSubject, type CslItem } from "./csl";
import { seriesCitationSubject, versionCitationSubject } from "./subjects";

export interface PublicCitation {
  /** The version cited (or, for a series, the newest public version that describes it). */
  version: VersionDto;
  /** Every public version, newest first. */
  versions: Awaited<ReturnType<typeof listPublicVersions>>;
  seriesIdentifier: string | null;
  versionSubject: CitationSubject;
  seriesSubject: CitationSubject;
  versionItem: CslItem;
  seriesItem: CslItem;
  /** The source publication the deposit names, as a CSL item; null when it names none with a reference. */
  sourceItem: CslItem | null;
  /** The source publication's DOI, when the deposit gives one. */
  sourceDoi: string | null;
}

/**
 * The citations of one public dataset: of version `versionNumber` (a published or retracted one),
 * or, without it, of the newest published version (the newest retracted one if every version is
 * retracted) and the series. Null when there is no such public version: drafts and versions under
 * review are not found, whoever asks.
 */
export async function getPublicCitation({
  datasetId,
  versionNumber,
}: {
  datasetId: number;
  versionNumber?: number;
}): Promise<PublicCitation | null> {
  const versions = await publicVersionsOf(datasetId);
  if (!versions.length) return null;
  const entry =
    versionNumber === undefined
      ? (versions.find((v) => v.state === "published") ?? versions[0])
      : versions.find((v) => v.number === versionNumber);
  if (!entry) return null;
  const newestEntry = versions.find((v) => v.state === "published") ?? versions[0];
  const [found, newestFound, dataset] = await Promise.all([
    versionForAnyoneOf(entry.id),
    newestEntry.id === entry.id ? null : versionForAnyoneOf(newestEntry.id),
    datasetSummaryOf(datasetId),
  ]);
  if (!found) return null;
  const version = found.version;
  const newest = newestFound?.version ?? version;
  const base = appUrl();
  const versionSubject = versionCitationSubject(version, `${base}${versionPath(datasetId, version.number)}`);
  const seriesSubject = seriesCitationSubject(newest, {
    seriesIdentifier: dataset?.seriesIdentifier ?? null,
    firstPublishedAt: versions.at(-1)?.publishedAt ?? null,
    url: `${base}${seriesPath(datasetId)}`,
  });
  const source = (version.payload.source ?? undefined) as { doi?: unknown; reference?: unknown } | undefined;
  const sourceItem = sourceCslItem(source);
  const doi = typeof source?.doi === "string" ? source.doi : null;
  return {
    version,
    versions,
    seriesIdentifier: dataset?.seriesIdentifier ?? null,
    versionSubject,
    seriesSubject,
    versionItem: buildCslItem(versionSubject),
    seriesItem: buildCslItem(seriesSubject),
    sourceItem,
    sourceDoi: (sourceItem?.DOI as string | undefined) ?? doi,
  };
}
