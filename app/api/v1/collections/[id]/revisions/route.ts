// POST /api/v1/collections/:id/revisions — a new draft version copied from the latest published one (retracted members left out and named)
import { NextResponse } from "next/server";
import { withApi } from "@/lib/auth/api";
import { startCollectionRevision } from "@/lib/collections/queries";
import { collectionVersionPath } from "@/lib/collections/view";
import { parseIdOrThrow } from "@/lib/ids";

export const POST = withApi<{ id: string }>(
  async ({ params, user }) => {
    const collectionId = parseIdOrThrow(params.id, "collection");
    const { number, leftOut } = await startCollectionRevision({ collectionId, actorId: user!.id });
    return NextResponse.json(
      { data: { id: collectionId, number, state: "draft", leftOut, url: collectionVersionPath(collectionId, number) } },
      { status: 201 },
    );
  },
  { permission: "collection.manage", scope: "deposit:write" },
);
