import "server-only";
import type { Transaction } from "@/db/client";
import { listConsensusExclusions, listPublicVersionsOfReaction } from "./queries";
import { runSelectedConsensus, selectConsensusDatasets, withEngineLeftOut, type ConsensusChoice } from "./consensus-selection";

/** Where the consensus reads its data: the queries, or their cached form (lib/reactions/cached.ts) on pages. */
export interface ConsensusReaders {
  versions: typeof listPublicVersionsOfReaction;
  exclusions: typeof listConsensusExclusions;
}

/**
 * A reaction's public versions, the datasets the reader's choice lets into its consensus (and why
 * the others stay out), and the engine's result: what the reaction page and the API both show.
 */
export async function loadReactionConsensus({
  reactionId,
  choice,
  db,
  read = { versions: listPublicVersionsOfReaction, exclusions: listConsensusExclusions },
}: {
  reactionId: number;
  choice: ConsensusChoice;
  /** A transaction to read in (the search summary is written in the publishing one); the readers otherwise. */
  db?: Transaction;
  read?: ConsensusReaders;
}) {
  // In a transaction one statement at a time; otherwise both at once.
  const [versions, exclusions] = db
    ? [await listPublicVersionsOfReaction({ reactionId, db }), await listConsensusExclusions({ reactionId, db })]
    : await Promise.all([read.versions({ reactionId }), read.exclusions({ reactionId })]);
  const selected = selectConsensusDatasets({ versions, exclusions, choice });
  const run = runSelectedConsensus(selected);
  return { versions, selection: withEngineLeftOut(selected, run.result), ...run };
}
