// POST /api/v1/collections — a new collection (a draft of its first version); GET — the published collections
import { NextResponse } from "next/server";
import { parseJsonBody, withApi } from "@/lib/auth/api";
import { createCollection, listPublishedCollections } from "@/lib/collections/queries";
import { collectionListQuerySchema, createCollectionSchema } from "@/lib/collections/schemas";
import { collectionPath, collectionVersionPath } from "@/lib/collections/view";
import { parseQueryOrThrow } from "@/lib/exports/requests";

export const POST = withApi(
  async ({ req, user }) => {
    const body = await parseJsonBody(req, createCollectionSchema);
    const { id, number } = await createCollection({ ownerId: user!.id, ...body });
    return NextResponse.json(
      { data: { id, number, state: "draft", url: collectionVersionPath(id, number) } },
      { status: 201, headers: { location: `/api/v1/collections/${id}` } },
    );
  },
  { permission: "collection.manage", scope: "deposit:write" },
);

export const GET = withApi(
  async ({ req }) => {
    const { limit, offset } = parseQueryOrThrow(collectionListQuerySchema, new URL(req.url).searchParams);
    const items = await listPublishedCollections({ limit, offset });
    return NextResponse.json({
      data: items.map((c) => ({
        id: c.id,
        number: c.number,
        title: c.title,
        versionIdentifier: c.versionIdentifier,
        publishedAt: c.publishedAt?.toISOString() ?? null,
        owner: { name: c.ownerName },
        memberCount: c.memberCount,
        url: collectionPath(c.id),
      })),
      meta: { limit, offset },
    });
  },
  { scope: null },
);
