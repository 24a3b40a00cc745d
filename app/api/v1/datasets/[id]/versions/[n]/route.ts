// GET /api/v1/datasets/:id/versions/:n — one published or retracted version: its document, identifiers and newest analysis
import { NextResponse } from "next/server";
import { withApi } from "@/lib/auth/api";
import { getPublicVersionJsonOrThrow } from "@/lib/datasets/public-api";
import { PUBLIC_READ_CACHE } from "@/lib/http/conditional";

export const GET = withApi<{ id: string; n: string }>(
  async ({ params }) => NextResponse.json({ data: await getPublicVersionJsonOrThrow(params.id, params.n) }),
  { scope: null, cache: PUBLIC_READ_CACHE },
);
