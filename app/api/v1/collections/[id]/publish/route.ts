// POST /api/v1/collections/:id/publish — publish the draft: frozen, its identifier minted and queued for registration
import { NextResponse } from "next/server";
import { withApi } from "@/lib/auth/api";
import { publishCollection } from "@/lib/collections/queries";
import { collectionVersionPath } from "@/lib/collections/view";
import { parseIdOrThrow } from "@/lib/ids";

export const POST = withApi<{ id: string }>(
  async ({ params, user }) => {
    const collectionId = parseIdOrThrow(params.id, "collection");
    const { number, versionIdentifier } = await publishCollection({ collectionId, actorId: user!.id });
    return NextResponse.json({
      data: { id: collectionId, number, state: "published", versionIdentifier, url: collectionVersionPath(collectionId, number) },
    });
  },
  { permission: "collection.manage", scope: "deposit:write" },
);
