import { describe, expect, it } from "vitest";
import type { Sql } from "postgres";
import { preparedStatements } from "@/db/prepared";

// What db/prepared.ts changes in the options Drizzle gives postgres.js, seen by a stand-in client.
function standIn() {
  const sent: { query: string; params: unknown; options: unknown }[] = [];
  const client = {
    unsafe: (query: string, params?: unknown[], options?: Record<string, unknown>) => {
      sent.push({ query, params, options });
      return { values: () => Promise.resolve([]) };
    },
    begin: () => "begin of the client itself",
    options: { max: 10 },
  };
  return { client: client as unknown as Sql, sent };
}

describe("statements with parameters are prepared", () => {
  it("asks the driver to prepare a statement with parameters, keeping the caller's other options", () => {
    const { client, sent } = standIn();
    const db = preparedStatements(client);
    void db.unsafe('select "id" from "users" where "id" = $1', [7], { prepare: false, simple: false } as never);
    expect(sent[0].options).toEqual({ prepare: true, simple: false });
  });

  it("leaves a statement without parameters as it came (the simple protocol)", () => {
    const { client, sent } = standIn();
    const db = preparedStatements(client);
    void db.unsafe("select 1", [], { prepare: false } as never);
    void db.unsafe("begin");
    expect(sent.map((s) => s.options)).toEqual([{ prepare: false }, undefined]);
  });

  it("passes everything else through: transactions, options, the query's own .values()", async () => {
    const { client } = standIn();
    const db = preparedStatements(client);
    expect((db.begin as unknown as () => string)()).toBe("begin of the client itself");
    expect((db as unknown as { options: unknown }).options).toEqual({ max: 10 });
    await expect(db.unsafe("select $1", [1]).values()).resolves.toEqual([]);
  });
});
