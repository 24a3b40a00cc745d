// POST /api/cache-invalidations — the app's own background workers (scripts/serve.ts) tell Next which public data changed; 404 to anyone else
import { timingSafeEqual } from "node:crypto";
import { NextResponse } from "next/server";
import { z } from "zod";
import { withApi } from "@/lib/auth/api";
import { AppError } from "@/lib/errors";
import { BODY_LIMITS, readJsonBodyOrThrow } from "@/lib/http/read-body";
import { CACHE_KEY_ENV, CACHE_KEY_HEADER, invalidatePublicCache } from "@/lib/public-cache";

export const dynamic = "force-dynamic";

const bodySchema = z.object({ tags: z.array(z.string().min(1).max(200)).min(1).max(10_000) }).strict();

/** True only when the request carries this start's secret (set by scripts/serve.ts for both processes). */
function fromOwnWorkers(req: Request): boolean {
  const key = process.env[CACHE_KEY_ENV] ?? "";
  const given = req.headers.get(CACHE_KEY_HEADER) ?? "";
  if (key.length < 16 || given.length !== key.length) return false;
  return timingSafeEqual(Buffer.from(given), Buffer.from(key));
}

export const POST = withApi(async ({ req }) => {
  // Not found rather than forbidden: the endpoint is no business of visitors.
  if (!fromOwnWorkers(req)) throw new AppError("not_found", "Not found");
  const { tags } = bodySchema.parse(await readJsonBodyOrThrow(req, { limit: BODY_LIMITS.json, what: "cache invalidation" }));
  await invalidatePublicCache(tags, { forward: false });
  return new NextResponse(null, { status: 204 });
});

// Other methods: the same 404 as a request without the key (a 405 would show that the endpoint exists).
const notFound = withApi(async () => {
  throw new AppError("not_found", "Not found");
});
export const GET = notFound;
export const PUT = notFound;
export const DELETE = notFound;
export const PATCH = notFound;
