// GET /api/v1/versions/:id/points.csv — a published or retracted version's points as CSV (404 for any other version, to everyone)
import { withApi } from "@/lib/auth/api";
import { pointsDownloadOrThrow } from "@/lib/datasets/points-download";
import { buildPointsCsv } from "@/lib/datasets/point-export";
import { parseQueryOrThrow, pointsCsvQuerySchema } from "@/lib/exports/requests";

export const GET = withApi<{ id: string }>(
  async ({ req, params }) => {
    const { bom } = parseQueryOrThrow(pointsCsvQuerySchema, new URL(req.url).searchParams);
    const { rows, about, headers } = await pointsDownloadOrThrow(params.id, "csv");
    // ?bom=1: a UTF-8 byte order mark first, so spreadsheet programs read the file as UTF-8 (names, units, "±").
    return new Response(`${bom ? "\uFEFF" : ""}${buildPointsCsv(about, rows)}`, {
      headers: { ...headers, "content-type": "text/csv; charset=utf-8; header=present" },
    });
  },
  { scope: null },
);
