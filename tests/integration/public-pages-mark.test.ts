import { sql } from "drizzle-orm";
import { describe, expect, it } from "vitest";
import { getDb } from "@/db/client";
import { readPerTurn } from "@/db/read-per-turn";
import { invalidatePublicCache, PUBLIC_TAG } from "@/lib/public-cache";
import { movePublicPagesMark, readPublicPagesMark, readTagMovesSince } from "@/db/public-pages-mark";
import { getSearchGeneration } from "@/lib/search/queries";

// The public pages' mark (drizzle/0039) that the front server's page cache checks, and the shared
// reads of such marks (db/read-per-turn.ts).
describe("the public pages' mark", () => {
  it("moves at every invalidation of public data, whichever process makes it (here: no server at all)", async () => {
    const before = await readPublicPagesMark();
    await invalidatePublicCache([PUBLIC_TAG]);
    const after = await readPublicPagesMark();
    expect(after).not.toBe(before);
    await movePublicPagesMark();
    expect(await readPublicPagesMark()).not.toBe(after);
    // Nothing to invalidate moves nothing.
    const still = await readPublicPagesMark();
    await invalidatePublicCache([]);
    expect(await readPublicPagesMark()).toBe(still);
  });

  it("is read by the runtime role the app runs as", async () => {
    const [{ role }] = await getDb().execute<{ role: string }>(sql`select current_user as role`);
    expect(role).not.toBe("postgres");
    expect(await readPublicPagesMark()).toMatch(/^\d+$/);
  });
});

describe("the tags moved after a mark (what the front server's memory asks)", () => {
  it("names each tag moved after the mark with its latest move, and one read serves a turn's callers from the lowest mark", async () => {
    const start = await readPublicPagesMark();
    await movePublicPagesMark(["test-moves:a"]);
    const middle = await readPublicPagesMark();
    await movePublicPagesMark(["test-moves:b", "test-moves:a"]);
    const end = await readPublicPagesMark();
    const [fromStart, fromMiddle] = await Promise.all([readTagMovesSince(start), readTagMovesSince(middle)]);
    // One batch, read from the lower mark: each caller looks only at moves after its own.
    expect(fromStart).toBe(fromMiddle);
    expect(fromStart?.get("test-moves:a")).toBeGreaterThan(BigInt(middle));
    expect(fromStart?.get("test-moves:b")).toBeGreaterThan(BigInt(middle));
    expect(fromStart?.get("test-moves:a")).toBeLessThanOrEqual(BigInt(end));
    expect((await readTagMovesSince(end))?.has("test-moves:a")).toBe(false);
  });
});

describe("reads shared within one turn of the event loop", () => {
  it("gives every caller of the same turn one read, sent after all of them asked", async () => {
    let sent = 0;
    const read = () =>
      readPerTurn("a test's read", async (db) => {
        sent += 1;
        const [row] = await db.execute<{ n: number }>(sql`select 1 as n`);
        return row.n;
      });
    const together = [read(), read(), read()];
    expect(new Set(together).size).toBe(1);
    expect(sent).toBe(0);
    expect(await Promise.all(together)).toEqual([1, 1, 1]);
    expect(sent).toBe(1);
    // Asked after that read was sent: a read of its own (never an answer older than the asking).
    expect(await read()).toBe(1);
    expect(sent).toBe(2);
  });

  it("sees a change committed before the asking (the search generation after a change to the documents)", async () => {
    const before = await getSearchGeneration();
    await getDb().transaction(async (tx) => {
      await tx.execute(sql`update search_generation set generation = generation + 1`);
    });
    const after = await getSearchGeneration();
    expect(after).not.toBe(before);
  });

  it("passes a failed read to every caller that shared it", async () => {
    const fail = () =>
      readPerTurn("a failing read", async (db) => {
        await db.execute(sql`select * from a_table_that_is_not_there`);
        return 0;
      });
    const results = await Promise.allSettled([fail(), fail()]);
    expect(results.map((r) => r.status)).toEqual(["rejected", "rejected"]);
  });
});
