import { configuredDoiPrefix } from "@/lib/config";

/** Test prefix of the DOI system's registration agencies' sandboxes; set DOI_PREFIX in production. */
export const DEFAULT_DOI_PREFIX = "10.5072";

export function doiPrefix(): string {
  return configuredDoiPrefix() ?? DEFAULT_DOI_PREFIX;
}

/** Series identifier: one per dataset, resolving to its newest published version. */
export function seriesIdentifier(datasetId: number, prefix = doiPrefix()): string {
  return `${prefix}/arrhenia.${datasetId}`;
}

/** Version identifier: one per published version, never reused. */
export function versionIdentifier(datasetId: number, versionNumber: number, prefix = doiPrefix()): string {
  return `${prefix}/arrhenia.${datasetId}.v${versionNumber}`;
}

/** DOI syntax (the part after "doi:"): "10." registrant code, "/", a non-empty suffix. */
export function isDoiSyntax(value: string): boolean {
  return /^10\.\d{4,9}(\.\d+)*\/\S+$/.test(value);
}
