import "server-only";
import { listConsensusExclusions, listPublicVersionsOfReaction } from "./queries";
import { runSelectedConsensus, selectConsensusDatasets, withEngineLeftOut, type ConsensusChoice } from "./consensus-selection";

/**
 * A reaction's public versions, the datasets the reader's choice lets into its consensus (and why
 * the others stay out), and the engine's result: what the reaction page and the API both show.
 */
export async function loadReactionConsensus({ reactionId, choice }: { reactionId: number; choice: ConsensusChoice }) {
  const [versions, exclusions] = await Promise.all([listPublicVersionsOfReaction({ reactionId }), listConsensusExclusions({ reactionId })]);
  const selected = selectConsensusDatasets({ versions, exclusions, choice });
  const run = runSelectedConsensus(selected);
  return { versions, selection: withEngineLeftOut(selected, run.result), ...run };
}
