// GET /reactions/<key>/feed.xml — Atom feed of the reaction's published and retracted versions (the numeric id redirects to the key)
import { getPublicReactionCached } from "@/lib/reactions/cached";
import { reactionPath, readReactionPathSegment } from "@/lib/reactions/paths";
import { listFeedVersionsCached } from "@/lib/feeds/cached";
import { atomResponse } from "@/lib/feeds/response";
import { withApi } from "@/lib/auth/api";
import { AppError } from "@/lib/errors";

export const dynamic = "force-dynamic";

export const GET = withApi<{ id: string }>(
  async ({ params }) => {
    const named = readReactionPathSegment(params.id);
    const reaction = named ? await getPublicReactionCached(named) : null;
    if (!reaction) throw new AppError("not_found", "No public reaction has this key or id.");
    // The numeric id is an alias: the feed's address is by key.
    if (named && "id" in named) return new Response(null, { status: 308, headers: { location: `${reactionPath(reaction.key)}/feed.xml` } });
    const versions = await listFeedVersionsCached({ reactionId: reaction.id });
    return atomResponse({ title: `${reaction.equation}: new and retracted versions`, pagePath: reactionPath(reaction.key), versions });
  },
  { scope: null },
);
