// POST /api/v1/versions/:id/next — start the next version of this version's dataset as a draft copy (owner; Idempotency-Key honoured)
import { withApi } from "@/lib/auth/api";
import { startNextVersion } from "@/lib/datasets/deposits";
import type { VersionDto } from "@/lib/datasets/queries";
import { parseIdOrThrow } from "@/lib/ids";
import { BODY_LIMITS, readBodyOrThrow } from "@/lib/http/read-body";
import { withIdempotency } from "@/lib/idempotency";

export const POST = withApi<{ id: string }>(
  async ({ req, user, params }) => {
    const versionId = parseIdOrThrow(params.id, "dataset version");
    // The body carries nothing, but is read with a cap so a large one cannot be queued.
    const body = await readBodyOrThrow(req, { limit: BODY_LIMITS.json });
    return withIdempotency({
      req,
      user: user!,
      fingerprint: body,
      run: async (keep) => {
        const created = (v: VersionDto) => ({
          status: 201,
          body: { data: { versionId: v.id, number: v.number, state: v.state, lockVersion: v.lockVersion } },
          headers: { location: `/api/v1/versions/${v.id}` },
        });
        return created(await startNextVersion({ actor: user!, versionId, beforeCommit: keep(created) }));
      },
    });
  },
  { permission: "dataset.deposit", scope: "deposit:write" },
);
