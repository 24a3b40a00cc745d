import "server-only";
import pg from "pg";
import { RateLimiterMemory, RateLimiterPostgres, RateLimiterRes } from "rate-limiter-flexible";
import { apiRateLimit, databaseUrl } from "@/lib/config";
import { AppError } from "@/lib/errors";

// Counters live in PostgreSQL (table rate_limits, created by our migrations) so limits hold
// across every app instance.
type LimiterName =
  | "signInIp"
  | "signInPair"
  | "signInAccount"
  | "unlockMail"
  | "signUpIp"
  | "signUpEmail"
  | "resetEmail"
  | "resetIp"
  | "confirmEmail"
  | "confirmIp"
  | "analysisIp"
  | "passwordRetyped"
  | "api";

const limits: Record<LimiterName, { points: number; duration: number; blockDuration?: number }> = {
  // Failed sign-ins from one address across accounts (successes are not counted).
  signInIp: { points: 30, duration: 15 * 60 },
  // Failed passwords for one account from one address: a guesser locks only their own address.
  signInPair: { points: 6, duration: 15 * 60, blockDuration: 15 * 60 },
  // Failed passwords for one account from anywhere: a ceiling against guessing spread over many addresses.
  signInAccount: { points: 60, duration: 60 * 60, blockDuration: 60 * 60 },
  unlockMail: { points: 3, duration: 60 * 60 },
  signUpIp: { points: 10, duration: 60 * 60 },
  signUpEmail: { points: 3, duration: 60 * 60 },
  resetEmail: { points: 3, duration: 60 * 60 },
  resetIp: { points: 10, duration: 60 * 60 },
  confirmEmail: { points: 3, duration: 60 * 60 },
  confirmIp: { points: 10, duration: 60 * 60 },
  analysisIp: { points: 120, duration: 60 },
  // Wrong passwords typed again by a signed-in person (changing it, unlinking ORCID): a session is no licence to guess.
  passwordRetyped: { points: 6, duration: 15 * 60, blockDuration: 15 * 60 },
  // Every REST API request of one client (points: API_RATE_LIMIT, read when the limiter is made).
  api: { points: 600, duration: 60 },
};

const globalForLimits = globalThis as unknown as { arrheniaLimiters?: Map<LimiterName, RateLimiterPostgres>; arrheniaLimitPool?: pg.Pool };

function limiter(name: LimiterName): RateLimiterPostgres {
  // As db/client.ts: after a database restart a connection attempt that hangs is given up after
  // 3 s (the default waits for ever), idle connections are closed, and TCP keep-alive notices a peer that vanished.
  globalForLimits.arrheniaLimitPool ??= new pg.Pool({
    connectionString: databaseUrl(),
    max: 3,
    connectionTimeoutMillis: 3000,
    idleTimeoutMillis: 30_000,
    keepAlive: true,
    keepAliveInitialDelayMillis: 5000,
  });
  // An idle connection the server ends (a restart, pg_terminate_backend) is reported on the pool;
  // with no listener that 'error' event would be thrown and end the process. pg drops the client itself.
  if (globalForLimits.arrheniaLimitPool.listenerCount("error") === 0)
    globalForLimits.arrheniaLimitPool.on("error", (err: Error & { code?: string }) =>
      console.warn(`[rate-limit] an idle database connection ended: ${err.code ?? ""} ${err.message}`),
    );
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
      ...(name === "api" ? { points: apiRateLimit() } : {}),
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

/** Throws the same 429 as consumeOrThrow when the budget is spent, without counting an attempt. */
export async function throwIfSpent(name: LimiterName, key: string, message = "Too many attempts"): Promise<void> {
  const res = await limiter(name).get(key.toLowerCase());
  if (res === null || res.remainingPoints > 0) return;
  const minutes = Math.max(1, Math.ceil(res.msBeforeNext / 60000));
  throw new AppError(
    "rate_limited",
    `${message}. Try again in ${minutes} minute${minutes === 1 ? "" : "s"}.`,
    [],
    Math.ceil(res.msBeforeNext / 1000),
  );
}

export async function resetLimit(name: LimiterName, key: string): Promise<void> {
  await limiter(name).delete(key.toLowerCase());
}

/** Counts one failure without throwing (the caller decides what a spent budget means). */
export async function recordFailure(name: LimiterName, key: string): Promise<void> {
  await limiter(name)
    .consume(key.toLowerCase())
    .catch((err: unknown) => {
      if (!(err instanceof RateLimiterRes)) throw err;
    });
}

/** Whether the budget is spent, without counting an attempt. */
export async function isSpent(name: LimiterName, key: string): Promise<boolean> {
  const res = await limiter(name).get(key.toLowerCase());
  return res !== null && res.remainingPoints <= 0;
}

/** What is left of one API client's budget in the current window. */
export interface ApiBudget {
  limit: number;
  remaining: number;
  /** Seconds until the window ends and the budget is whole again. */
  resetSeconds: number;
  spent: boolean;
}

/** The policy's name in the RateLimit and RateLimit-Policy fields. */
export const API_POLICY_NAME = "api";

const globalForLocal = globalThis as unknown as { arrheniaLocalApiLimiter?: RateLimiterMemory };

/**
 * The API budget of anonymous public reads, counted in this process's memory. Counting in
 * PostgreSQL is one upsert of the client's row per request: measured on the 100 000-dataset bench
 * database, 32 requests at once from one address wait on that row and on the limiter's pool,
 * p50 12 ms and p95 35 ms per count (0.05 ms in memory), which is most of a cached search answer.
 * Each app process then grants the budget on its own: with N processes an address may make N times
 * API_RATE_LIMIT public reads a minute. Callers that identify themselves stay counted in PostgreSQL.
 */
function localApiLimiter(): RateLimiterMemory {
  return (globalForLocal.arrheniaLocalApiLimiter ??= new RateLimiterMemory({
    keyPrefix: "api",
    points: apiRateLimit(),
    duration: limits.api.duration,
  }));
}

/**
 * Counts one API request of a client (`user:<id>` or `address:<ip>`); a spent budget is returned,
 * not thrown. `inProcess`: an anonymous public read, counted in this process (localApiLimiter).
 */
export async function consumeApiBudget(key: string, { inProcess = false }: { inProcess?: boolean } = {}): Promise<ApiBudget> {
  const l = inProcess ? localApiLimiter() : limiter("api");
  const toBudget = (res: RateLimiterRes, spent: boolean): ApiBudget => ({
    limit: l.points,
    remaining: Math.max(0, res.remainingPoints),
    resetSeconds: Math.max(1, Math.ceil(res.msBeforeNext / 1000)),
    spent,
  });
  try {
    return toBudget(await l.consume(key), false);
  } catch (err) {
    if (err instanceof RateLimiterRes) return toBudget(err, true);
    throw err;
  }
}

/** Spends `points` of a client's API budget at once (an operator's penalty; the tests' way to reach the limit). */
export async function spendApiBudget(key: string, points: number): Promise<void> {
  await limiter("api").penalty(key, points);
  await localApiLimiter().penalty(key, points);
}

/**
 * The budget as HTTP fields, following draft-ietf-httpapi-ratelimit-headers-10 (structured
 * fields): `RateLimit-Policy: "api";q=600;w=60` (quota per window of seconds) and
 * `RateLimit: "api";r=598;t=42` (remaining, seconds until the window resets).
 */
export function apiBudgetHeaders(b: ApiBudget): Record<string, string> {
  return {
    "ratelimit-policy": `"${API_POLICY_NAME}";q=${b.limit};w=${limits.api.duration}`,
    ratelimit: `"${API_POLICY_NAME}";r=${b.remaining};t=${b.resetSeconds}`,
  };
}
