import "server-only";
import { appUrl } from "@/lib/config";
import { residualModel } from "@/lib/datasets/point-table";
import { getPublicVersionPoints } from "@/lib/datasets/public-version";
import { listPublicVersions } from "@/lib/datasets/queries";
import { FIT_CAUTION } from "@/lib/datasets/version-json";
import { AppError } from "@/lib/errors";
import { parseIdOrThrow } from "@/lib/ids";
import { REFERENCE_TEMPERATURE } from "@/lib/kinetics/constants";
import type { ConsensusChoice } from "@/lib/reactions/consensus-selection";
import { loadReactionConsensus } from "@/lib/reactions/consensus-view";
import { reactionPath, readReactionSegment } from "@/lib/reactions/paths";
import { findPublicReaction } from "@/lib/reactions/public-queries";
import { getReaction } from "@/lib/reactions/queries";
import type { MechanismFit, MechanismSubject } from "./mechanism";

/**
 * What the export endpoints read: a public version behind `/datasets/:id/versions/:n` (published or
 * retracted; any other is not found, whoever asks), and a public reaction's consensus.
 */

/** The dataset id and version number of a path (`2` or `v2`), then the public version's points and header, or a 404. */
export async function publicVersionOfPathOrThrow(params: { id: string; n: string }) {
  const datasetId = parseIdOrThrow(params.id, "dataset");
  const versionNumber = parseIdOrThrow(params.n.replace(/^v/, ""), "version number");
  const entry = (await listPublicVersions({ datasetId })).find((v) => v.number === versionNumber);
  const loaded = entry ? await getPublicVersionPoints({ versionId: entry.id }) : null;
  if (!loaded) throw new AppError("not_found", `Dataset ${datasetId} has no published version ${versionNumber}`);
  return loaded;
}

/**
 * The participants of a reaction as the exports name them: display name, formula, charge and
 * InChIKey, and the name the version's depositor gave (a consensus: the display name), with coefficients.
 */
async function participantsOf(reactionId: number | null, versionId?: number) {
  const reaction = reactionId ? await getReaction({ id: reactionId, versionId }) : null;
  return {
    equation: reaction?.equation ?? "",
    participants: (reaction?.participants ?? []).map((p) => ({
      side: p.side,
      name: p.name,
      coefficient: Number(p.coefficient),
      inchiKey: p.inchiKey,
      formula: p.formula,
      charge: p.charge,
      depositedName: p.versionName ?? p.name,
    })),
  };
}

/** A public version's re-fits (as publicVersionOfPathOrThrow loaded it) as mechanism parameters; a 404 when it has none. */
export async function versionMechanismSubjectOrThrow({
  version,
  doc,
  analysis,
  rows,
  about,
}: Awaited<ReturnType<typeof publicVersionOfPathOrThrow>>): Promise<MechanismSubject> {
  if (!analysis) throw new AppError("not_found", `Version ${version.number} of dataset ${version.datasetId} has no fit to export`);
  const mod = analysis.modifiedArrhenius;
  const fits: MechanismFit[] = [
    {
      model: "arrhenius",
      lnA: analysis.arrhenius.params.lnA,
      n: 0,
      Ea: analysis.arrhenius.params.Ea,
      T0: mod?.params.T0 ?? REFERENCE_TEMPERATURE,
    },
  ];
  if (mod) fits.push({ model: "modified_arrhenius", lnA: mod.params.lnA, n: mod.params.n, Ea: mod.params.Ea, T0: mod.params.T0 });
  const Ts = rows.map((r) => r.T).filter(Number.isFinite);
  return {
    kind: "version",
    title: version.title,
    ...(await participantsOf(version.reactionId, version.id)),
    order: doc.reaction.order,
    identifier: version.versionIdentifier,
    sources: [],
    landingPage: about.landingPage,
    citation: about.citation,
    range: { Tmin: Math.min(...Ts), Tmax: Math.max(...Ts) },
    fits,
    preferred: residualModel(analysis),
    engineVersion: about.residuals?.engineVersion ?? null,
    retraction: about.retraction ? `${about.retraction.at ?? ""} ${about.retraction.notice ?? ""}`.trim() : null,
    caution: FIT_CAUTION,
  };
}

/**
 * A public reaction's consensus (over `choice`, the reaction page's choice of data) as mechanism
 * parameters; a 404 for a path that names no public reaction or a reaction without a consensus.
 */
export async function reactionMechanismSubjectOrThrow(segment: string, choice: ConsensusChoice): Promise<MechanismSubject> {
  let decoded = segment;
  try {
    decoded = decodeURIComponent(segment);
  } catch {
    // kept as written
  }
  const named = readReactionSegment(decoded);
  const found = named ? await findPublicReaction(named) : null;
  if (!found) throw new AppError("not_found", "No such reaction with published data");
  const loaded = await loadReactionConsensus({ reactionId: found.id, choice });
  const result = loaded.result;
  if (!result)
    throw new AppError("not_found", "This reaction has no consensus (it needs two or more published datasets that can be fitted together)");
  const fits: MechanismFit[] = [
    { model: "arrhenius", lnA: result.arrhenius.params.lnA, n: 0, Ea: result.arrhenius.params.Ea, T0: result.T0 },
  ];
  const mod = result.modifiedArrhenius;
  if (mod) fits.push({ model: "modified_arrhenius", lnA: mod.params.lnA, n: mod.params.n, Ea: mod.params.Ea, T0: mod.params.T0 });
  const identifiers = new Map(loaded.versions.map((v) => [String(v.versionId), v.versionIdentifier]));
  return {
    kind: "consensus",
    title: `every published dataset of ${found.equation} that the consensus takes`,
    ...(await participantsOf(found.id)),
    order: result.order,
    identifier: null,
    sources: result.curveFrom.map((id) => identifiers.get(id)).filter((x): x is string => !!x),
    landingPage: `${appUrl()}${reactionPath(found.key)}`,
    citation: null,
    range: result.range,
    fits,
    preferred: result.preferred === "modified_arrhenius" && mod ? "modified_arrhenius" : "arrhenius",
    engineVersion: null,
    retraction: null,
    caution: FIT_CAUTION,
  };
}
