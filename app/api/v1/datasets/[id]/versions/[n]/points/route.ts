// GET /api/v1/datasets/:id/versions/:n/points — every point of a published or retracted version, as deposited and converted
import { NextResponse } from "next/server";
import { withApi } from "@/lib/auth/api";
import { getPublicPointsJsonOrThrow } from "@/lib/datasets/public-api";
import { PUBLIC_READ_CACHE } from "@/lib/http/conditional";

export const GET = withApi<{ id: string; n: string }>(
  async ({ params }) => NextResponse.json({ data: await getPublicPointsJsonOrThrow(params.id, params.n) }),
  { scope: null, cache: PUBLIC_READ_CACHE },
);
