// GET /api/v1/versions/:id/points.csv — a published or retracted version's points as CSV (404 for any other version, to everyone)
import { withApi } from "@/lib/auth/api";
import { pointsDownloadOrThrow } from "@/lib/datasets/points-download";
import { buildPointsCsv } from "@/lib/datasets/point-export";

export const GET = withApi<{ id: string }>(
  async ({ params }) => {
    const { rows, about, headers } = await pointsDownloadOrThrow(params.id, "csv");
    return new Response(buildPointsCsv(about, rows), {
      headers: { ...headers, "content-type": "text/csv; charset=utf-8; header=present" },
    });
  },
  { scope: null },
);
