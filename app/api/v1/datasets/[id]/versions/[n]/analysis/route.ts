// GET /api/v1/datasets/:id/versions/:n/analysis — the newest re-fit of a published or retracted version (fits, diagnostics, flags)
import { NextResponse } from "next/server";
import { withApi } from "@/lib/auth/api";
import { getPublicAnalysisJsonOrThrow } from "@/lib/datasets/public-api";
import { PUBLIC_READ_CACHE } from "@/lib/http/conditional";

export const GET = withApi<{ id: string; n: string }>(
  async ({ params }) => NextResponse.json({ data: await getPublicAnalysisJsonOrThrow(params.id, params.n) }),
  { scope: null, cache: PUBLIC_READ_CACHE },
);
