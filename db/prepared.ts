import type { Sql } from "postgres";

/**
 * Drizzle sends every statement through postgres.js's `unsafe` with `prepare: false`. For a
 * statement with parameters the driver then asks the server to parse and describe it, waits for the
 * answer, and only then binds and runs it: two round trips, and a parse, for every query of every
 * page. Prepared (named, kept per connection by its text), a statement the connection has seen
 * runs in one round trip with no parse. Statements without parameters keep the simple protocol.
 *
 * Plans are not kept: the connections run with plan_cache_mode = force_custom_plan (db/client.ts),
 * so each execution is planned for its own values, as an unnamed statement was; only the parse and
 * the extra round trip are saved. Statements inside a transaction (`begin`) are left as they are.
 */
export function preparedStatements<T extends Sql>(client: T): T {
  const unsafe: Sql["unsafe"] = (query, params, options) =>
    client.unsafe(query, params, params && params.length > 0 ? { ...options, prepare: true } : options);
  return new Proxy(client, {
    get(target, prop, receiver) {
      if (prop === "unsafe") return unsafe;
      return Reflect.get(target, prop, receiver);
    },
  });
}
