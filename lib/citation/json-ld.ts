/**
 * schema.org `Dataset` JSON-LD of a public version page. Pure. The context is written inline
 * (schema.org's vocabulary, addresses typed as IRIs), so a JSON-LD processor expands it with no
 * network. Temperatures are not `temporalCoverage` (that is time): T, k and p are
 * `variableMeasured`, each with its unit.
 */
import { creatorName, familyWithParticle } from "./names";
import { orcidUri, normaliseDoi } from "@/lib/identifiers/datacite";
import { PUBLISHER } from "./csl";

export const SCHEMA_ORG = "https://schema.org/";

const CONTEXT = {
  "@vocab": SCHEMA_ORG,
  url: { "@type": "@id" },
  license: { "@type": "@id" },
  contentUrl: { "@type": "@id" },
  sameAs: { "@type": "@id" },
};

export interface DatasetJsonLdInput {
  /** Absolute landing page of the version. */
  url: string;
  /** Absolute address of the site (the data catalogue). */
  siteUrl: string;
  title: string;
  description: string;
  versionNumber: number;
  versionIdentifier: string | null;
  seriesIdentifier: string | null;
  publishedAt: Date | null;
  retracted: boolean;
  creators: { name: string; orcid?: string; affiliation?: string }[];
  keywords: string[];
  licence: string;
  /** Temperature range of the points, K. */
  tRange: { min: number; max: number } | null;
  /** The canonical unit of k for the reaction's order (cm³ molecule⁻¹ s⁻¹, …). */
  kUnit: string;
  /** True when any point or the conditions give a pressure. */
  hasPressure: boolean;
  /** Absolute download addresses with their media types. */
  downloads: { name: string; contentUrl: string; encodingFormat: string }[];
  /** The source publication: its DOI and title, when the deposit names one. */
  source: { doi: string | null; title: string | null } | null;
}

const doiUrl = (doi: string) => `https://doi.org/${doi}`;

/** The JSON-LD object (serialise with `jsonLdScript`). */
export function buildDatasetJsonLd(input: DatasetJsonLdInput): Record<string, unknown> {
  const sourceDoi = input.source?.doi ? normaliseDoi(input.source.doi) : null;
  return {
    "@context": CONTEXT,
    "@type": "Dataset",
    "@id": input.url,
    url: input.url,
    name: input.title,
    description: input.description.slice(0, 5000) || input.title,
    ...(input.versionIdentifier
      ? {
          identifier: { "@type": "PropertyValue", propertyID: "DOI", value: input.versionIdentifier, url: doiUrl(input.versionIdentifier) },
        }
      : {}),
    version: String(input.versionNumber),
    ...(input.publishedAt ? { datePublished: input.publishedAt.toISOString().slice(0, 10) } : {}),
    ...(input.retracted ? { creativeWorkStatus: "Retracted" } : {}),
    creator: input.creators.map((c) => {
      const orcid = orcidUri(c.orcid);
      // The same name parts as the CSL item and the DataCite creators (names.ts).
      const parts = creatorName(c.name);
      return {
        "@type": parts.kind === "organisation" ? "Organization" : "Person",
        ...(orcid ? { "@id": orcid } : {}),
        name: c.name,
        ...(parts.kind === "person" ? { familyName: familyWithParticle(parts), ...(parts.given ? { givenName: parts.given } : {}) } : {}),
        ...(c.affiliation ? { affiliation: { "@type": "Organization", name: c.affiliation } } : {}),
      };
    }),
    ...(input.keywords.length ? { keywords: input.keywords } : {}),
    license: `https://spdx.org/licenses/${encodeURIComponent(input.licence)}.html`,
    isAccessibleForFree: true,
    publisher: { "@type": "Organization", name: PUBLISHER, url: input.siteUrl },
    includedInDataCatalog: { "@type": "DataCatalog", name: PUBLISHER, url: input.siteUrl },
    ...(input.seriesIdentifier
      ? { isPartOf: { "@type": "Dataset", name: `${input.title} (every version)`, identifier: doiUrl(input.seriesIdentifier) } }
      : {}),
    // UN/CEFACT common codes: KEL kelvin, PAL pascal (the codes schema.org's unitCode takes).
    variableMeasured: [
      {
        "@type": "PropertyValue",
        name: "T",
        description: "Temperature",
        unitCode: "KEL",
        unitText: "K",
        ...(input.tRange ? { minValue: input.tRange.min, maxValue: input.tRange.max } : {}),
      },
      { "@type": "PropertyValue", name: "k", description: "Rate constant", unitText: input.kUnit },
      ...(input.hasPressure ? [{ "@type": "PropertyValue", name: "p", description: "Pressure", unitCode: "PAL", unitText: "Pa" }] : []),
    ],
    distribution: input.downloads.map((d) => ({
      "@type": "DataDownload",
      name: d.name,
      contentUrl: d.contentUrl,
      encodingFormat: d.encodingFormat,
    })),
    ...(input.source && (sourceDoi || input.source.title)
      ? {
          citation: {
            "@type": "ScholarlyArticle",
            ...(input.source.title ? { name: input.source.title } : {}),
            ...(sourceDoi ? { "@id": doiUrl(sourceDoi), identifier: doiUrl(sourceDoi) } : {}),
          },
        }
      : {}),
  };
}

/** The JSON-LD as the text of a `<script type="application/ld+json">`: `<` escaped so no text ends the script early. */
export function jsonLdScript(value: unknown): string {
  return JSON.stringify(value).replace(/</g, "\\u003c");
}
