import type { Sql } from "postgres";

/**
 * When a pooled query may run again on a fresh connection after a connection failure (a database
 * restart closes every pooled connection at once). A write is re-run only when the failure
 * happened while connecting, so the statement never reached the server; a read-only statement is
 * re-run after any connection failure. Errors the server reports about the statement itself
 * (constraint, syntax, serialization) are never retried here.
 */

/** Failures while opening a connection: the query was never sent. */
const notSentCodes = new Set([
  "ECONNREFUSED",
  "CONNECT_TIMEOUT",
  "ENOTFOUND",
  "EAI_AGAIN",
  "57P03", // cannot_connect_now: the server is starting up or shutting down
  "08001", // sqlclient_unable_to_establish_sqlconnection
  "08004", // sqlserver_rejected_establishment_of_sqlconnection
]);

/** Failures of an open connection: the statement may or may not have run. */
const lostConnectionCodes = new Set([
  "CONNECTION_CLOSED",
  "CONNECTION_ENDED",
  "ECONNRESET",
  "EPIPE",
  "ETIMEDOUT",
  "57P01", // admin_shutdown
  "57P02", // crash_shutdown
  "08000",
  "08003",
  "08006",
]);

function codeOf(err: unknown): string | undefined {
  if (!err || typeof err !== "object") return undefined;
  const code = (err as { code?: unknown }).code;
  return typeof code === "string" ? code : undefined;
}

export function isNotSentError(err: unknown): boolean {
  const code = codeOf(err);
  return code !== undefined && notSentCodes.has(code);
}

export function isConnectionError(err: unknown): boolean {
  const code = codeOf(err);
  return code !== undefined && (notSentCodes.has(code) || lostConnectionCodes.has(code));
}

/** A plain SELECT that neither locks rows nor calls a function known to change state. */
export function isReadOnlyStatement(query: string): boolean {
  if (!/^\s*(\(\s*)*select\b/i.test(query)) return false;
  return !/\b(for\s+(no\s+key\s+)?update|for\s+(key\s+)?share|nextval|setval|pg_notify|pg_advisory\w*|into)\b/i.test(query);
}

/** Whether a failed statement may be sent once more. */
export function mayRetryStatement(query: string, err: unknown): boolean {
  return isNotSentError(err) || (isReadOnlyStatement(query) && isConnectionError(err));
}

const retryDelayMs = 250;
const pause = () => new Promise((resolve) => setTimeout(resolve, retryDelayMs));

/**
 * Wraps a postgres.js client so that the statements Drizzle sends through `unsafe` and the
 * transactions it opens through `begin` are tried once more, after a short pause, when
 * `mayRetryStatement` allows it. A transaction is retried only when it failed before its body
 * ran (the BEGIN could not be sent), never after: the body may have done other work.
 * Statements inside a transaction are not wrapped.
 */
export function withConnectionRetry<T extends Sql>(client: T): T {
  const unsafe: Sql["unsafe"] = (query, params, options) => {
    const run = (values: boolean) => {
      const attempt = () => {
        const pending = client.unsafe(query, params, options);
        return values ? pending.values() : pending;
      };
      return Promise.resolve(attempt()).catch(async (err: unknown) => {
        if (!mayRetryStatement(query, err)) throw err;
        await pause();
        return attempt();
      });
    };
    // Drizzle awaits the query itself or its `.values()`: both are supported, nothing else is used.
    return { then: (ok: never, fail: never) => run(false).then(ok, fail), values: () => run(true) } as never;
  };

  const begin = async (...args: unknown[]) => {
    const fn = args.at(-1) as (tx: unknown) => unknown;
    const rest = args.slice(0, -1);
    let started = false;
    const body = (tx: unknown) => {
      started = true;
      return fn(tx);
    };
    const attempt = () => (client.begin as (...a: unknown[]) => Promise<unknown>)(...rest, body);
    try {
      return await attempt();
    } catch (err) {
      if (started || !isConnectionError(err)) throw err;
      await pause();
      return attempt();
    }
  };

  return new Proxy(client, {
    get(target, prop, receiver) {
      if (prop === "unsafe") return unsafe;
      if (prop === "begin") return begin;
      return Reflect.get(target, prop, receiver);
    },
  });
}
