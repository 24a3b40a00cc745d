import { describe, expect, it } from "vitest";
import { relevanceKeys, topByKey } from "@/lib/search/engines/relevance";

// Ordering rules of the PostgreSQL engine's relevance sort (lib/search/engines/relevance.ts); the
// ranks are invented numbers in 0 … 1, the range of PostgreSQL's ts_rank with no normalisation.

/** Version ids in the order the keys sort them (key desc, id desc), as the engine pages them. */
const ordered = (ids: number[], keys: Float64Array) =>
  topByKey(
    ids.length,
    (k) => keys[k],
    (k) => ids[k],
    null,
    ids.length,
  ).map((p) => ids[p.k]);

describe("relevance keys of a text search", () => {
  const ids = [11, 12, 13, 14, 15, 16];
  const cheap = [0.1, 0.6, 0.6, 0, 0.3, 0.9];
  // Exact ranks that disagree with the cheap score, as the whole document's ts_rank may.
  const exact = new Map([
    [11, 0.95],
    [12, 0.2],
    [13, 0.7],
    [14, 0.99],
    [15, 0.5],
    [16, 0.4],
  ]);

  it("asks the exact rank of the best by the cheap score only (ties: the higher version id), and puts them first in that rank's order", async () => {
    const asked: number[][] = [];
    const keys = await relevanceKeys(
      ids,
      cheap,
      async (wanted) => (asked.push(wanted), new Map(wanted.map((id) => [id, exact.get(id)!]))),
      3,
    );
    expect(asked).toEqual([[16, 13, 12]]);
    expect(ordered(ids, keys)).toEqual([13, 16, 12, 15, 11, 14]);
  });

  it("orders the rest by the cheap score, always below the ranked ones, even a rank of 0", async () => {
    const keys = await relevanceKeys(ids, cheap, async (wanted) => new Map(wanted.map((id) => [id, 0])), 2);
    expect(ordered(ids, keys)).toEqual([16, 13, 12, 15, 11, 14]);
    for (const k of [0, 1, 3, 4]) expect(keys[k]).toBeLessThan(0);
  });

  it("ranks every match exactly when there are no more than the bound, and asks nothing without matches", async () => {
    const keys = await relevanceKeys(ids, cheap, async (wanted) => new Map(wanted.map((id) => [id, exact.get(id)!])));
    expect(ordered(ids, keys)).toEqual([14, 11, 13, 15, 16, 12]);
    let calls = 0;
    expect(await relevanceKeys([], [], async () => (calls++, new Map()))).toHaveLength(0);
    expect(calls).toBe(0);
  });
});
