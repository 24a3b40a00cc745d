import { appUrl } from "@/lib/config";
import { buildDatasetJsonLd, jsonLdScript } from "@/lib/citation/json-ld";
import type { VersionDto } from "@/lib/datasets/queries";
import type { DepositDocument } from "@/lib/deposits/types";
import { DEFAULT_LICENCE } from "@/lib/identifiers/datacite";
import { versionPath } from "@/lib/identifiers/paths";
import { getCanonicalRateConstantUnit } from "@/lib/kinetics/units";

/** schema.org Dataset JSON-LD of a public version page (lib/citation/json-ld.ts). */
export function DatasetJsonLd({
  version,
  doc,
  seriesIdentifier,
  verifiedCreatorIds,
}: {
  version: VersionDto;
  doc: DepositDocument;
  seriesIdentifier: string | null;
  /** Position in `doc.creators` → the iD verified on the linked account: the only iDs named (a typed one proves nothing). */
  verifiedCreatorIds: ReadonlyMap<number, string>;
}) {
  const site = appUrl();
  const points = `${site}/api/v1/versions/${version.id}/points`;
  const value = buildDatasetJsonLd({
    url: `${site}${versionPath(version.datasetId, version.number)}`,
    siteUrl: site,
    title: version.title,
    description: doc.description ?? "",
    versionNumber: version.number,
    versionIdentifier: version.versionIdentifier,
    seriesIdentifier,
    publishedAt: version.publishedAt,
    retracted: version.state === "retracted",
    creators: (doc.creators ?? []).map((c, position) => ({
      name: c.name,
      ...(c.affiliation ? { affiliation: c.affiliation } : {}),
      ...(verifiedCreatorIds.has(position) ? { orcid: verifiedCreatorIds.get(position) } : {}),
    })),
    keywords: doc.keywords ?? [],
    licence: doc.license ?? DEFAULT_LICENCE,
    tRange: version.tMin !== null && version.tMax !== null ? { min: version.tMin, max: version.tMax } : null,
    kUnit: getCanonicalRateConstantUnit(doc.reaction.order),
    hasPressure: doc.conditions?.pressure !== undefined || doc.points.some((p) => p.pressure !== undefined),
    downloads: [
      { name: "Points as CSV", contentUrl: `${points}.csv`, encodingFormat: "text/csv" },
      { name: "Points as JSON", contentUrl: `${points}.json`, encodingFormat: "application/json" },
    ],
    source: doc.source ? { doi: doc.source.doi ?? doc.source.reference?.DOI ?? null, title: doc.source.reference?.title ?? null } : null,
  });
  // The JSON is escaped for a script element (jsonLdScript): no "<" reaches the HTML.
  return <script type="application/ld+json" dangerouslySetInnerHTML={{ __html: jsonLdScript(value) }} />;
}
