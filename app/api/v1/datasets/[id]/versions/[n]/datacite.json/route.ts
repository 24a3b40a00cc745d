// GET /api/v1/datasets/:id/versions/:n/datacite.json — a public version's DataCite metadata (kernel 4), as its identifier registration sends it
import { NextResponse } from "next/server";
import { withApi } from "@/lib/auth/api";
import { dataciteForPathOrThrow } from "@/lib/identifiers/datacite-route";
import { dataciteQuerySchema, parseQueryOrThrow } from "@/lib/exports/requests";

export const GET = withApi<{ id: string; n: string }>(
  async ({ req, params }) => {
    parseQueryOrThrow(dataciteQuerySchema, new URL(req.url).searchParams);
    return NextResponse.json(await dataciteForPathOrThrow(params), { headers: { "content-type": "application/vnd.api+json" } });
  },
  { scope: null },
);
