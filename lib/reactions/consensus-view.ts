import "server-only";
import type { Transaction } from "@/db/client";
import { ENGINE_VERSION } from "@/lib/datasets/prepare";
import { listConsensusExclusions, listPublicVersionsOfReaction, readKeptConsensus } from "./queries";
import { runSelectedConsensus, selectConsensusDatasets, withEngineLeftOut, type ConsensusChoice } from "./consensus-selection";
import { readStoredConsensus } from "./stored-consensus";

/**
 * Where the consensus reads its data: the queries, or their cached form (lib/reactions/cached.ts) on
 * pages; `kept`, when given, reads the consensus kept with the reaction's summary, used when it was
 * computed from exactly this input (lib/reactions/stored-consensus.ts).
 */
export interface ConsensusReaders {
  versions: typeof listPublicVersionsOfReaction;
  exclusions: typeof listConsensusExclusions;
  kept?: typeof readKeptConsensus;
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
  // In a transaction one statement at a time; otherwise all at once.
  const [versions, exclusions, kept] = db
    ? [await listPublicVersionsOfReaction({ reactionId, db }), await listConsensusExclusions({ reactionId, db }), null]
    : await Promise.all([read.versions({ reactionId }), read.exclusions({ reactionId }), read.kept?.({ reactionId }) ?? null]);
  const selected = selectConsensusDatasets({ versions, exclusions, choice });
  const run = readStoredConsensus(kept, selected, ENGINE_VERSION) ?? runSelectedConsensus(selected);
  return { versions, selection: withEngineLeftOut(selected, run.result), ...run };
}
