// GET /api/v1/reactions/:key — one reaction with published data (by its key; the numeric id is accepted too), its datasets and its consensus
import { NextResponse } from "next/server";
import { withApi } from "@/lib/auth/api";
import { PUBLIC_READ_CACHE } from "@/lib/http/conditional";
import { readReactionSegment } from "@/lib/reactions/paths";
import { getPublicReactionJsonOrThrow } from "@/lib/reactions/public-api";

export const GET = withApi<{ id: string }>(
  async ({ req, params }) => {
    // Next has decoded the segment: a key arrives with its "~" (or ">>") as written.
    const data = await getPublicReactionJsonOrThrow(readReactionSegment(params.id), new URL(req.url).searchParams);
    return NextResponse.json({ data });
  },
  { scope: null, cache: PUBLIC_READ_CACHE },
);
