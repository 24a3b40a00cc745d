import { beforeAll, describe, expect, it } from "vitest";
import { ENGINE_VERSION } from "@/lib/datasets/prepare";
import { DEFAULT_CONSENSUS_CHOICE } from "@/lib/reactions/consensus-selection";
import { loadReactionConsensus } from "@/lib/reactions/consensus-view";
import {
  deleteConsensusExclusion,
  listConsensusExclusions,
  listPublicVersionsOfReaction,
  readKeptConsensus,
  saveConsensusExclusion,
} from "@/lib/reactions/queries";
import { createUser, type UserDto } from "@/lib/users/queries";
import { consensusDocument, publish } from "./consensus-fixtures";
import { sql, uniqueEmail } from "./helpers";

// Br + tridecane: a reaction of this file alone (consensus-fixtures.ts; invented numbers).
const CARBONS = 13;

let owner: UserDto, curator: UserDto;
let reactionId: number;
const versionIds: number[] = [];

const plain = { versions: listPublicVersionsOfReaction, exclusions: listConsensusExclusions };
const withKept = { ...plain, kept: readKeptConsensus };
const load = (read: typeof plain | typeof withKept, choice = DEFAULT_CONSENSUS_CHOICE) =>
  loadReactionConsensus({ reactionId, choice, read });
const keptRow = async () =>
  (
    await sql<{ kept: { engine: string; input: string; result: { T0: number } | null } | null }[]>`
      select consensus_result as kept from search_reaction_summaries where reaction_id = ${reactionId}`
  )[0]?.kept;

/** What the page shows is the same with the kept consensus as with the engine run afresh. */
async function expectSameAsEngine() {
  const fresh = await load(plain);
  const kept = await load(withKept);
  expect(kept).toEqual(fresh);
}

beforeAll(async () => {
  owner = await createUser({ email: uniqueEmail("kept-owner"), name: "Kept Owner", passwordHash: "x", verified: true });
  curator = await createUser({ email: uniqueEmail("kept-cur"), name: "Kept Curator", passwordHash: "x", role: "curator", verified: true });
  for (const [i, factor] of [1, 1.15].entries()) {
    const v = await publish(consensusDocument({ carbons: CARBONS, title: `Br + tridecane ${i + 1}`, category: "experiment", factor }), {
      owner,
      curator,
    });
    reactionId = v.reactionId;
    versionIds.push(v.versionId);
  }
});

describe("the consensus kept with a reaction's summary", () => {
  it("is written in the publishing transaction and gives the page what the engine gives", async () => {
    const row = await keptRow();
    expect(row?.engine).toBe(ENGINE_VERSION);
    expect(row?.result).not.toBeNull();
    await expectSameAsEngine();
  });

  it("is what the page reads (a kept answer for the same input is taken as it is)", async () => {
    await sql`update search_reaction_summaries set consensus_result = jsonb_set(consensus_result, '{result,T0}', '123.5')
      where reaction_id = ${reactionId}`;
    expect((await load(withKept)).result?.T0).toBe(123.5);
    expect((await load(plain)).result?.T0).not.toBe(123.5);
    // …and never for another input: a reader's own window runs the engine.
    expect((await load(withKept, { ...DEFAULT_CONSENSUS_CHOICE, Tmin: 260, Tmax: 390 })).result?.T0).not.toBe(123.5);
  });

  it("follows a newly published version, a curator's exclusion and its reversal", async () => {
    const third = await publish(
      consensusDocument({ carbons: CARBONS, title: "Br + tridecane 3", category: "experiment", factor: 0.9, Ts: [260, 300, 340, 380] }),
      { owner, curator },
    );
    expect((await keptRow())?.result?.T0).not.toBe(123.5);
    await expectSameAsEngine();
    const before = (await keptRow())?.input;
    const excluded = await saveConsensusExclusion({ versionId: third.versionId, actorId: curator.id, reason: "Calibration in doubt." });
    expect((await keptRow())?.input).not.toBe(before);
    await expectSameAsEngine();
    // The pages it shows on are owed their invalidation from the exclusion's own transaction (made by the caller, else by the sweep).
    expect(excluded.invalidation?.tags).toContain(`reaction:${reactionId}`);
    const [owed] = await sql<{ tags: string[] }[]>`select tags from owed_invalidations where id = ${excluded.invalidation!.owed}`;
    expect(owed.tags).toEqual(excluded.invalidation!.tags);
    const included = await deleteConsensusExclusion({ versionId: third.versionId, actorId: curator.id });
    expect(included.invalidation?.tags).toContain(`reaction:${reactionId}`);
    expect((await keptRow())?.input).toBe(before);
    await expectSameAsEngine();
  });

  it("is not used when its input no longer matches (a row written by other code), and the engine's answer stands", async () => {
    await sql`update search_reaction_summaries set consensus_result = jsonb_set(consensus_result, '{input}', '"0"')
      || jsonb_build_object('result', jsonb_set(consensus_result -> 'result', '{T0}', '123.5'))
      where reaction_id = ${reactionId}`;
    expect((await load(withKept)).result?.T0).not.toBe(123.5);
    await expectSameAsEngine();
  });
});
