import "server-only";
import type { Transaction } from "@/db/client";
import { listConsensusExclusions, listPublicVersionsOfReaction } from "./queries";
import { runSelectedConsensus, selectConsensusDatasets, withEngineLeftOut, type ConsensusChoice } from "./consensus-selection";

/**
 * A reaction's public versions, the datasets the reader's choice lets into its consensus (and why
 * the others stay out), and the engine's result: what the reaction page and the API both show.
 */
export async function loadReactionConsensus({
  reactionId,
  choice,
  db,
}: {
  reactionId: number;
  choice: ConsensusChoice;
  /** A transaction to read in (the search summary is written in the publishing one); the pool otherwise. */
  db?: Transaction;
}) {
  // In a transaction one statement at a time; on the pool both at once.
  const [versions, exclusions] = db
    ? [await listPublicVersionsOfReaction({ reactionId, db }), await listConsensusExclusions({ reactionId, db })]
    : await Promise.all([listPublicVersionsOfReaction({ reactionId }), listConsensusExclusions({ reactionId })]);
  const selected = selectConsensusDatasets({ versions, exclusions, choice });
  const run = runSelectedConsensus(selected);
  return { versions, selection: withEngineLeftOut(selected, run.result), ...run };
}
