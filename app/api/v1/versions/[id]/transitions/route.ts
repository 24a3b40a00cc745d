// POST /api/v1/versions/:id/transitions — submit, withdraw, review, decide or retract a version
import { NextResponse } from "next/server";
import { z } from "zod";
import { parseJsonBody, withApi } from "@/lib/auth/api";
import { transitionVersion } from "@/lib/datasets/deposits";
import { parseIdOrThrow } from "@/lib/ids";

const bodySchema = z
  .object({
    transition: z.enum(["submit", "withdraw", "start_review", "request_changes", "accept", "decline", "retract"]),
    reason: z.string().trim().max(5000).optional(),
  })
  .strict();

export const POST = withApi<{ id: string }>(
  async ({ req, user, params }) => {
    const versionId = parseIdOrThrow(params.id, "dataset version");
    const { transition, reason } = await parseJsonBody(req, bodySchema);
    // Role and dataset membership are re-read inside the transaction (lib/curation/transitions.ts).
    const outcome = await transitionVersion({ actor: user!, versionId, transition, reason });
    return NextResponse.json({ data: outcome });
  },
  { permission: "dataset.deposit", scope: "deposit" },
);
