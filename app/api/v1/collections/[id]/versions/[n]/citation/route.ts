// GET /api/v1/collections/:id/versions/:n/citation — the collection version's citation (BibTeX, RIS, CSL-JSON, text), with members=1 every member's too
import { withApi } from "@/lib/auth/api";
import { collectionCitationQuerySchema } from "@/lib/collections/schemas";
import { collectionCitationResponse, collectionVersionPathOrThrow, loadCollectionVersionOrThrow } from "@/lib/collections/view";
import { parseQueryOrThrow } from "@/lib/exports/requests";

export const GET = withApi<{ id: string; n: string }>(
  async ({ req, params }) => {
    const { collectionId, number } = collectionVersionPathOrThrow(params);
    const query = parseQueryOrThrow(collectionCitationQuerySchema, new URL(req.url).searchParams);
    // Published versions only: a draft has nothing to cite.
    const view = await loadCollectionVersionOrThrow({ collectionId, number, viewerId: null });
    return collectionCitationResponse(view, query);
  },
  { scope: null },
);
