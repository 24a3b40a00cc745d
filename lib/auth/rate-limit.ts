import "server-only";
import pg from "pg";
import { RateLimiterPostgres, RateLimiterRes } from "rate-limiter-flexible";
import { databaseUrl } from "@/lib/config";
import { AppError } from "@/lib/errors";

// Counters live in PostgreSQL (table rate_limits, created by our migrations) so limits hold
// across every app instance.
type LimiterName = "signInIp" | "signInAccount" | "signUpIp" | "signUpEmail" | "resetEmail" | "analysisIp";

const limits: Record<LimiterName, { points: number; duration: number; blockDuration?: number }> = {
  signInIp: { points: 30, duration: 15 * 60 },
  signInAccount: { points: 6, duration: 15 * 60, blockDuration: 15 * 60 },
  signUpIp: { points: 10, duration: 60 * 60 },
  signUpEmail: { points: 3, duration: 60 * 60 },
  resetEmail: { points: 3, duration: 60 * 60 },
  analysisIp: { points: 120, duration: 60 },
};

const globalForLimits = globalThis as unknown as { arrheniaLimiters?: Map<LimiterName, RateLimiterPostgres>; arrheniaLimitPool?: pg.Pool };

function limiter(name: LimiterName): RateLimiterPostgres {
  globalForLimits.arrheniaLimitPool ??= new pg.Pool({ connectionString: databaseUrl(), max: 3 });
  globalForLimits.arrheniaLimiters ??= new Map();
  let l = globalForLimits.arrheniaLimiters.get(name);
  if (!l) {
    l = new RateLimiterPostgres({
      storeClient: globalForLimits.arrheniaLimitPool,
      storeType: "pool",
      tableName: "rate_limits",
      tableCreated: true,
      keyPrefix: name,
      ...limits[name],
    });
    globalForLimits.arrheniaLimiters.set(name, l);
  }
  return l;
}

/** Counts one attempt; throws a 429 AppError (with a wait time) once the budget is spent. */
export async function consumeOrThrow(name: LimiterName, key: string, message = "Too many attempts"): Promise<void> {
  try {
    await limiter(name).consume(key.toLowerCase());
  } catch (err) {
    if (err instanceof RateLimiterRes) {
      const seconds = Math.ceil(err.msBeforeNext / 1000);
      const minutes = Math.max(1, Math.ceil(seconds / 60));
      throw new AppError("rate_limited", `${message}. Try again in ${minutes} minute${minutes === 1 ? "" : "s"}.`, [], seconds);
    }
    throw err;
  }
}

export async function resetLimit(name: LimiterName, key: string): Promise<void> {
  await limiter(name).delete(key.toLowerCase());
}

/** Best-effort client address: the first hop of X-Forwarded-For (set by Next or a proxy), else a fixed key. */
export function clientIp(headers: Headers | Record<string, string | string[] | undefined> | undefined): string {
  let value: string | null | undefined;
  if (!headers) value = undefined;
  else if (headers instanceof Headers) value = headers.get("x-forwarded-for") ?? headers.get("x-real-ip");
  else {
    const raw = headers["x-forwarded-for"] ?? headers["x-real-ip"];
    value = Array.isArray(raw) ? raw[0] : raw;
  }
  return value?.split(",")[0]?.trim() || "unknown";
}
