// GET /api/v1/collections/:id/versions/:n — one version of a collection (published; its owner: the draft too)
import { NextResponse } from "next/server";
import { withApi } from "@/lib/auth/api";
import { collectionJson, collectionVersionPathOrThrow, loadCollectionVersionOrThrow } from "@/lib/collections/view";

export const GET = withApi<{ id: string; n: string }>(
  async ({ params, user }) => {
    const { collectionId, number } = collectionVersionPathOrThrow(params);
    return NextResponse.json({
      data: collectionJson(await loadCollectionVersionOrThrow({ collectionId, number, viewerId: user?.id ?? null })),
    });
  },
  { identify: true, scope: "deposit:read" },
);
