// GET /api/v1/search — published and retracted datasets (or their reactions) matching text, species, reaction patterns and filters
import { NextResponse } from "next/server";
import { withApi } from "@/lib/auth/api";
import { PUBLIC_READ_CACHE } from "@/lib/http/conditional";
import { parseSearchParamsOrThrow, searchAnswerJson } from "@/lib/search";

export const GET = withApi(
  async ({ req }) => {
    const request = parseSearchParamsOrThrow(new URL(req.url).searchParams, { strict: true });
    return new NextResponse(await searchAnswerJson(request), { headers: { "content-type": "application/json" } });
  },
  { scope: null, cache: PUBLIC_READ_CACHE },
);
