// GET /api/v1/search — published and retracted datasets (or their reactions) matching text, species, reaction patterns and filters
import { NextResponse } from "next/server";
import { withApi } from "@/lib/auth/api";
import { FIT_CAUTION } from "@/lib/datasets/version-json";
import { parseSearchParamsOrThrow, search } from "@/lib/search";

export const GET = withApi(async ({ req }) => {
  const request = parseSearchParamsOrThrow(new URL(req.url).searchParams, { strict: true });
  const result = await search(request);
  return NextResponse.json({
    query: result.query,
    parsed: result.parsed.words,
    understood: result.parsed.query,
    total: result.total,
    hits: result.hits,
    facets: result.facets,
    nextCursor: result.nextCursor,
    caution: FIT_CAUTION,
  });
});
