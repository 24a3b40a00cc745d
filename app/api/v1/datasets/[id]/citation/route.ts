// GET /api/v1/datasets/:id/citation — how to cite a public dataset: one version (?version=n) or every version (the series), as BibTeX, RIS, CSL-JSON or a formatted reference
import { withApi } from "@/lib/auth/api";
import { CITATION_FORMATS, formatCitation, warmCitationStyles } from "@/lib/citation/formats";
import { getPublicCitation } from "@/lib/citation/public-citation";
import { citationQueryOrThrow } from "@/lib/citation/request";
import { AppError } from "@/lib/errors";
import { parseIdOrThrow } from "@/lib/ids";

// citeproc's engine for each style is built here, at warm-up (scripts/warm-up.ts), not in a reader's request.
warmCitationStyles();

export const GET = withApi<{ id: string }>(
  async ({ req, params }) => {
    const datasetId = parseIdOrThrow(params.id, "dataset");
    const query = citationQueryOrThrow(req);
    const found = await getPublicCitation({ datasetId, versionNumber: query.version });
    // Drafts and versions under review are not found, whoever asks.
    if (!found)
      throw new AppError(
        "not_found",
        query.version ? `Dataset ${datasetId} has no published version ${query.version}` : `No published dataset ${datasetId}`,
      );
    const item = query.version === undefined ? found.seriesItem : found.versionItem;
    const { mediaType } = CITATION_FORMATS[query.format];
    return new Response(formatCitation(item, query.format, query.style), {
      headers: {
        "content-type": `${mediaType}; charset=utf-8`,
        "x-content-type-options": "nosniff",
        // The same URL answers the version page's content negotiation (proxy.ts, lib/http/content-negotiation.ts).
        vary: "Accept",
      },
    });
  },
  { scope: null },
);
