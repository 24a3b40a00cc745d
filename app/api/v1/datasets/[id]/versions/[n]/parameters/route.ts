// GET /api/v1/datasets/:id/versions/:n/parameters — a public version's re-fits as mechanism parameters (plain table or Cantera YAML) in the chosen units
import { withApi } from "@/lib/auth/api";
import { mechanismResponse, versionFileBase } from "@/lib/exports/parameters-response";
import { parseQueryOrThrow, versionParametersQuerySchema } from "@/lib/exports/requests";
import { publicVersionOfPathOrThrow, versionMechanismSubjectOrThrow } from "@/lib/exports/subjects";

export const GET = withApi<{ id: string; n: string }>(
  async ({ req, params }) => {
    const query = parseQueryOrThrow(versionParametersQuerySchema, new URL(req.url).searchParams);
    const loaded = await publicVersionOfPathOrThrow(params);
    return mechanismResponse(await versionMechanismSubjectOrThrow(loaded), query, versionFileBase(loaded.version));
  },
  { scope: null },
);
