// GET /api/v1/collections/:id — a collection's newest version anyone may see (its owner: the draft too); PATCH — the draft's title or description; DELETE — a never-published collection
import { NextResponse } from "next/server";
import { parseJsonBody, withApi } from "@/lib/auth/api";
import { deleteCollectionDraft, updateCollectionDraft } from "@/lib/collections/queries";
import { patchCollectionSchema } from "@/lib/collections/schemas";
import { collectionJson, loadCollectionVersionOrThrow } from "@/lib/collections/view";
import { parseIdOrThrow } from "@/lib/ids";

export const GET = withApi<{ id: string }>(
  async ({ params, user }) => {
    const collectionId = parseIdOrThrow(params.id, "collection");
    const view = await loadCollectionVersionOrThrow({ collectionId, viewerId: user?.id ?? null });
    return NextResponse.json({ data: collectionJson(view) });
  },
  { identify: true, scope: "deposit:read" },
);

export const PATCH = withApi<{ id: string }>(
  async ({ req, params, user }) => {
    const collectionId = parseIdOrThrow(params.id, "collection");
    const body = await parseJsonBody(req, patchCollectionSchema);
    await updateCollectionDraft({ collectionId, actorId: user!.id, ...body });
    const view = await loadCollectionVersionOrThrow({ collectionId, viewerId: user!.id });
    return NextResponse.json({ data: collectionJson(view) });
  },
  { permission: "collection.manage", scope: "deposit:write" },
);

export const DELETE = withApi<{ id: string }>(
  async ({ params, user }) => {
    const collectionId = parseIdOrThrow(params.id, "collection");
    await deleteCollectionDraft({ collectionId, actorId: user!.id });
    return new Response(null, { status: 204 });
  },
  { permission: "collection.manage", scope: "deposit:write" },
);
