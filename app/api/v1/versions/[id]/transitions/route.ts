// POST /api/v1/versions/:id/transitions — submit, withdraw, review, decide or retract a version (Idempotency-Key honoured)
import { withApi, zodToFieldErrors } from "@/lib/auth/api";
import { transitionRequestSchema } from "@/lib/curation/transition-request";
import type { TransitionOutcome } from "@/lib/curation/transitions";
import { transitionVersion } from "@/lib/datasets/deposits";
import { AppError } from "@/lib/errors";
import { BODY_LIMITS, parseJsonBytesOrThrow, readBodyOrThrow } from "@/lib/http/read-body";
import { withIdempotency } from "@/lib/idempotency";
import { parseIdOrThrow } from "@/lib/ids";

export const POST = withApi<{ id: string }>(
  async ({ req, user, params }) => {
    const versionId = parseIdOrThrow(params.id, "dataset version");
    const body = await readBodyOrThrow(req, { limit: BODY_LIMITS.json, what: "transition request" });
    return withIdempotency({
      req,
      user: user!,
      fingerprint: body,
      run: async (keep) => {
        const parsed = transitionRequestSchema.safeParse(parseJsonBytesOrThrow(body));
        if (!parsed.success)
          throw new AppError("validation_failed", "The request body does not match the expected shape", zodToFieldErrors(parsed.error));
        const { transition, reason, reply } = parsed.data;
        // Role and dataset membership are re-read inside the transaction (lib/curation/transitions.ts).
        const answer = (outcome: TransitionOutcome) => ({ status: 200, body: { data: outcome } });
        return answer(await transitionVersion({ actor: user!, versionId, transition, reason, reply, beforeCommit: keep(answer) }));
      },
    });
  },
  { permission: "dataset.deposit", scope: "deposit:write" },
);
