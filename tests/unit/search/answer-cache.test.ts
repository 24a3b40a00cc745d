import { describe, expect, it } from "vitest";
import { answerCache } from "@/lib/search/answer-cache";

describe("the search answers kept in memory", () => {
  const setUp = (options = { maxBytes: 1000, maxEntryBytes: 400 }) => {
    let mark = "g1";
    let computed = 0;
    const cache = answerCache(async () => mark, options);
    const ask = (key: string, answer = `answer of ${key} under ${mark}`) =>
      cache.get(key, async () => {
        computed++;
        return answer;
      });
    return { cache, ask, move: (to: string) => (mark = to), computed: () => computed };
  };

  it("answers again from memory while the documents' generation stays, and computes afresh once it moved (a publication or retraction)", async () => {
    const { ask, move, computed } = setUp();
    expect(await ask("q=ozone")).toBe("answer of q=ozone under g1");
    expect(await ask("q=ozone")).toBe("answer of q=ozone under g1");
    expect(computed()).toBe(1);
    move("g2");
    expect(await ask("q=ozone")).toBe("answer of q=ozone under g2");
    expect(computed()).toBe(2);
    // Another request is another answer.
    expect(await ask("q=ozone&view=reactions")).toBe("answer of q=ozone&view=reactions under g2");
    expect(computed()).toBe(3);
  });

  it("computes an answer asked for by many at once only once", async () => {
    const { ask, computed } = setUp();
    const all = await Promise.all(Array.from({ length: 10 }, () => ask("q=methane")));
    expect(new Set(all).size).toBe(1);
    expect(computed()).toBe(1);
  });

  it("keeps at most maxBytes (UTF-16 text and keys: 2 bytes a character), the least recently used going first, and no answer over maxEntryBytes", async () => {
    const { cache, ask, computed } = setUp({ maxBytes: 410, maxEntryBytes: 300 });
    await ask("a", "x".repeat(100)); // 200 bytes and its key's 2
    await ask("b", "y".repeat(100)); // 404 in all
    await ask("a", "never computed"); // a is now the most recently used
    await ask("c", "z".repeat(50)); // 506 > 410: b goes
    expect(cache.stats.entries).toBe(2);
    expect(cache.stats.bytes).toBe(304);
    const before = computed();
    expect(await ask("a", "again")).toBe("x".repeat(100));
    expect(await ask("b", "b again")).toBe("b again");
    expect(computed()).toBe(before + 1);
    await ask("big", "w".repeat(200)); // 400 bytes > maxEntryBytes: answered, not kept
    expect(await ask("big", "computed again")).toBe("computed again");
  });

  it("keeps nothing of a failed computation", async () => {
    const { cache, ask } = setUp();
    await expect(cache.get("q=x", async () => Promise.reject(new Error("database out of reach")))).rejects.toThrow("out of reach");
    expect(await ask("q=x")).toBe("answer of q=x under g1");
  });
});

describe("the mark one search reads", () => {
  it("is handed to the computation, which reads no other (lib/search/queries.ts withSearchGeneration)", async () => {
    let reads = 0;
    const cache = answerCache(async () => `g${++reads}`, { maxBytes: 1000, maxEntryBytes: 400 });
    const given: string[] = [];
    await cache.get("q=OH", async (mark) => {
      given.push(mark);
      return "answer";
    });
    expect(given).toEqual(["g1"]);
    expect(reads).toBe(1);
  });
});
