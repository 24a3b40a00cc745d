/**
 * The public pages identifiers resolve to, built in one place: a series to `/datasets/:id` (its
 * newest public version), a version to `/datasets/:id/v:n`. Pure: pages, route handlers, mail and
 * client components share it.
 */
export const seriesPath = (datasetId: number) => `/datasets/${datasetId}`;

export const versionPath = (datasetId: number, versionNumber: number) => `/datasets/${datasetId}/v${versionNumber}`;

/** Where a resolved identifier (lib/identifiers/queries.ts resolveIdentifier) leads. */
export function resolvedIdentifierPath(
  found:
    | { kind: "version" | "series"; datasetId: number; versionNumber?: number | null }
    | { kind: "collection_version"; collectionId: number; versionNumber: number }
    | { kind: "collection"; collectionId: number },
): string {
  if (found.kind === "collection_version") return collectionVersionPath(found.collectionId, found.versionNumber);
  if (found.kind === "collection") return collectionPath(found.collectionId);
  return found.kind === "version" && found.versionNumber != null
    ? versionPath(found.datasetId, found.versionNumber)
    : seriesPath(found.datasetId);
}

/** The page of a species, by its standard InChIKey. */
export const speciesPath = (inchiKey: string) => `/species/${inchiKey}`;

/** The page of a reaction class, by its id in the deposit schema. */
export const classPath = (classId: string) => `/classes/${classId}`;

/** A collection's page (its newest published version) and one version of it. */
export const collectionPath = (collectionId: number) => `/collections/${collectionId}`;
export const collectionVersionPath = (collectionId: number, versionNumber: number) =>
  `/collections/${collectionId}/versions/${versionNumber}`;
