// GET /api/v1/datasets/:id/versions/:n/export.json — a public version's deposit document with its re-fits, flags and engine version
import { NextResponse } from "next/server";
import { withApi } from "@/lib/auth/api";
import { versionFileBase } from "@/lib/exports/parameters-response";
import { parseQueryOrThrow, versionExportQuerySchema } from "@/lib/exports/requests";
import { publicVersionOfPathOrThrow } from "@/lib/exports/subjects";
import { buildVersionExport } from "@/lib/exports/version-export";

export const GET = withApi<{ id: string; n: string }>(
  async ({ req, params }) => {
    parseQueryOrThrow(versionExportQuerySchema, new URL(req.url).searchParams);
    const loaded = await publicVersionOfPathOrThrow(params);
    return NextResponse.json(await buildVersionExport(loaded), {
      headers: {
        "content-disposition": `attachment; filename="${versionFileBase(loaded.version).replace(/[^A-Za-z0-9.-]+/g, "-")}-export.json"`,
        "x-content-type-options": "nosniff",
      },
    });
  },
  { scope: null },
);
