// GET /api/v1/datasets/:id/versions/:n/datacite.xml — a public version's DataCite metadata as kernel-4 XML
import { withApi } from "@/lib/auth/api";
import { buildDataciteXml } from "@/lib/identifiers/datacite";
import { dataciteForPathOrThrow } from "@/lib/identifiers/datacite-route";
import { dataciteQuerySchema, parseQueryOrThrow } from "@/lib/exports/requests";

export const GET = withApi<{ id: string; n: string }>(
  async ({ req, params }) => {
    parseQueryOrThrow(dataciteQuerySchema, new URL(req.url).searchParams);
    const body = await dataciteForPathOrThrow(params);
    return new Response(buildDataciteXml(body.data.attributes), {
      headers: { "content-type": "application/xml; charset=utf-8", "x-content-type-options": "nosniff" },
    });
  },
  { scope: null },
);
