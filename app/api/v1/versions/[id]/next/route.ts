// POST /api/v1/versions/:id/next — start the next version of this version's dataset as a draft copy (owner)
import { NextResponse } from "next/server";
import { withApi } from "@/lib/auth/api";
import { startNextVersion } from "@/lib/datasets/deposits";
import { parseIdOrThrow } from "@/lib/ids";

export const POST = withApi<{ id: string }>(
  async ({ user, params }) => {
    const versionId = parseIdOrThrow(params.id, "dataset version");
    const v = await startNextVersion({ actor: user!, versionId });
    return NextResponse.json({ data: { versionId: v.id, number: v.number, state: v.state, lockVersion: v.lockVersion } }, { status: 201, headers: { location: `/api/v1/versions/${v.id}` } });
  },
  { permission: "dataset.deposit", scope: "deposit" },
);
