import { describe, expect, it } from "vitest";
import { seededRandom } from "@/lib/seeded-random";
import { positionsBySets, positionsOfReactionKey, setsHoldingEvery, type MemoryIndex } from "@/lib/search/engines/memory-index";

// Species and reaction look-ups of the in-memory index, against the plain reading of what they
// mean: a document matches a species when either side names it, a reaction pattern when every
// reactant term is among its reactants and every product term among its products.

const KEYS = Array.from({ length: 12 }, (_, i) => `KEY${String(i).padStart(2, "0")}-UHFFFAOYSA-N`);

/** Only what the look-ups read of an index. */
function indexOf(keySets: string[][], sides: [number, number][], reactionOfDoc: number[], reactionKeys: string[]): MemoryIndex {
  return {
    size: sides.length,
    keySets,
    reactantSet: Int32Array.from(sides.map((s) => s[0])),
    productSet: Int32Array.from(sides.map((s) => s[1])),
    reaction: Int32Array.from(reactionOfDoc),
    reactions: reactionKeys.map((key, id) => ({ id, key, equation: key })),
  } as unknown as MemoryIndex;
}

const has = (set: string[], group: string[]) => group.some((k) => set.includes(k));

// Two shapes: few key sets shared by many documents (a pass over every document), and many sets with
// a few documents each (the documents of the passing sets are gathered instead).
describe.each([
  { shape: "few sets, many documents each", keys: KEYS, sets: 40, documents: 500 },
  {
    shape: "many sets, few documents each",
    keys: Array.from({ length: 400 }, (_, i) => `WIDE${String(i).padStart(3, "0")}-UHFFFAOYSA-N`),
    sets: 1500,
    documents: 3000,
  },
])("species and reaction look-ups of the in-memory index ($shape)", ({ keys, sets, documents }) => {
  const next = seededRandom(20261204 + sets);
  const pick = <T>(list: T[]) => list[Math.floor(next() * list.length)];
  const keySets = Array.from({ length: sets }, () => Array.from({ length: 1 + Math.floor(next() * 3) }, () => pick(keys)));
  keySets.push([]); // a side with no species (products not given)
  const sides = Array.from(
    { length: documents },
    () => [Math.floor(next() * keySets.length), Math.floor(next() * keySets.length)] as [number, number],
  );
  const reactionKeys = ["R-A", "R-B", "R-C", "R-A"]; // two reactions may share a key
  const reactionOfDoc = sides.map(() => Math.floor(next() * reactionKeys.length));
  const index = indexOf(keySets, sides, reactionOfDoc, reactionKeys);
  const positions = (test: (i: number) => boolean) => sides.flatMap((_, i) => (test(i) ? [i] : []));

  it("a species (any of the keys its text may mean) matches documents naming it on either side, in order", () => {
    for (let round = 0; round < 50; round++) {
      const group = Array.from({ length: 1 + Math.floor(next() * 2) }, () => pick(keys));
      const hit = setsHoldingEvery(index, [group]);
      const expected = positions((i) => has(keySets[sides[i][0]], group) || has(keySets[sides[i][1]], group));
      expect(Array.from(positionsBySets(index, hit, hit, "either"))).toEqual(expected);
    }
  });

  it("a reaction pattern needs every reactant term among the reactants and every product term among the products", () => {
    for (let round = 0; round < 80; round++) {
      const terms = () =>
        Array.from({ length: Math.floor(next() * 3) }, () => Array.from({ length: 1 + Math.floor(next() * 2) }, () => pick(keys)));
      const reactants = terms();
      const products = terms();
      const expected = positions(
        (i) => reactants.every((g) => has(keySets[sides[i][0]], g)) && products.every((g) => has(keySets[sides[i][1]], g)),
      );
      const got = positionsBySets(index, setsHoldingEvery(index, reactants), setsHoldingEvery(index, products), "both");
      expect(Array.from(got)).toEqual(expected);
    }
  });

  it("a term written twice (A + A) is satisfied by one A; a term that means nothing matches nothing", () => {
    const a = keys[0];
    const twice = setsHoldingEvery(index, [[a], [a]]);
    const once = setsHoldingEvery(index, [[a]]);
    expect(Array.from(twice)).toEqual(Array.from(once));
    expect(Array.from(setsHoldingEvery(index, [[]])).every((x) => x === 0)).toBe(true);
    expect(Array.from(setsHoldingEvery(index, [["NOT-A-KEY"]])).every((x) => x === 0)).toBe(true);
    // No term at all: every side passes.
    expect(Array.from(setsHoldingEvery(index, [])).every((x) => x === 1)).toBe(true);
  });

  it("a reaction key finds the documents of every reaction with that key, in order", () => {
    expect(Array.from(positionsOfReactionKey(index, "R-A"))).toEqual(positions((i) => reactionKeys[reactionOfDoc[i]] === "R-A"));
    expect(Array.from(positionsOfReactionKey(index, "R-C"))).toEqual(positions((i) => reactionOfDoc[i] === 2));
    expect(positionsOfReactionKey(index, "R-NONE").length).toBe(0);
  });
});
