import "server-only";
// "Use these": the dataset versions behind a mechanism check's matched reactions — for each, the
// versions its consensus uses (the reaction page's default choice, the curators' exclusions) — for
// the owner to review before they join a collection.
import { findReactionIdsByKeys } from "@/lib/mechanisms/queries";
import type { MechanismReport } from "@/lib/mechanisms/run-check";
import { DEFAULT_CONSENSUS_CHOICE, selectConsensusDatasets } from "@/lib/reactions/consensus-selection";
import { listConsensusExclusions, listPublicVersionsOfReaction } from "@/lib/reactions/queries";

/** One suggested version: the mechanism's reaction it stands behind, and which version it is. */
export interface SuggestedVersion {
  versionId: number;
  datasetId: number;
  number: number;
  title: string;
  versionIdentifier: string | null;
  /** The mechanism's equation and line of the reaction it backs. */
  mechanismEquation: string;
  line: number;
}

/** The versions the consensus of each matched reaction uses, in the report's order, each version once. */
export async function suggestVersionsFromReport(report: Pick<MechanismReport, "reactions">): Promise<SuggestedVersion[]> {
  const matched = report.reactions.filter((r) => r.reaction !== null);
  const ids = await findReactionIdsByKeys({ keys: [...new Set(matched.map((r) => r.reaction!.key))] });
  const out: SuggestedVersion[] = [];
  const seen = new Set<number>();
  const byReaction = new Map<number, Awaited<ReturnType<typeof listPublicVersionsOfReaction>>>();
  for (const r of matched) {
    const reactionId = ids.get(r.reaction!.key);
    if (reactionId === undefined) continue;
    let versions = byReaction.get(reactionId);
    if (!versions) {
      versions = await listPublicVersionsOfReaction({ reactionId });
      byReaction.set(reactionId, versions);
    }
    const exclusions = await listConsensusExclusions({ reactionId });
    const selection = selectConsensusDatasets({ versions, exclusions, choice: DEFAULT_CONSENSUS_CHOICE });
    const used = new Set(selection.inputs.filter((d) => !d.excludedReason).map((d) => Number(d.id)));
    for (const v of versions) {
      if (!used.has(v.versionId) || v.state !== "published" || seen.has(v.versionId)) continue;
      seen.add(v.versionId);
      out.push({
        versionId: v.versionId,
        datasetId: v.datasetId,
        number: v.number,
        title: v.title,
        versionIdentifier: v.versionIdentifier,
        mechanismEquation: r.equation,
        line: r.line,
      });
    }
  }
  return out;
}
