import "server-only";
import { NextResponse } from "next/server";
import { ZodError, type z } from "zod";
import { AppError, databaseUnavailable, problemJson, storageRefusal, type FieldError } from "@/lib/errors";
import { withValidators, type CachePolicy } from "@/lib/http/conditional";
import { BODY_LIMITS, isClientAbort, readJsonBodyOrThrow } from "@/lib/http/read-body";
import { describeUnstorableText, findUnstorableText } from "@/lib/storable-text";
import { getUserByApiToken, type ApiTokenScope, type UserDto } from "@/lib/users/queries";
import { clientAddress } from "./client-address";
import { assertAllowed } from "./guard";
import type { Permission } from "./permissions";
import { apiBudgetHeaders, consumeApiBudget, type ApiBudget } from "./rate-limit";
import { getCurrentUser } from "./session";

export interface ApiContext<P> {
  req: Request;
  user: UserDto | null;
  params: P;
}

/**
 * Scopes a personal token must hold for an endpoint; a browser session holds them all.
 * deposit:read: GET what the person may see (their drafts too); deposit:write: create, edit and
 * move versions; admin: people.
 */
export type ApiScope = ApiTokenScope;

export interface ApiOptions {
  /** Omit for public endpoints. */
  permission?: Permission;
  /** Public endpoints that still want to know who calls (e.g. to show drafts to their owner). */
  identify?: boolean;
  /** The token scope the endpoint needs; null only for public endpoints that ignore the caller. */
  scope: ApiScope | null;
  /** A public read anyone may cache: ETag, Cache-Control and 304 (lib/http/conditional.ts). */
  cache?: CachePolicy;
  /**
   * The handler refuses query text PostgreSQL cannot store itself, in its own protocol's words (OAI-PMH's
   * badArgument), instead of the 422 problem every other endpoint answers.
   */
  checksQuery?: true;
}

const escapePointer = (p: PropertyKey) => String(p).replace(/~/g, "~0").replace(/\//g, "~1");

/** zod issues → JSON-pointer field errors (RFC 6901: the whole document is ""). */
export function zodToFieldErrors(error: ZodError, base = ""): FieldError[] {
  return error.issues.flatMap((i) => {
    const at = base + i.path.map((p) => `/${escapePointer(p)}`).join("");
    // An unexpected property is reported at the property itself.
    if (i.code === "unrecognized_keys")
      return i.keys.map((k) => ({ pointer: `${at}/${escapePointer(k)}`, message: `unexpected property “${k}”` }));
    return [{ pointer: at, message: i.message }];
  });
}

export function problemResponse(error: AppError, instance?: string): NextResponse {
  const headers: Record<string, string> = { "content-type": "application/problem+json" };
  if (error.retryAfterSeconds) headers["retry-after"] = String(error.retryAfterSeconds);
  // RFC 9110 §15.5.2: a 401 names the scheme that would be accepted.
  if (error.status === 401) headers["www-authenticate"] = 'Bearer realm="arrhenia"';
  return new NextResponse(JSON.stringify(problemJson(error, instance)), { status: error.status, headers });
}

/**
 * The answer to a request whose client went away (logged as an abort, never as an outage or a
 * failure; nobody reads it), or null when `err` is something else.
 */
export function clientAbortResponse(req: Request, err: unknown, instance: string): NextResponse | null {
  if (!isClientAbort(err, req)) return null;
  console.info(`[api] ${req.method} ${instance}: aborted by the client (${err instanceof Error ? err.message : "signal"})`);
  return problemResponse(new AppError("bad_request", "The request was closed by the client before it was complete"), instance);
}

/** RFC 6750 §2.1: a bearer credential is one b64token. */
const B64_TOKEN = /^[A-Za-z0-9\-._~+/]+=*$/;
/** An auth-scheme is an RFC 9110 token; only a short one is repeated back. */
const SCHEME_TOKEN = /^[A-Za-z0-9!#$%&'*+.^_`|~-]{1,32}$/;
const EXPECTED_SCHEME = "send the API token as “Authorization: Bearer <token>”";

/**
 * The bearer secret of a request, null when it sends no Authorization header. Any other scheme,
 * or a bearer credential that is not one token, is a 401: a caller who meant to authenticate is
 * never served as anonymous.
 */
function bearerSecretOrThrow(req: Request): string | null {
  const auth = req.headers.get("authorization");
  if (auth === null) return null;
  const [scheme = "", ...rest] = auth.trim().split(/[ \t]+/);
  if (scheme.toLowerCase() !== "bearer") {
    const named = SCHEME_TOKEN.test(scheme) ? `the “${scheme}” scheme` : "an unknown scheme";
    throw new AppError("unauthenticated", `The Authorization header uses ${named}; ${EXPECTED_SCHEME}`);
  }
  if (rest.length !== 1 || !B64_TOKEN.test(rest[0]))
    throw new AppError("unauthenticated", `The Authorization header's bearer token is missing or malformed; ${EXPECTED_SCHEME}`);
  return rest[0];
}

/** A bearer token must be valid wherever it is sent (an unknown or revoked one is never ignored), and hold the endpoint's scope. */
async function resolveToken(secret: string, scope: ApiScope | null): Promise<UserDto> {
  const found = await getUserByApiToken({ secret });
  if (!found) throw new AppError("unauthenticated", "The API token is unknown or revoked");
  // A token that may change things may also read what its holder may see.
  const held = new Set<ApiScope>(found.scopes);
  if (held.has("deposit:write") || held.has("admin")) held.add("deposit:read");
  if (scope && !held.has(scope)) throw new AppError("forbidden", `This token lacks the “${scope}” scope`);
  return found.user;
}

/** Parses a JSON body (read with a byte cap) with a zod schema; malformed JSON and schema failures become 422s with pointers. */
export async function parseJsonBody<S extends z.ZodType>(req: Request, schema: S, limit: number = BODY_LIMITS.json): Promise<z.infer<S>> {
  const body = await readJsonBodyOrThrow(req, { limit });
  const unstorable = findUnstorableText(body);
  if (unstorable.length) throw new AppError("validation_failed", unstorable[0].message, unstorable);
  const parsed = schema.safeParse(body);
  if (!parsed.success)
    throw new AppError("validation_failed", "The request body does not match the expected shape", zodToFieldErrors(parsed.error));
  return parsed.data;
}

/** Refuses a query parameter (name or value) holding text PostgreSQL cannot store: a 422 naming it. */
export function assertStorableQuery(url: URL): void {
  for (const [name, value] of url.searchParams) {
    const why = describeUnstorableText(name) ?? describeUnstorableText(value);
    if (why)
      // 400: a query string is the request's own address, not a document to validate (search answers every bad parameter so).
      throw new AppError("bad_request", `The query parameter “${name}” ${why}`, [
        { pointer: `/${escapePointer(name)}`, parameter: name, message: `The query parameter “${name}” ${why}.`, value },
      ]);
  }
}

/** A read of a public, cacheable endpoint: counted, for anonymous callers, in this process's memory. */
const isPublicRead = (req: Request, options: ApiOptions) => options.cache !== undefined && (req.method === "GET" || req.method === "HEAD");

/**
 * Route handler wrapper: who is calling (session or bearer token) → permission → handler →
 * one error shape (RFC 9457 problem+json). Internals are logged, never echoed.
 */
export function withApi<P = Record<string, string>>(
  handler: (ctx: ApiContext<P>) => Promise<Response>,
  options: ApiOptions = { scope: null },
) {
  // Checked when the route module loads, so an endpoint that forgets its scope never serves.
  if ((options.permission || options.identify) && !options.scope)
    throw new Error("withApi: an endpoint that knows its caller must declare the token scope it needs");
  if (options.cache && (options.permission || options.identify))
    throw new Error("withApi: only a public endpoint that ignores its caller may be cached by anyone");
  const route = async (req: Request, context: { params: Promise<P> }) => {
    const url = new URL(req.url);
    const instance = url.pathname;
    let budget: ApiBudget | null = null;
    // Every answer after the count says what is left of the client's budget.
    const counted = (res: Response) => {
      if (budget) for (const [name, value] of Object.entries(apiBudgetHeaders(budget))) res.headers.set(name, value);
      return res;
    };
    try {
      if (!options.checksQuery) assertStorableQuery(url);
      const spentOrThrow = (b: ApiBudget) => {
        if (b.spent)
          throw new AppError(
            "rate_limited",
            `Too many requests from this client: ${b.limit} a minute; try again in ${b.resetSeconds} s`,
            [],
            b.resetSeconds,
          );
      };
      const wantsCaller = options.permission || options.identify;
      let user: UserDto | null;
      try {
        const secret = bearerSecretOrThrow(req);
        // Public endpoints skip the session look-up unless they ask for it.
        user =
          secret !== null ? await resolveToken(secret, wantsCaller ? options.scope : null) : wantsCaller ? await getCurrentUser() : null;
      } catch (err) {
        // A refused credential counts against the address, in the budget an anonymous call of this endpoint
        // uses: guessing tokens, or sending a bogus one to step around a spent budget, is limited like any call.
        if (err instanceof AppError && err.status === 401) {
          budget = await consumeApiBudget(`address:${clientAddress(req)}`, { inProcess: isPublicRead(req, options) });
          spentOrThrow(budget);
        }
        throw err;
      }
      // An anonymous read of a public endpoint is counted in this process's memory (rate-limit.ts says why).
      budget = await consumeApiBudget(user ? `user:${user.id}` : `address:${clientAddress(req)}`, {
        inProcess: user === null && isPublicRead(req, options),
      });
      spentOrThrow(budget);
      if (options.permission) assertAllowed(user, { permission: options.permission });
      const res = await handler({ req, user, params: await context.params });
      return counted(options.cache ? await withValidators(req, res, options.cache) : res);
    } catch (err) {
      if (err instanceof AppError) return counted(problemResponse(err, instance));
      // Checked before the database's codes: a closed client socket also reads as ECONNRESET.
      const aborted = clientAbortResponse(req, err, instance);
      if (aborted) return aborted;
      if (err instanceof ZodError)
        return counted(problemResponse(new AppError("validation_failed", "Invalid input", zodToFieldErrors(err)), instance));
      const unavailable = databaseUnavailable(err);
      if (unavailable) {
        console.warn(`[api] ${req.method} ${instance}: database out of reach`, (err as Error).message);
        return counted(problemResponse(unavailable, instance));
      }
      const refused = storageRefusal(err);
      if (refused) {
        console.warn(`[api] ${req.method} ${instance}: input refused by the database`, err);
        return counted(problemResponse(refused, instance));
      }
      console.error(`[api] ${req.method} ${instance} failed`, err);
      return counted(problemResponse(new AppError("internal", "Something went wrong on our side; it has been logged"), instance));
    }
  };
  // Exposed so a test can compare every endpoint with the published scope table.
  return Object.assign(route, { apiOptions: options });
}
