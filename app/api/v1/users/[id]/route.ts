// PATCH /api/v1/users/:id — change a person's role or deactivate the account (admins only, audited)
import { NextResponse } from "next/server";
import { parseJsonBody, withApi } from "@/lib/auth/api";
import { AppError } from "@/lib/errors";
import { parseIdOrThrow } from "@/lib/ids";
import { setAccountActive } from "@/lib/users/accounts";
import { changeUserRole, getUserById } from "@/lib/users/queries";
import { userPatchSchema } from "@/lib/users/schemas";

export const PATCH = withApi<{ id: string }>(
  async ({ req, user, params }) => {
    const id = parseIdOrThrow(params.id, "person");
    const body = await parseJsonBody(req, userPatchSchema);
    if (body.role) await changeUserRole({ actorId: user!.id, userId: id, role: body.role });
    if (body.active !== undefined) await setAccountActive({ actorId: user!.id, userId: id, active: body.active });
    const updated = await getUserById({ id });
    if (!updated) throw new AppError("not_found", "No such person");
    return NextResponse.json({ data: updated });
  },
  { permission: "user.manage", scope: "admin" },
);
