import { describe, expect, it } from "vitest";
import { applyTransition } from "@/lib/curation/transitions";
import { depositNewDataset } from "@/lib/datasets/deposits";
import { EXAMPLE_DEPOSIT } from "@/lib/deposits";
import { countPublicData, getReaction, listPublicVersionsOfReaction } from "@/lib/reactions/queries";
import { createUser } from "@/lib/users/queries";
import { sql, uniqueEmail } from "./helpers";

describe("datasets of the same reaction meet on one reaction", () => {
  it("lists only public versions, newest per dataset, with points and analysis", async () => {
    const owner = await createUser({ email: uniqueEmail("rx"), name: "Rx Owner", passwordHash: "x", verified: true });
    const curator = await createUser({ email: uniqueEmail("rxc"), name: "Rx Curator", passwordHash: "x", role: "curator", verified: true });
    const before = await countPublicData();
    const a = await depositNewDataset({ actor: owner, document: { ...EXAMPLE_DEPOSIT, title: "Reaction page A" } });
    // The same reaction written in another order and with other names still meets on one row.
    const reordered = {
      ...EXAMPLE_DEPOSIT,
      title: "Reaction page B",
      reaction: {
        ...EXAMPLE_DEPOSIT.reaction,
        reactants: [
          { smiles: "C", name: "CH4" },
          { smiles: "[OH]", name: "OH" },
        ],
      },
    };
    const b = await depositNewDataset({ actor: owner, document: reordered });
    const draft = await depositNewDataset({ actor: owner, document: { ...EXAMPLE_DEPOSIT, title: "Reaction page draft" } });
    const [ra, rb, rd] = await Promise.all(
      [a, b, draft].map(async (v) => (await sql`select reaction_id from dataset_versions where id = ${v.id}`)[0].reaction_id),
    );
    expect(rb).toBe(ra);
    expect(rd).toBe(ra);
    for (const v of [a, b]) {
      await applyTransition({ versionId: v.id, actorId: owner.id, transition: "submit" });
      await applyTransition({ versionId: v.id, actorId: curator.id, transition: "accept", reason: "Consistent." });
    }
    const reaction = await getReaction({ id: ra });
    expect(reaction?.participants).toHaveLength(4);
    const names = reaction!.participants.find((p) => p.formula === "CH4")!.names;
    expect(names).toEqual(expect.arrayContaining(["CH4", "methane"]));
    const versions = await listPublicVersionsOfReaction({ reactionId: ra });
    const ids = versions.map((v) => v.versionId);
    expect(ids).toEqual(expect.arrayContaining([a.id, b.id]));
    expect(ids).not.toContain(draft.id);
    expect(versions.find((v) => v.versionId === a.id)!.points).toHaveLength(EXAMPLE_DEPOSIT.points.length);
    const after = await countPublicData();
    expect(after.datasets - before.datasets).toBe(2);
  });
});

describe("species names on public pages", () => {
  it("come from published versions only: a draft's names change nothing until it is published", async () => {
    const owner = await createUser({ email: uniqueEmail("rxn"), name: "Names Owner", passwordHash: "x", verified: true });
    const curator = await createUser({
      email: uniqueEmail("rxnc"),
      name: "Names Curator",
      passwordHash: "x",
      role: "curator",
      verified: true,
    });
    const named = (title: string, methane: string) => ({
      ...EXAMPLE_DEPOSIT,
      title,
      reaction: {
        ...EXAMPLE_DEPOSIT.reaction,
        reactants: [
          { smiles: "[OH]", name: "hydroxyl" },
          { smiles: "C", name: methane },
        ],
      },
    });
    const published = await depositNewDataset({ actor: owner, document: named("Names published", "methane") });
    await applyTransition({ versionId: published.id, actorId: owner.id, transition: "submit" });
    await applyTransition({ versionId: published.id, actorId: curator.id, transition: "accept", reason: "Consistent." });
    const [{ reaction_id: reactionId }] = await sql`select reaction_id from dataset_versions where id = ${published.id}`;
    const methaneNames = async () => (await getReaction({ id: reactionId }))!.participants.find((p) => p.formula === "CH4")!.names;

    const draft = await depositNewDataset({ actor: owner, document: named("Names draft", "AAA renamed by a draft") });
    expect(await methaneNames()).not.toContain("AAA renamed by a draft");
    const [{ n }] = await sql`select count(*)::int as n from species_names where name = 'AAA renamed by a draft'`;
    expect(n).toBe(0);

    await applyTransition({ versionId: draft.id, actorId: owner.id, transition: "submit" });
    await applyTransition({ versionId: draft.id, actorId: curator.id, transition: "accept", reason: "Consistent." });
    expect(await methaneNames()).toContain("AAA renamed by a draft");
    const [{ m }] = await sql`select count(*)::int as m from species_names where name = 'AAA renamed by a draft'`;
    expect(m).toBe(1);
  });
});
