import { CITATION_FORMATS, CITATION_STYLES, DEFAULT_STYLE, renderCitation } from "@/lib/citation/formats";
import type { CslItem } from "@/lib/citation/csl";
import type { PublicCitation } from "@/lib/citation/public-citation";
import { CitePanel, type CiteChoice } from "./cite-panel";

const MACHINE_FORMATS = ["bibtex", "ris", "csl-json"] as const;

/** Every format of one item, with the citation endpoint's address for each download. */
function choice(kind: "version" | "series", item: CslItem, datasetId: number, versionNumber: number | null): CiteChoice {
  const rendered = renderCitation(item);
  const texts = { bibtex: rendered.bibtex, ris: rendered.ris, "csl-json": rendered.cslJson };
  const stem = String(item["citation-key"] ?? `dataset-${datasetId}`);
  return {
    kind,
    identifier: rendered.identifier,
    formats: MACHINE_FORMATS.map((id) => ({
      id,
      label: CITATION_FORMATS[id].label,
      text: texts[id],
      href: `/api/v1/datasets/${datasetId}/citation?format=${id}${versionNumber === null ? "" : `&version=${versionNumber}`}`,
      fileName: `${stem}.${CITATION_FORMATS[id].ext}`,
    })),
  };
}

/** The Cite panel of a public version page, rendered from the dataset's citations (lib/citation): machine formats; the panel fetches the formatted references. */
export function CiteSection({ citation }: { citation: PublicCitation }) {
  const { version } = citation;
  const source = citation.sourceItem || citation.sourceDoi ? { hasReference: citation.sourceItem !== null, doi: citation.sourceDoi } : null;
  return (
    <CitePanel
      datasetId={version.datasetId}
      styles={CITATION_STYLES.map((s) => ({ id: s.id, label: s.label }))}
      defaultStyle={DEFAULT_STYLE}
      versionNumber={version.number}
      version={choice("version", citation.versionItem, version.datasetId, version.number)}
      series={citation.seriesIdentifier ? choice("series", citation.seriesItem, version.datasetId, null) : null}
      source={source}
    />
  );
}
