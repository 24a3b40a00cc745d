// GET /api/v1/search — published and retracted datasets (or their reactions) matching text, species, reaction patterns and filters
import { withApi } from "@/lib/auth/api";
import { PUBLIC_READ_CACHE } from "@/lib/http/conditional";
import { parseSearchParamsOrThrow, searchAnswerBody, searchAnswerResponse } from "@/lib/search";

export const GET = withApi(
  async ({ req }) => {
    const request = parseSearchParamsOrThrow(new URL(req.url).searchParams, { strict: true });
    return searchAnswerResponse(await searchAnswerBody(request));
  },
  { scope: null, cache: PUBLIC_READ_CACHE },
);
