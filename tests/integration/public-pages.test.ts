import { describe, expect, it } from "vitest";
import { applyTransition } from "@/lib/curation/transitions";
import { depositNewDataset } from "@/lib/datasets/deposits";
import { EXAMPLE_DEPOSIT } from "@/lib/deposits";
import {
  findPublicReaction,
  findPublicSpecies,
  listClassCounts,
  listPublicReactionKeys,
  listPublicSpeciesKeys,
  listPublicVersionPages,
  listReactionsOfClass,
  listReactionsOfSpecies,
  listVersionCacheTags,
} from "@/lib/reactions/public-queries";
import { createUser } from "@/lib/users/queries";
import { sql, uniqueEmail } from "./helpers";

/**
 * An n-alkane of 20 carbons with 13C at random positions, so each run has species and a reaction
 * of its own (invented for the test): OH + RH → H2O + R, R the radical at the first carbon.
 */
function labelledAbstraction(title: string, name: string) {
  const heavy = Array.from({ length: 20 }, (_, i) => i > 0 && Math.random() < 0.5);
  const atom = (i: number, h: number) => `[${heavy[i] ? "13" : ""}CH${h}]`;
  const chain = (first: number) => heavy.map((_, i) => atom(i, i === 0 ? first : i === 19 ? 3 : 2)).join("");
  return {
    ...EXAMPLE_DEPOSIT,
    title,
    reaction: {
      ...EXAMPLE_DEPOSIT.reaction,
      reactants: [
        { name: "hydroxyl radical", smiles: "[OH]", coefficient: 1 },
        { name, smiles: chain(3), coefficient: 1 },
      ],
      products: [
        { name: "water", smiles: "O", coefficient: 1 },
        { name: `${name} radical`, smiles: chain(2), coefficient: 1 },
      ],
      class: "hydrogen-abstraction" as const,
    },
  };
}

async function people() {
  const owner = await createUser({ email: uniqueEmail("pub"), name: "Public Owner", passwordHash: "x", verified: true });
  const curator = await createUser({
    email: uniqueEmail("pubc"),
    name: "Public Curator",
    passwordHash: "x",
    role: "curator",
    verified: true,
  });
  return { owner, curator };
}

async function reactionAndKeysOf(versionId: number) {
  const [row] = await sql`select r.id, r.key from dataset_versions v join reactions r on r.id = v.reaction_id where v.id = ${versionId}`;
  const keys =
    await sql`select s.inchi_key, rp.side from reaction_participants rp join species s on s.id = rp.species_id where rp.reaction_id = ${row.id}`;
  const alkane = keys.find((k) => k.side === "reactant" && k.inchi_key !== "TUJKJAMUKRIRHC-UHFFFAOYSA-N")!.inchi_key as string;
  const radical = keys.find((k) => k.side === "product" && k.inchi_key !== "XLYOFNOQVPJJNP-UHFFFAOYSA-N")!.inchi_key as string;
  return { reactionId: Number(row.id), key: row.key as string, alkane, radical };
}

const classRow = async (id: string) => (await listClassCounts()).find((c) => c.id === id)!;

describe("public reaction, species and class queries", () => {
  it("never show a reaction or species that only drafts and submissions describe, not even in a count", async () => {
    const { owner } = await people();
    const before = await classRow("hydrogen-abstraction");
    const draft = await depositNewDataset({ actor: owner, document: labelledAbstraction("Draft only alkane", "draft-only icosane") });
    const { reactionId, key, alkane, radical } = await reactionAndKeysOf(draft.id);
    await applyTransition({ versionId: draft.id, actorId: owner.id, transition: "submit" });
    expect(await findPublicReaction({ id: reactionId })).toBeNull();
    expect(await findPublicReaction({ key })).toBeNull();
    expect(await findPublicSpecies({ inchiKey: alkane })).toBeNull();
    expect(await findPublicSpecies({ inchiKey: radical })).toBeNull();
    expect(await listReactionsOfSpecies({ inchiKey: alkane })).toEqual([]);
    expect((await listReactionsOfClass({ classId: "hydrogen-abstraction" })).map((r) => r.id)).not.toContain(reactionId);
    expect(await listPublicReactionKeys()).not.toContain(key);
    expect(await listPublicSpeciesKeys()).not.toContain(alkane);
    expect((await listPublicVersionPages()).some((v) => v.datasetId === draft.datasetId)).toBe(false);
    expect(await classRow("hydrogen-abstraction")).toEqual(before);
  });

  it("count a species' reactions and a class's reactions and datasets from published versions, retracted apart", async () => {
    const { owner, curator } = await people();
    const before = await classRow("hydrogen-abstraction");
    const document = labelledAbstraction("Published alkane A", "test icosane");
    const a = await depositNewDataset({ actor: owner, document });
    const b = await depositNewDataset({ actor: owner, document: { ...document, title: "Published alkane B" } });
    // A draft of the same reaction counts nowhere.
    await depositNewDataset({ actor: owner, document: { ...document, title: "Draft alkane C" } });
    for (const v of [a, b]) {
      await applyTransition({ versionId: v.id, actorId: owner.id, transition: "submit" });
      await applyTransition({ versionId: v.id, actorId: curator.id, transition: "accept", reason: "Consistent." });
    }
    const { reactionId, key, alkane, radical } = await reactionAndKeysOf(a.id);

    const reaction = await findPublicReaction({ key });
    expect(reaction).toEqual({ id: reactionId, key, equation: expect.any(String), classes: ["hydrogen-abstraction"] });
    expect(await findPublicReaction({ id: reactionId })).toEqual(reaction);

    const species = await findPublicSpecies({ inchiKey: alkane });
    expect(species?.names).toEqual(["test icosane"]);
    expect(species?.formula).toBe("C20H42");
    // The product side: the radical's page lists the reaction as a product.
    const asProduct = await listReactionsOfSpecies({ inchiKey: radical });
    expect(asProduct).toEqual([
      { id: reactionId, key, equation: expect.any(String), datasets: 2, retracted: 0, asReactant: false, asProduct: true },
    ]);
    expect((await listReactionsOfSpecies({ inchiKey: alkane }))[0]).toMatchObject({ datasets: 2, asReactant: true, asProduct: false });
    // OH takes part in many reactions, this one among them.
    expect((await listReactionsOfSpecies({ inchiKey: "TUJKJAMUKRIRHC-UHFFFAOYSA-N" })).map((r) => r.id)).toContain(reactionId);

    expect((await listReactionsOfClass({ classId: "hydrogen-abstraction" })).find((r) => r.id === reactionId)).toMatchObject({
      datasets: 2,
    });
    expect(await listReactionsOfClass({ classId: "addition" })).not.toContainEqual(expect.objectContaining({ id: reactionId }));
    const after = await classRow("hydrogen-abstraction");
    expect(after.reactions - before.reactions).toBe(1);
    expect(after.datasets - before.datasets).toBe(2);
    expect(await listPublicReactionKeys()).toContain(key);
    expect(await listPublicSpeciesKeys()).toEqual(expect.arrayContaining([alkane, radical]));
    expect((await listPublicVersionPages()).filter((v) => v.datasetId === a.datasetId)).toEqual([
      { datasetId: a.datasetId, number: 1, changed: expect.stringMatching(/^\d{4}-\d\d-\d\dT\d\d:\d\d:\d\dZ$/) },
    ]);

    // Retracted: still public (marked), counted apart, out of the class's published counts.
    await applyTransition({ versionId: b.id, actorId: curator.id, transition: "retract", reason: "A calibration error was found." });
    expect((await listReactionsOfSpecies({ inchiKey: alkane }))[0]).toMatchObject({ datasets: 1, retracted: 1 });
    expect((await classRow("hydrogen-abstraction")).datasets - before.datasets).toBe(1);
    expect(await findPublicSpecies({ inchiKey: alkane })).not.toBeNull();
  });

  it("tag a version's pages for invalidation: dataset, reaction, species, class, listings and search", async () => {
    const { owner } = await people();
    const v = await depositNewDataset({ actor: owner, document: labelledAbstraction("Tagged alkane", "tagged icosane") });
    const { reactionId, alkane, radical } = await reactionAndKeysOf(v.id);
    const tags = await listVersionCacheTags({ versionId: v.id });
    expect(tags).toEqual(
      expect.arrayContaining([
        "public",
        "search",
        `dataset:${v.datasetId}`,
        `reaction:${reactionId}`,
        "class:hydrogen-abstraction",
        `species:${alkane}`,
        `species:${radical}`,
        "species:TUJKJAMUKRIRHC-UHFFFAOYSA-N",
      ]),
    );
  });
});
