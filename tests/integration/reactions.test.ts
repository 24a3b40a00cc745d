import { describe, expect, it } from "vitest";
import { applyTransition } from "@/lib/curation/transitions";
import { depositNewDataset, startNextVersion, updateDraft } from "@/lib/datasets/deposits";
import { EXAMPLE_DEPOSIT } from "@/lib/deposits";
import { countPublicData, getReaction, listPublicVersionsOfReaction } from "@/lib/reactions/queries";
import { createUser } from "@/lib/users/queries";
import { createRolePeople, sql, uniqueEmail } from "./helpers";

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

describe("the home page's figures", () => {
  it("count each dataset once, by its newest public version: a revision adds no points of its earlier version, a retraction takes the dataset out", async () => {
    const { owner, curator } = await createRolePeople("count");
    const publish = async (versionId: number) => {
      await applyTransition({ versionId, actorId: owner.id, transition: "submit" });
      await applyTransition({ versionId, actorId: curator.id, transition: "accept", reason: "Consistent." });
    };
    const before = await countPublicData();
    const first = await depositNewDataset({ actor: owner, document: { ...EXAMPLE_DEPOSIT, title: "Counted once" } });
    await publish(first.id);
    const n = EXAMPLE_DEPOSIT.points.length;
    expect(await countPublicData()).toEqual({ datasets: before.datasets + 1, reactions: expect.any(Number), points: before.points + n });
    // Version 2 keeps one point fewer; version 1 stays published (and citable) beside it.
    const next = await startNextVersion({ actor: owner, versionId: first.id });
    const [{ lock_version: lock }] = await sql`select lock_version from dataset_versions where id = ${next.id}`;
    await updateDraft({
      actor: owner,
      versionId: next.id,
      expectedLockVersion: Number(lock),
      document: { ...EXAMPLE_DEPOSIT, title: "Counted once", points: EXAMPLE_DEPOSIT.points.slice(1) },
    });
    await publish(next.id);
    const [{ state }] = await sql`select state from dataset_versions where id = ${first.id}`;
    expect(state).toBe("published");
    expect(await countPublicData()).toMatchObject({ datasets: before.datasets + 1, points: before.points + n - 1 });
    // Retracting the newest version takes the dataset out of the figures (the reactions list shows it no more either).
    await applyTransition({ versionId: next.id, actorId: curator.id, transition: "retract", reason: "A calibration error." });
    expect(await countPublicData()).toMatchObject({ datasets: before.datasets, points: before.points });
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
