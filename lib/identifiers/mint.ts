import { configuredDoiPrefix } from "@/lib/config";
import { newSeriesIdentifier, versionIdentifierOf } from "./series-code";

/** Test prefix of the DOI system's registration agencies' sandboxes; set DOI_PREFIX in production. */
export const DEFAULT_DOI_PREFIX = "10.5072";

export function doiPrefix(): string {
  return configuredDoiPrefix() ?? DEFAULT_DOI_PREFIX;
}

/** A new series identifier (one per dataset, resolving to its newest published version): `10.5072/ARH-4F7K-9QXM`. */
export function mintSeriesIdentifier(prefix = doiPrefix()): string {
  return newSeriesIdentifier(prefix);
}

/** Version identifier: one per published version, never reused, derived from its series: `10.5072/ARH-4F7K-9QXM/2`. */
export function versionIdentifier(series: string, versionNumber: number): string {
  return versionIdentifierOf(series, versionNumber);
}

/** DOI syntax (the part after "doi:"): "10." registrant code, "/", a non-empty suffix. */
export function isDoiSyntax(value: string): boolean {
  return /^10\.\d{4,9}(\.\d+)*\/\S+$/.test(value);
}
