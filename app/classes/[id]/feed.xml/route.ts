// GET /classes/<id>/feed.xml — Atom feed of the published and retracted versions of one reaction class
import { reactionClassFor } from "@/lib/deposits/vocabulary";
import { classPath } from "@/lib/identifiers/paths";
import { listFeedVersionsCached } from "@/lib/feeds/cached";
import { atomResponse } from "@/lib/feeds/response";
import { withApi } from "@/lib/auth/api";
import { AppError } from "@/lib/errors";

export const dynamic = "force-dynamic";

export const GET = withApi<{ id: string }>(
  async ({ params }) => {
    const { id } = params;
    const found = reactionClassFor(id);
    if (!found) throw new AppError("not_found", "No reaction class has this id.");
    // An id from before the classes were renamed leads to the current feed.
    if (found.id !== id) return new Response(null, { status: 308, headers: { location: `${classPath(found.id)}/feed.xml` } });
    const versions = await listFeedVersionsCached({ classId: found.id });
    return atomResponse({ title: `${found.label} reactions: new and retracted versions`, pagePath: classPath(found.id), versions });
  },
  { scope: null },
);
