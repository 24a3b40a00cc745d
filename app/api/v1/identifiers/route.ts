// GET /api/v1/identifiers?identifier=10.5072/ARH-4F7K-9QXM/2 — what an identifier resolves to (a mistyped code is told apart before any lookup)
import { resolvedIdentifierPath } from "@/lib/identifiers/paths";
import { NextResponse } from "next/server";
import { withApi } from "@/lib/auth/api";
import { appUrl } from "@/lib/config";
import { AppError } from "@/lib/errors";
import { resolveIdentifier } from "@/lib/identifiers/queries";
import { parseIdentifier } from "@/lib/identifiers/series-code";

export const GET = withApi(
  async ({ req }) => {
    const given = new URL(req.url).searchParams.getAll("identifier");
    if (given.length > 1) {
      throw new AppError("bad_request", "Give the identifier once", [
        { pointer: "/identifier", parameter: "identifier", message: `Give identifier once (it appears ${given.length} times)` },
      ]);
    }
    const raw = given[0];
    if (!raw) {
      throw new AppError("bad_request", "Give the identifier to resolve", [
        { pointer: "/identifier", parameter: "identifier", message: "Required, e.g. 10.5072/ARH-4F7K-9QXM" },
      ]);
    }
    const parsed = parseIdentifier(raw);
    if (!parsed.ok) {
      throw new AppError(
        "validation_failed",
        parsed.reason === "mistyped" ? "Mistyped identifier" : "Not an identifier of this repository",
        [{ pointer: "/identifier", parameter: "identifier", message: parsed.message, value: raw }],
      );
    }
    const found = await resolveIdentifier({ identifier: parsed.identifier });
    if (!found) throw new AppError("not_found", `No published dataset or collection has the identifier ${parsed.identifier}`);
    const path = resolvedIdentifierPath(found);
    return NextResponse.json({
      data: {
        identifier: found.identifier,
        kind: found.kind,
        ...(found.kind === "version" ? { versionNumber: found.versionNumber, state: found.state } : {}),
        ...(found.kind === "collection_version" ? { versionNumber: found.versionNumber } : {}),
        url: `${appUrl()}${path}`,
      },
    });
  },
  { scope: null },
);
