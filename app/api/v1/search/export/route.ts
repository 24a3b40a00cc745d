// GET /api/v1/search/export — a whole search result (the parameters of GET /api/v1/search) as CSV, JSON lines or JSON, streamed batch by batch
import { withApi } from "@/lib/auth/api";
import { AppError } from "@/lib/errors";
import { parseQueryOrThrow, searchExportQuerySchema } from "@/lib/exports/requests";
import { parseSearchParamsOrThrow } from "@/lib/search";
import { SEARCH_EXPORT_MEDIA_TYPES, searchExportFileName, searchExportStream } from "@/lib/search/export";

/** This endpoint's own parameters; every other one is the search's. */
const OWN = ["format", "bom"] as const;

export const GET = withApi(async ({ req }) => {
  const params = new URL(req.url).searchParams;
  const { format, bom } = parseQueryOrThrow(searchExportQuerySchema, params, { only: OWN });
  const searchParams = new URLSearchParams([...params].filter(([name]) => !(OWN as readonly string[]).includes(name)));
  for (const name of ["limit", "cursor"])
    if (searchParams.has(name)) {
      const message = `${name} does not apply: an export is the whole result, from the first row`;
      throw new AppError("bad_request", message, [{ pointer: `/${name}`, parameter: name, message }]);
    }
  const request = parseSearchParamsOrThrow(searchParams, { strict: true });
  const body = await searchExportStream(request, { format, bom });
  return new Response(body, {
    headers: {
      "content-type": SEARCH_EXPORT_MEDIA_TYPES[format],
      "content-disposition": `attachment; filename="${searchExportFileName(format)}"`,
      "cache-control": "no-store",
      "x-content-type-options": "nosniff",
    },
  });
});
