// DELETE /api/v1/collections/:id/members/:versionId — take one member out of the draft
import { withApi } from "@/lib/auth/api";
import { removeCollectionMember } from "@/lib/collections/queries";
import { parseIdOrThrow } from "@/lib/ids";

export const DELETE = withApi<{ id: string; versionId: string }>(
  async ({ params, user }) => {
    const collectionId = parseIdOrThrow(params.id, "collection");
    const versionId = parseIdOrThrow(params.versionId, "version");
    await removeCollectionMember({ collectionId, actorId: user!.id, versionId });
    return new Response(null, { status: 204 });
  },
  { permission: "collection.manage", scope: "deposit:write" },
);
