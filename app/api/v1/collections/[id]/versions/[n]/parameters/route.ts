// GET /api/v1/collections/:id/versions/:n/parameters — every member's parameters in one file (plain text or Cantera YAML), each reaction with its version identifier
import { withApi } from "@/lib/auth/api";
import { collectionParametersQuerySchema } from "@/lib/collections/schemas";
import { collectionParametersResponse, collectionVersionPathOrThrow, loadCollectionVersionOrThrow } from "@/lib/collections/view";
import { DEFAULT_MECHANISM_ENERGY } from "@/lib/exports/mechanism-units";
import { mechanismUnitsOrThrow, parseQueryOrThrow } from "@/lib/exports/requests";

export const GET = withApi<{ id: string; n: string }>(
  async ({ req, params }) => {
    const { collectionId, number } = collectionVersionPathOrThrow(params);
    const query = parseQueryOrThrow(collectionParametersQuerySchema, new URL(req.url).searchParams);
    // The energy unit is checked as for one version (a 400 naming `energy`); k is in cm–mol units of each reaction's order.
    const { energyUnit } = mechanismUnitsOrThrow(1, { energy: query.energy ?? DEFAULT_MECHANISM_ENERGY });
    const view = await loadCollectionVersionOrThrow({ collectionId, number, viewerId: null });
    return collectionParametersResponse(view, { format: query.format, energy: energyUnit, names: query.names });
  },
  { scope: null },
);
