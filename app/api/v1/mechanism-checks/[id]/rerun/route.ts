// POST /api/v1/mechanism-checks/:id/rerun — the owner queues a finished or failed check again (with their species choices as they are now)
import { NextResponse } from "next/server";
import { withApi } from "@/lib/auth/api";
import { AppError } from "@/lib/errors";
import { parseIdOrThrow } from "@/lib/ids";
import { requeueMechanismCheck } from "@/lib/mechanisms/queries";

export const POST = withApi<{ id: string }>(
  async ({ user, params }) => {
    const id = parseIdOrThrow(params.id, "mechanism check");
    if (!(await requeueMechanismCheck({ id, ownerId: user!.id }))) throw new AppError("not_found", "No such mechanism check");
    return NextResponse.json(
      { data: { id, state: "queued", url: `/mechanisms/${id}` } },
      { status: 202, headers: { location: `/api/v1/mechanism-checks/${id}` } },
    );
  },
  { permission: "mechanism.check", scope: "deposit:read" },
);
