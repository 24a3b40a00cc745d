// GET /api/v1/datasets/:id — one published dataset: its series identifier and every public version
import { NextResponse } from "next/server";
import { withApi } from "@/lib/auth/api";
import { getPublicDatasetJsonOrThrow } from "@/lib/datasets/public-api";
import { PUBLIC_READ_CACHE } from "@/lib/http/conditional";

export const GET = withApi<{ id: string }>(
  async ({ params }) => NextResponse.json({ data: await getPublicDatasetJsonOrThrow(params.id) }),
  {
    scope: null,
    cache: PUBLIC_READ_CACHE,
  },
);
