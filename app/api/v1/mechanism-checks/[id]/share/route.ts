// POST /api/v1/mechanism-checks/:id/share — the owner turns the share link on ({"shared": true}: a new token) or off
import { NextResponse } from "next/server";
import { parseJsonBody, withApi } from "@/lib/auth/api";
import { generateSecret } from "@/lib/auth/secrets";
import { AppError } from "@/lib/errors";
import { parseIdOrThrow } from "@/lib/ids";
import { setMechanismCheckShare } from "@/lib/mechanisms/queries";
import { shareBodySchema } from "@/lib/mechanisms/request";

export const POST = withApi<{ id: string }>(
  async ({ req, user, params }) => {
    const id = parseIdOrThrow(params.id, "mechanism check");
    const { shared } = await parseJsonBody(req, shareBodySchema);
    const token = shared ? generateSecret("", 24) : null;
    if (!(await setMechanismCheckShare({ id, ownerId: user!.id, token }))) throw new AppError("not_found", "No such mechanism check");
    return NextResponse.json({ data: { shared, url: token ? `/mechanisms/${id}?share=${token}` : null } });
  },
  { permission: "mechanism.check", scope: "deposit:read" },
);
