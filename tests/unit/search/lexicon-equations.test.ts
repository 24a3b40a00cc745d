import { describe, expect, it, vi } from "vitest";

// The species lexicon (lib/search/lexicon.ts) over stand-ins of its reads: the generation mark, the
// lexicon's rows, and the display equations of every reaction with public data, read in the background.
const db = vi.hoisted(() => ({
  generation: "g1",
  preloads: [] as { resolve: (m: Map<string, string>) => void }[],
  perSearch: [] as string[][],
}));
vi.mock("@/lib/search/queries", () => ({
  getSearchGeneration: async () => db.generation,
  readSpeciesLexicon: async () => ({ generation: db.generation, names: [], publicSpecies: [] }),
  listDisplayEquations: ({ reactionKeys }: { reactionKeys: string[] | "public" }) => {
    if (reactionKeys === "public") return new Promise((resolve) => db.preloads.push({ resolve }));
    db.perSearch.push(reactionKeys);
    return Promise.resolve(new Map(reactionKeys.map((k) => [k, `equation of ${k} read for a search`])));
  },
}));

import { displayEquations, speciesLexicon } from "@/lib/search/lexicon";

const settle = () => new Promise((resolve) => setTimeout(resolve, 0));

describe("display equations read ahead", () => {
  it("one read of every equation at a time, for the newest lexicon waiting; searches meanwhile read their own", async () => {
    await speciesLexicon();
    expect(db.preloads).toHaveLength(1);
    // Changes while the read runs: each a new lexicon, none a read of its own yet.
    db.generation = "g2";
    await speciesLexicon();
    db.generation = "g3";
    const newest = await speciesLexicon();
    await settle();
    expect(db.preloads).toHaveLength(1);
    // A search meanwhile reads the equations its rows name.
    expect(await displayEquations(["r1"])).toEqual(new Map([["r1", "equation of r1 read for a search"]]));
    expect(db.perSearch).toEqual([["r1"]]);
    // The first read ends (for g1's lexicon, long gone): the next is for the newest only.
    db.preloads[0].resolve(
      new Map([
        ["r1", "old"],
        ["r2", "old"],
      ]),
    );
    await settle();
    expect(db.preloads).toHaveLength(2);
    db.preloads[1].resolve(
      new Map([
        ["r1", "ahead"],
        ["r2", "ahead"],
      ]),
    );
    await settle();
    // What a search read first is kept; the rest comes from the read ahead, with no read of its own.
    expect(newest.equations.get("r1")).toBe("equation of r1 read for a search");
    expect(await displayEquations(["r2"])).toEqual(new Map([["r2", "ahead"]]));
    expect(db.perSearch).toEqual([["r1"]]);
    expect(db.preloads).toHaveLength(2);
  });
});
