import { beforeEach, describe, expect, it, vi } from "vitest";

// lib/public-cache.ts: Next's data cache is keyed by the public pages' mark too, so that an
// invalidation made where Next cannot be told (a script) still keeps old data out of new renders.
const keyed: string[][] = [];
const kept = new Map<string, unknown>();
vi.mock("next/cache", () => ({
  // A stand-in for Next's data cache: one value per key, computed once.
  unstable_cache:
    <R>(fn: () => Promise<R>, keyParts: string[]) =>
    async (): Promise<R> => {
      keyed.push(keyParts);
      const key = JSON.stringify(keyParts);
      if (!kept.has(key)) kept.set(key, await fn());
      return kept.get(key) as R;
    },
  revalidateTag: () => {},
}));
let mark = "7";
let markFails = false;
vi.mock("@/db/public-pages-mark", () => ({
  readPublicPagesMark: async () => {
    if (markFails) throw new Error("the database is out of reach");
    return mark;
  },
  movePublicPagesMark: async () => {},
}));

const { cachedPublic } = await import("@/lib/public-cache");

let reads = 0;
let stored = "old";
const speciesNames = cachedPublic(
  async (inchiKey: string) => {
    reads++;
    return `${inchiKey}: ${stored}`;
  },
  "species-names",
  (inchiKey) => [`species:${inchiKey}`],
);

beforeEach(() => {
  keyed.length = 0;
  kept.clear();
  reads = 0;
  stored = "old";
  mark = "7";
  markFails = false;
});

describe("the public data cache under the public pages' mark", () => {
  it("serves kept data while the mark stays, and reads afresh once it moved", async () => {
    expect(await speciesNames("K1")).toBe("K1: old");
    stored = "new";
    expect(await speciesNames("K1")).toBe("K1: old");
    expect(reads).toBe(1);
    mark = "8";
    expect(await speciesNames("K1")).toBe("K1: new");
    expect(reads).toBe(2);
    expect(keyed.map((k) => k[2])).toEqual(["7", "7", "8"]);
  });

  it("keeps serving what it holds under the last mark read while the mark cannot be read", async () => {
    expect(await speciesNames("K2")).toBe("K2: old");
    markFails = true;
    stored = "new";
    expect(await speciesNames("K2")).toBe("K2: old");
    expect(reads).toBe(1);
  });
});
