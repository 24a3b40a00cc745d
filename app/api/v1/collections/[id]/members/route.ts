// POST /api/v1/collections/:id/members — add published dataset versions (with notes) to the draft: all or none
import { NextResponse } from "next/server";
import { parseJsonBody, withApi } from "@/lib/auth/api";
import { addCollectionMembers } from "@/lib/collections/queries";
import { addMembersSchema } from "@/lib/collections/schemas";
import { parseIdOrThrow } from "@/lib/ids";

export const POST = withApi<{ id: string }>(
  async ({ req, params, user }) => {
    const collectionId = parseIdOrThrow(params.id, "collection");
    const { members } = await parseJsonBody(req, addMembersSchema);
    return NextResponse.json({ data: await addCollectionMembers({ collectionId, actorId: user!.id, members }) });
  },
  { permission: "collection.manage", scope: "deposit:write" },
);
