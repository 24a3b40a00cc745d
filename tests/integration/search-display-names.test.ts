import { beforeAll, describe, expect, it } from "vitest";
import { applyTransition } from "@/lib/curation/transitions";
import { depositNewDataset } from "@/lib/datasets/deposits";
import { EXAMPLE_DEPOSIT } from "@/lib/deposits";
import type { DepositDocument } from "@/lib/deposits/types";
import { findPublicSpecies, listReactionsOfSpecies } from "@/lib/reactions/public-queries";
import { getReaction } from "@/lib/reactions/queries";
import { search } from "@/lib/search";
import { parseSearchParamsOrThrow } from "@/lib/search/params";
import { nameSpecies, suggestSearch } from "@/lib/search/queries";
import { resolveQuery } from "@/lib/search/resolve-query";
import type { DatasetHit } from "@/lib/search/types";
import { createUser, type UserDto } from "@/lib/users/queries";
import { sql, uniqueEmail } from "./helpers";

// One name per species on every public page, suggestion counts that are the species' and the
// reaction's own, and a species known only from drafts named exactly like one nobody deposited.
// Species of this file only (tetradecane, perfluorohexane), invented numbers.

const TETRADECANE = "CCCCCCCCCCCCCC";
const TETRADECYL = "[CH2]CCCCCCCCCCCCC";
const PERFLUOROHEXANE = "FC(F)(F)C(F)(F)C(F)(F)C(F)(F)C(F)(F)C(F)(F)F";
const PERFLUOROPENTANE = "FC(F)(F)C(F)(F)C(F)(F)C(F)(F)C(F)(F)F";

function documentWith(title: string, reactants: [string, string][], products: [string, string][]): DepositDocument {
  const { reportedFit: _unused, ...base } = EXAMPLE_DEPOSIT;
  void _unused;
  return {
    ...base,
    title,
    reaction: {
      reactants: reactants.map(([name, smiles]) => ({ name, smiles, coefficient: 1 })),
      products: products.map(([name, smiles]) => ({ name, smiles, coefficient: 1 })),
      ...(products.length ? {} : { productsUnknown: { reason: "Loss of the reactant followed; products not identified." } }),
      class: "hydrogen-abstraction",
      order: 2,
      phase: "gas",
    },
  };
}

describe("species names, counts and visibility on public pages and in search", () => {
  let owner: UserDto;
  let curator: UserDto;
  let keyOf: (smiles: string) => Promise<string>;

  beforeAll(async () => {
    owner = await createUser({ email: uniqueEmail("names-owner"), name: "Names Owner", passwordHash: "x", verified: true });
    curator = await createUser({
      email: uniqueEmail("names-curator"),
      name: "Names Curator",
      passwordHash: "x",
      role: "curator",
      verified: true,
    });
    const publish = async (title: string, alkaneName: string) => {
      const v = await depositNewDataset({
        actor: owner,
        document: documentWith(
          title,
          [
            ["hydroxyl", "[OH]"],
            [alkaneName, TETRADECANE],
          ],
          [
            ["water", "O"],
            ["tetradecyl", TETRADECYL],
          ],
        ),
      });
      await applyTransition({ versionId: v.id, actorId: owner.id, transition: "submit" });
      await applyTransition({ versionId: v.id, actorId: curator.id, transition: "accept", reason: "Consistent." });
      return v;
    };
    // "tetradecane" twice, "n-tetradecane" once: the most used name is the display name.
    await publish("Display names one", "n-tetradecane");
    await publish("Display names two", "tetradecane");
    await publish("Display names three", "tetradecane");
    // A draft: its species exists only there.
    await depositNewDataset({
      actor: owner,
      document: documentWith(
        "Draft-only species",
        [
          ["hydroxyl", "[OH]"],
          ["perfluorohexane draft", PERFLUOROHEXANE],
        ],
        [],
      ),
    });
    keyOf = async (smiles) => {
      const { parsed } = await resolveQuery(smiles);
      if (parsed.kind !== "species") throw new Error(`${smiles} did not read as a species`);
      return parsed.inchiKeys[0];
    };
  });

  it("one display name everywhere: the most used among public versions, the others as synonyms", async () => {
    const key = await keyOf(TETRADECANE);
    const found = (await findPublicSpecies({ inchiKey: key }))!;
    expect(found.name).toBe("tetradecane");
    expect(found.names[0]).toBe("tetradecane");
    expect(found.names).toContain("n-tetradecane");
    const [reactionRow] = await listReactionsOfSpecies({ inchiKey: key });
    // Never "n-tetradecane" (the first deposit's word): the display name of each participant.
    expect(reactionRow.equation).toMatch(/^\S.* \+ tetradecane → \S.* \+ tetradecyl$/);
    expect(reactionRow.datasets).toBe(3);
    const reaction = (await getReaction({ id: reactionRow.id }))!;
    expect(reaction.equation).toBe(reactionRow.equation);
    expect(reaction.participants.find((p) => p.inchiKey === key)?.name).toBe("tetradecane");
    // Search rows write the equation the same way, whatever the first deposit called it.
    const answer = await search(parseSearchParamsOrThrow({ q: "tetradecane", limit: "50" }, { strict: true }));
    const rows = (answer.hits as DatasetHit[]).filter((h) => h.title.startsWith("Display names"));
    expect(rows).toHaveLength(3);
    for (const h of rows) expect(h.equation).toBe(reactionRow.equation);
    expect(answer.parsed.words).toContain("(tetradecane)");
  });

  it("suggestions carry the species' and the reaction's own counts, whatever was typed", async () => {
    const short = await suggestSearch({ q: "tetradec" });
    const long = await suggestSearch({ q: "n-tetradecane" });
    const species = (s: typeof short) => s.species.find((x) => x.formula === "C14H30");
    expect(species(short)).toMatchObject({ name: "tetradecane", datasetCount: 3 });
    expect(species(long)).toMatchObject({ name: "tetradecane", datasetCount: 3 });
    const reaction = (s: typeof short) => s.reactions.find((r) => r.equation.includes("tetradecane"));
    expect(reaction(short)?.datasetCount).toBe(3);
    expect(reaction(long)?.datasetCount).toBe(3);
    expect(reaction(short)?.equation).toBe(reaction(long)?.equation);
  });

  it("a species known only from a draft is named exactly like one nobody deposited", async () => {
    const draftKey = await keyOf(PERFLUOROHEXANE);
    const [{ n }] = await sql<{ n: number }[]>`select count(*)::int as n from species where inchi_key = ${draftKey}`;
    expect(n).toBe(1); // it exists, in a draft
    expect(await nameSpecies({ inchiKeys: [draftKey] })).toEqual(new Map());
    const drafted = await resolveQuery(PERFLUOROHEXANE);
    const unknown = await resolveQuery(PERFLUOROPENTANE);
    const unknownKey = await keyOf(PERFLUOROPENTANE);
    expect(drafted.words).not.toMatch(/C6F14|perfluorohexane/i);
    expect(drafted.words.replace(PERFLUOROHEXANE, "<q>").replace(draftKey, "<key>")).toBe(
      unknown.words.replace(PERFLUOROPENTANE, "<q>").replace(unknownKey, "<key>"),
    );
    expect(await suggestSearch({ q: "perfluorohexane" })).toEqual({ species: [], reactions: [] });
    expect(await findPublicSpecies({ inchiKey: draftKey })).toBeNull();
  });
});
