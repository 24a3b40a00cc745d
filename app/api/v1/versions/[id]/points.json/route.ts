// GET /api/v1/versions/:id/points.json — a published or retracted version's points as JSON (404 for any other version, to everyone)
import { NextResponse } from "next/server";
import { withApi } from "@/lib/auth/api";
import { pointsDownloadOrThrow } from "@/lib/datasets/points-download";
import { buildPointsJson } from "@/lib/datasets/point-export";

export const GET = withApi<{ id: string }>(
  async ({ params }) => {
    const { rows, about, headers } = await pointsDownloadOrThrow(params.id, "json");
    return NextResponse.json(buildPointsJson(about, rows), { headers });
  },
  { scope: null },
);
