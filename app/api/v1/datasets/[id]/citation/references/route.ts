// GET /api/v1/datasets/:id/citation/references — the Cite panel's references in one style: of the version, the series and the source publication
import { withApi } from "@/lib/auth/api";
import { formatReference, warmCitationStyles } from "@/lib/citation/formats";
import { getPublicCitation } from "@/lib/citation/public-citation";
import { parseCitationQueryOrThrow, referencesQuerySchema } from "@/lib/citation/request";
import { AppError } from "@/lib/errors";
import { PUBLIC_READ_CACHE } from "@/lib/http/conditional";
import { parseIdOrThrow } from "@/lib/ids";

// citeproc's engine for each style is built here, at warm-up (scripts/warm-up.ts), not in a reader's request.
warmCitationStyles();

/**
 * A version page's Cite panel asks here for its formatted references, in the style the reader
 * picks (citeproc takes about 4 ms a reference: kept off the page's own answer). `version` picks the version
 * (without it, the newest public one); `series` is null when the dataset has no series identifier,
 * `source` when the deposit names no source reference.
 */
export const GET = withApi<{ id: string }>(
  async ({ req, params }) => {
    const datasetId = parseIdOrThrow(params.id, "dataset");
    const query = parseCitationQueryOrThrow(new URL(req.url).searchParams, referencesQuerySchema);
    const found = await getPublicCitation({ datasetId, versionNumber: query.version });
    if (!found)
      throw new AppError(
        "not_found",
        query.version ? `Dataset ${datasetId} has no published version ${query.version}` : `No published dataset ${datasetId}`,
      );
    return Response.json({
      style: query.style,
      version: formatReference(found.versionItem, query.style),
      series: found.seriesIdentifier ? formatReference(found.seriesItem, query.style) : null,
      source: found.sourceItem ? formatReference(found.sourceItem, query.style) : null,
    });
  },
  { scope: null, cache: PUBLIC_READ_CACHE },
);
