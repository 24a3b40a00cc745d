// GET /api/v1/reactions/:key/parameters — a public reaction's consensus as mechanism parameters (plain table or Cantera YAML); the key as the reaction page writes it (a numeric id works too)
import { withApi } from "@/lib/auth/api";
import { AppError } from "@/lib/errors";
import { mechanismResponse } from "@/lib/exports/parameters-response";
import { parseQueryOrThrow, reactionParametersQuerySchema } from "@/lib/exports/requests";
import { reactionMechanismSubjectOrThrow } from "@/lib/exports/subjects";
import { parseConsensusChoice } from "@/lib/reactions/consensus-selection";

export const GET = withApi<{ id: string }>(
  async ({ req, params }) => {
    const query = parseQueryOrThrow(reactionParametersQuerySchema, new URL(req.url).searchParams);
    const choice = parseConsensusChoice(
      Object.fromEntries(
        (["include", "Tmin", "Tmax"] as const).flatMap((name) => (query[name] !== undefined ? [[name, query[name]]] : [])),
      ),
      { strict: true },
    );
    if (!choice.ok) {
      const errors = choice.errors.map((e) => ({ pointer: `/${e.parameter}`, parameter: e.parameter, message: e.message }));
      throw new AppError("bad_request", errors.length === 1 ? errors[0].message : "The consensus choice is not valid", errors);
    }
    const subject = await reactionMechanismSubjectOrThrow(params.id, choice.choice);
    return mechanismResponse(subject, query, `reaction-${subject.equation.replace(/\s+/g, "")}`.slice(0, 80));
  },
  { scope: null },
);
