import { describe, expect, it, vi } from "vitest";
import type { Sql } from "postgres";
import { isReadOnlyStatement, mayRetryStatement, withConnectionRetry } from "@/db/retry";

const err = (code: string) => Object.assign(new Error(code), { code });

describe("which failed statements may be sent again", () => {
  it.each([
    ["insert into t values (1)", "ECONNREFUSED", true],
    ["insert into t values (1)", "57P03", true],
    ["insert into t values (1)", "CONNECT_TIMEOUT", true],
    ["insert into t values (1)", "CONNECTION_CLOSED", false],
    ["insert into t values (1)", "ECONNRESET", false],
    ["update t set a = 1", "57P01", false],
    ["select * from t", "CONNECTION_CLOSED", true],
    ["select * from t", "57P01", true],
    ["select * from t", "23505", false],
    ["select * from t for update", "CONNECTION_CLOSED", false],
    ["select nextval('s')", "ECONNRESET", false],
    ["with x as (delete from t returning *) select * from x", "ECONNRESET", false],
  ])("%s after %s → %s", (query, code, expected) => {
    expect(mayRetryStatement(query, err(code))).toBe(expected);
  });

  it("treats only plain selects as read-only", () => {
    expect(isReadOnlyStatement('  select "id" from "users" where "id" = $1')).toBe(true);
    expect(isReadOnlyStatement("select * into t2 from t")).toBe(false);
    expect(isReadOnlyStatement("delete from t")).toBe(false);
  });
});

/** A stand-in client whose queries fail with the given codes, then succeed. */
function fakeClient(failures: string[]) {
  const calls: string[] = [];
  const unsafe = vi.fn((query: string) => {
    calls.push(query);
    const code = failures.shift();
    const p = code ? Promise.reject(err(code)) : Promise.resolve([{ ok: 1 }]);
    return Object.assign(p, { values: () => p.then((rows) => rows.map((r) => Object.values(r))) });
  });
  const begin = vi.fn(async (fn: (tx: unknown) => unknown) => {
    const code = failures.shift();
    if (code === "before") throw err("CONNECTION_CLOSED");
    const result = await fn({});
    if (code === "after") throw err("CONNECTION_CLOSED");
    return result;
  });
  return { client: Object.assign(() => {}, { unsafe, begin, options: { parsers: {} } }) as unknown as Sql, calls, begin };
}

describe("withConnectionRetry", () => {
  it("sends a write again when the connection could not be opened", async () => {
    const { client, calls } = fakeClient(["ECONNREFUSED"]);
    await expect(withConnectionRetry(client).unsafe("insert into t values (1)")).resolves.toEqual([{ ok: 1 }]);
    expect(calls).toHaveLength(2);
  });

  it("never re-runs a write whose connection broke after sending it", async () => {
    const { client, calls } = fakeClient(["CONNECTION_CLOSED"]);
    await expect(withConnectionRetry(client).unsafe("insert into t values (1)")).rejects.toMatchObject({ code: "CONNECTION_CLOSED" });
    expect(calls).toHaveLength(1);
  });

  it("retries a read once, also through .values(), and gives up after the second failure", async () => {
    const { client, calls } = fakeClient(["ECONNRESET"]);
    await expect(withConnectionRetry(client).unsafe("select 1 as ok").values()).resolves.toEqual([[1]]);
    const second = fakeClient(["ECONNRESET", "ECONNRESET"]);
    await expect(withConnectionRetry(second.client).unsafe("select 1")).rejects.toMatchObject({ code: "ECONNRESET" });
    expect(calls).toHaveLength(2);
    expect(second.calls).toHaveLength(2);
  });

  it("retries a transaction only when it failed before its body ran", async () => {
    const before = fakeClient(["before"]);
    const body = vi.fn(async () => "done");
    await expect(withConnectionRetry(before.client).begin(body)).resolves.toBe("done");
    expect(before.begin).toHaveBeenCalledTimes(2);
    expect(body).toHaveBeenCalledTimes(1);

    const after = fakeClient(["after"]);
    const body2 = vi.fn(async () => "done");
    await expect(withConnectionRetry(after.client).begin(body2)).rejects.toMatchObject({ code: "CONNECTION_CLOSED" });
    expect(after.begin).toHaveBeenCalledTimes(1);
    expect(body2).toHaveBeenCalledTimes(1);
  });

  it("passes everything else through to the client", () => {
    const { client } = fakeClient([]);
    expect(withConnectionRetry(client).options).toBe(client.options);
  });
});
