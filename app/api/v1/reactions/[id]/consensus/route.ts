// GET /api/v1/reactions/:key/consensus — one reaction's consensus expression, with which datasets went in and why others did not; the key as the reaction page writes it (a numeric id works too)
import { NextResponse } from "next/server";
import { withApi } from "@/lib/auth/api";
import { AppError } from "@/lib/errors";
import { readReactionSegment } from "@/lib/reactions/paths";
import { getReactionConsensusJsonOrThrow } from "@/lib/reactions/public-api";
import { findPublicReaction } from "@/lib/reactions/public-queries";
import { getReaction } from "@/lib/reactions/queries";
import { PUBLIC_READ_CACHE } from "@/lib/http/conditional";

export const GET = withApi<{ id: string }>(
  async ({ req, params }) => {
    // Next has decoded the segment: a key arrives with its "~" (or ">>") as written.
    const where = readReactionSegment(params.id);
    const found = where ? await findPublicReaction(where) : null;
    const reaction = found ? await getReaction({ id: found.id }) : null;
    if (!reaction) throw new AppError("not_found", "No such reaction with published data");
    return NextResponse.json({ data: await getReactionConsensusJsonOrThrow(reaction, new URL(req.url).searchParams) });
  },
  { scope: null, cache: PUBLIC_READ_CACHE },
);
