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
  /** Its DUPLICATE entries (same reaction): judged as the sum of all the terms. */
  duplicates?: { line: number; rate: MechanismRate }[];
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
  // Measured where the comparison has data: the datasets that entered it. A dataset left out (evaluated, excluded by
  // a curator, set aside as off the consensus, of another order) measures nothing the verdict could rest on.
  const compared = result
    ? result.members
        .filter((m) => m.included && m.Tmin !== null && m.Tmax !== null)
        .map((m) => ({ Tmin: m.Tmin as number, Tmax: m.Tmax as number }))
    : ranges;
  const duplicates = r.duplicates ?? [];
  const verdict = judgeMechanismRate({ rate: r.rate, alsoRates: duplicates.map((d) => d.rate), window, result, basis, ranges: compared });
  if (duplicates.length > 0) {
    const lines = duplicates.map((d) => d.line);
    verdict.note = `Judged with its duplicate ${lines.length === 1 ? "entry" : "entries"} (line ${lines.join(", ")}) as their sum, as the mechanism uses them. ${verdict.note}`;
  }
  if (!result && r.versions.length > 0 && verdict.verdict === "no_data") {
    verdict.note =
      "Data are published for this reaction, but none can enter a comparison (evaluated, retracted, excluded or too few temperatures).";
  }
  return verdict;
}
