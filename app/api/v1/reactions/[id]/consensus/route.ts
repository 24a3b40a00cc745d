// GET /api/v1/reactions/:id/consensus — one reaction's consensus expression, with which datasets went in and why others did not
import { NextResponse } from "next/server";
import { withApi } from "@/lib/auth/api";
import { FIT_CAUTION } from "@/lib/datasets/version-json";
import { AppError } from "@/lib/errors";
import { parseIdOrThrow } from "@/lib/ids";
import { getCanonicalRateConstantUnit } from "@/lib/kinetics";
import { parseConsensusChoice, selectionToJson, type ParameterError } from "@/lib/reactions/consensus-selection";
import { loadReactionConsensus } from "@/lib/reactions/consensus-view";
import { getReaction } from "@/lib/reactions/queries";

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

export const GET = withApi<{ id: string }>(
  async ({ req, params }) => {
    const reactionId = parseIdOrThrow(params.id, "reaction");
    const parsed = parseConsensusChoice(new URL(req.url).searchParams, { strict: true });
    if (!parsed.ok) throw badParameters(parsed.errors);
    const reaction = await getReaction({ id: reactionId });
    const loaded = reaction ? await loadReactionConsensus({ reactionId, choice: parsed.choice }) : null;
    // A reaction only drafts describe is not public yet.
    if (!reaction || !loaded?.versions.length) throw new AppError("not_found", "No such reaction with published data");
    const { selection, result, unavailable } = loaded;
    return NextResponse.json({
      data: {
        reaction: { id: reaction.id, equation: reaction.equation },
        units: { T: "K", k: selection.order ? getCanonicalRateConstantUnit(selection.order) : null },
        selection: selectionToJson(selection),
        consensus: result,
        unavailable,
        caution: FIT_CAUTION,
      },
    });
  },
  { scope: null },
);
