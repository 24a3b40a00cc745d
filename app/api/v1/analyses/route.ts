// POST /api/v1/analyses — stateless re-fit of posted (T, k) points; no sign-in, rate limited
import { NextResponse } from "next/server";
import { zodToFieldErrors, withApi } from "@/lib/auth/api";
import { clientAddress } from "@/lib/auth/client-address";
import { consumeOrThrow } from "@/lib/auth/rate-limit";
import { analysisRequestSchema, MAX_BODY_BYTES } from "@/lib/analyses/analyse-request";
import { AppError } from "@/lib/errors";
import { readJsonBodyOrThrow } from "@/lib/http/read-body";
import { runAnalysisTask } from "@/lib/workers/pool";

export const POST = withApi(async ({ req }) => {
  await consumeOrThrow("analysisIp", clientAddress(req), "Too many analyses from this network");
  const body = await readJsonBodyOrThrow(req, { limit: MAX_BODY_BYTES, what: "analysis request" });
  const parsed = analysisRequestSchema.safeParse(body);
  if (!parsed.success) {
    const errors = zodToFieldErrors(parsed.error);
    throw new AppError(
      "validation_failed",
      `The request has ${errors.length} problem${errors.length === 1 ? "" : "s"}: ${errors[0].pointer} ${errors[0].message}`,
      errors.slice(0, 100),
    );
  }
  // The fit grows with the points: it runs on a worker thread, not the one serving requests.
  const outcome = await runAnalysisTask("analyse", parsed.data);
  if (!outcome.ok) throw new AppError(outcome.code, outcome.message, outcome.errors);
  return NextResponse.json(outcome.response);
});
