/**
 * The verdicts of a mechanism's matched reactions, on an analysis worker thread: for each, the
 * datasets the reaction page would use (lib/reactions/consensus-selection.ts, the reader's default
 * choice and the curators' exclusions), the consensus engine's result over them — or, with one
 * dataset, the same engine's summary of that dataset — and the verdict (./verdicts.ts).
 */
import { AnalysisError, consensus, type ConsensusResult } from "@/lib/kinetics";
import {
  DEFAULT_CONSENSUS_CHOICE,
  runSelectedConsensus,
  selectConsensusDatasets,
  type CandidateVersion,
  type CuratorExclusion,
} from "@/lib/reactions/consensus-selection";
import type { MechanismRate } from "./types";
import { judgeMechanismRate, type ReactionVerdict } from "./verdicts";

export interface JudgeInput {
  /** The mechanism reaction's index. */
  index: number;
  rate: MechanismRate;
  order: number;
  versions: (CandidateVersion & { tMin: number | null; tMax: number | null })[];
  exclusions: CuratorExclusion[];
}

export interface JudgeOutput extends ReactionVerdict {
  index: number;
  /** Datasets published for the reaction (its newest public versions, retracted ones not counted). */
  datasets: number;
}

export function judgeReactions({ window, reactions }: { window: { Tmin: number; Tmax: number }; reactions: JudgeInput[] }): JudgeOutput[] {
  return reactions.map((r) => ({
    index: r.index,
    datasets: r.versions.filter((v) => v.state === "published").length,
    ...judgeOne(r, window),
  }));
}

function judgeOne(r: JudgeInput, window: { Tmin: number; Tmax: number }): ReactionVerdict {
  const selection = selectConsensusDatasets({ versions: r.versions, exclusions: r.exclusions, choice: DEFAULT_CONSENSUS_CHOICE });
  const ranges = r.versions
    .filter((v) => v.state === "published" && v.tMin !== null && v.tMax !== null)
    .map((v) => ({ Tmin: v.tMin as number, Tmax: v.tMax as number }));
  if (selection.order !== null && selection.order !== r.order) {
    return {
      verdict: "no_data",
      extrapolated: [],
      comparison: null,
      note: `The published data are of reaction order ${selection.order}, the mechanism's rate of order ${r.order}; they are not compared.`,
    };
  }
  const usable = selection.inputs.filter((d) => !d.excludedReason);
  let result: ConsensusResult | null = null;
  let basis: "consensus" | "single_dataset" = "consensus";
  if (usable.length >= 2) result = runSelectedConsensus(selection).result;
  else if (usable.length === 1) {
    basis = "single_dataset";
    try {
      result = consensus(usable);
    } catch (err) {
      if (!(err instanceof AnalysisError)) throw err;
    }
  }
  const verdict = judgeMechanismRate({ rate: r.rate, window, result, basis, ranges });
  if (!result && r.versions.length > 0 && verdict.verdict === "no_data") {
    verdict.note =
      "Data are published for this reaction, but none can enter a comparison (evaluated, retracted, excluded or too few temperatures).";
  }
  return verdict;
}
