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
  type ConsensusSelection,
  type CuratorExclusion,
} from "@/lib/reactions/consensus-selection";
import type { MechanismRate } from "./types";
import { comparableConsensus, judgeMechanismRate, type ComparableConsensus, type ReactionVerdict } from "./verdicts";

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
  return reactions.map((r) => judgeWithBasis(r, comparisonBasisOf({ versions: r.versions, exclusions: r.exclusions }), window));
}

/**
 * What a verdict needs to know of a reaction's published data, whatever the mechanism's rate: the
 * comparison curve (the consensus over the reaction page's default choice, or with one usable
 * dataset the engine's summary of it), the ranges that entered it, the data's order and how many
 * datasets there are. The same for every mechanism, so it is kept with the reaction's search
 * summary (lib/search/documents.ts) whenever its data change, and a check reads it instead of the
 * points (./run-check.ts).
 */
export interface ComparisonBasis {
  /** The data's reaction order; null when no dataset can enter a consensus. */
  order: number | null;
  /** Public versions (retracted ones included) and of those the published ones. */
  versions: number;
  published: number;
  basis: "consensus" | "single_dataset";
  curve: ComparableConsensus | null;
  /** Measured ranges of the datasets that entered the curve, K. */
  compared: { Tmin: number; Tmax: number }[];
}

/**
 * The basis of a reaction's verdicts. `selection` and `result` when the caller has already run the
 * consensus over the default choice (the search summary's writer); otherwise both are made here.
 */
export function comparisonBasisOf({
  versions,
  exclusions,
  selection = selectConsensusDatasets({ versions, exclusions, choice: DEFAULT_CONSENSUS_CHOICE }),
  result: given,
}: {
  versions: JudgeInput["versions"] | CandidateVersion[];
  exclusions: CuratorExclusion[];
  selection?: ConsensusSelection;
  /** runSelectedConsensus(selection).result, when already run. */
  result?: ConsensusResult | null;
}): ComparisonBasis {
  const counts = { versions: versions.length, published: versions.filter((v) => v.state === "published").length };
  const usable = selection.inputs.filter((d) => !d.excludedReason);
  let result: ConsensusResult | null = null;
  let basis: ComparisonBasis["basis"] = "consensus";
  if (usable.length >= 2) result = given !== undefined ? given : runSelectedConsensus(selection).result;
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
    : [];
  return { order: selection.order, ...counts, basis, curve: result ? comparableConsensus(result) : null, compared };
}

/** One mechanism rate's verdict on a reaction's basis. */
export function judgeWithBasis(
  r: Pick<JudgeInput, "index" | "rate" | "duplicates" | "order">,
  b: ComparisonBasis,
  window: { Tmin: number; Tmax: number },
): JudgeOutput {
  const out = (verdict: ReactionVerdict): JudgeOutput => ({ index: r.index, datasets: b.published, ...verdict });
  if (b.order !== null && b.order !== r.order) {
    return out({
      verdict: "no_data",
      extrapolated: [],
      comparison: null,
      note: `The published data are of reaction order ${b.order}, the mechanism's rate of order ${r.order}; they are not compared.`,
    });
  }
  const duplicates = r.duplicates ?? [];
  const verdict = judgeMechanismRate({
    rate: r.rate,
    alsoRates: duplicates.map((d) => d.rate),
    window,
    result: b.curve,
    basis: b.basis,
    ranges: b.compared,
  });
  if (duplicates.length > 0) {
    const lines = duplicates.map((d) => d.line);
    verdict.note = `Judged with its duplicate ${lines.length === 1 ? "entry" : "entries"} (line ${lines.join(", ")}) as their sum, as the mechanism uses them. ${verdict.note}`;
  }
  if (!b.curve && b.versions > 0 && verdict.verdict === "no_data") {
    verdict.note =
      "Data are published for this reaction, but none can enter a comparison (evaluated, retracted, excluded or too few temperatures).";
  }
  return out(verdict);
}
