// GET /api/v1/reactions/:id/consensus — one reaction's consensus expression, with which datasets went in and why others did not
import { NextResponse } from "next/server";
import { withApi } from "@/lib/auth/api";
import { AppError } from "@/lib/errors";
import { parseIdOrThrow } from "@/lib/ids";
import { getReactionConsensusJsonOrThrow } from "@/lib/reactions/public-api";
import { getReaction } from "@/lib/reactions/queries";
import { PUBLIC_READ_CACHE } from "@/lib/http/conditional";

export const GET = withApi<{ id: string }>(
  async ({ req, params }) => {
    const reaction = await getReaction({ id: parseIdOrThrow(params.id, "reaction") });
    if (!reaction) throw new AppError("not_found", "No such reaction with published data");
    return NextResponse.json({ data: await getReactionConsensusJsonOrThrow(reaction, new URL(req.url).searchParams) });
  },
  { scope: null, cache: PUBLIC_READ_CACHE },
);
