import { sql } from "drizzle-orm";
import { describe, expect, it } from "vitest";
import { getDb } from "@/db/client";

// db/client.ts with db/prepared.ts: statements with parameters are prepared per connection, plans are not kept.
describe("the app's database connections", () => {
  it("plan every execution for its own values (plan_cache_mode = force_custom_plan)", async () => {
    const [row] = await getDb().execute<{ mode: string }>(sql`select current_setting('plan_cache_mode') as mode`);
    expect(row.mode).toBe("force_custom_plan");
  });

  it("run a prepared statement again with other values, and other types, and get each one's own answer", async () => {
    const db = getDb();
    for (let round = 0; round < 8; round++) {
      const [row] = await db.execute<{ n: number; t: string }>(sql`select ${round}::int + 1 as n, ${`x${round}`}::text as t`);
      expect(row).toEqual({ n: round + 1, t: `x${round}` });
    }
    const text = await db.execute<{ v: string }>(sql`select ${"3"} as v`);
    expect(text[0].v).toBe("3");
  });
});
