import "server-only";
import { appUrl } from "@/lib/config";
import { FIT_CAUTION } from "@/lib/datasets/version-json";
import { AppError } from "@/lib/errors";
import { versionPath } from "@/lib/identifiers/paths";
import { getCanonicalRateConstantUnit } from "@/lib/kinetics";
import { parseConsensusChoice, selectionToJson, type ParameterError } from "./consensus-selection";
import { loadReactionConsensus } from "./consensus-view";
import { reactionPath } from "./paths";
import { findPublicReaction } from "./public-queries";

/**
 * The REST API's reads of a reaction: the consensus under the reader's choice of data (the
 * reaction page's query parameters), and the reaction with its datasets. Only reactions with a
 * published or retracted dataset exist here, as on the pages (findPublicReaction).
 */

const escapePointer = (p: string) => p.replace(/~/g, "~0").replace(/\//g, "~1");

/** 400 naming every parameter at fault (each error carries its name and a pointer to it). */
function badParameters(errors: ParameterError[]): AppError {
  const title =
    errors.length === 1
      ? errors[0].message
      : `${errors.length} query parameters are not valid (${[...new Set(errors.map((e) => e.parameter))].join(", ")})`;
  return new AppError(
    "bad_request",
    title,
    errors.map((e) => ({
      pointer: `/${escapePointer(e.parameter)}`,
      parameter: e.parameter,
      message: e.message,
      ...(e.value !== undefined ? { value: e.value } : {}),
    })),
  );
}

/** The consensus block both endpoints answer with; 404 for a reaction with no public data. */
async function consensusJsonOrThrow(reactionId: number, query: URLSearchParams) {
  const parsed = parseConsensusChoice(query, { strict: true });
  if (!parsed.ok) throw badParameters(parsed.errors);
  const loaded = await loadReactionConsensus({ reactionId, choice: parsed.choice });
  // A reaction only drafts describe is not public yet.
  if (!loaded.versions.length) throw new AppError("not_found", "No such reaction with published data");
  const { selection, result, unavailable, versions } = loaded;
  return {
    versions,
    consensus: {
      units: { T: "K", k: selection.order ? getCanonicalRateConstantUnit(selection.order) : null },
      selection: selectionToJson(selection),
      consensus: result,
      unavailable,
      caution: FIT_CAUTION,
    },
  };
}

/** GET /api/v1/reactions/:id/consensus — the consensus of a reaction known by its numeric id. */
export async function getReactionConsensusJsonOrThrow(reaction: { id: number; equation: string }, query: URLSearchParams) {
  const { consensus } = await consensusJsonOrThrow(reaction.id, query);
  return { reaction: { id: reaction.id, equation: reaction.equation }, ...consensus };
}

/** GET /api/v1/reactions/:key — the reaction, its datasets (newest public version of each) and its consensus. */
export async function getPublicReactionJsonOrThrow(where: { id: number } | { key: string } | null, query: URLSearchParams) {
  const reaction = where ? await findPublicReaction(where) : null;
  if (!reaction) throw new AppError("not_found", "No such reaction with published data");
  const { versions, consensus } = await consensusJsonOrThrow(reaction.id, query);
  return {
    reaction: { ...reaction, landingPage: `${appUrl()}${reactionPath(reaction.key)}` },
    datasets: versions.map((v) => ({
      datasetId: v.datasetId,
      version: v.number,
      title: v.title,
      state: v.state,
      versionIdentifier: v.versionIdentifier,
      tMin: v.tMin,
      tMax: v.tMax,
      points: v.pointCount,
      href: `/api/v1/datasets/${v.datasetId}/versions/${v.number}`,
      landingPage: `${appUrl()}${versionPath(v.datasetId, v.number)}`,
    })),
    ...consensus,
  };
}
