// GET /api/v1/mechanism-checks/species-search?q= — species a mechanism name may stand for, by name, formula, SMILES, InChI or InChIKey
import { NextResponse } from "next/server";
import { withApi } from "@/lib/auth/api";
import { AppError } from "@/lib/errors";
import { findSpeciesForMapping } from "@/lib/mechanisms/species-search";

/** Longest text searched (an InChI of a large molecule fits). */
const MAX_QUERY = 2000;

export const GET = withApi(
  async ({ req }) => {
    const q = new URL(req.url).searchParams.get("q")?.trim() ?? "";
    if (!q)
      throw new AppError("bad_request", "Give q: a name, formula, SMILES, InChI or InChIKey", [
        { pointer: "", parameter: "q", message: "missing" },
      ]);
    if (q.length > MAX_QUERY)
      throw new AppError("bad_request", `q is longer than ${MAX_QUERY} characters`, [{ pointer: "", parameter: "q", message: "too long" }]);
    return NextResponse.json({ data: await findSpeciesForMapping({ text: q }) }, { headers: { "cache-control": "private, no-store" } });
  },
  { permission: "mechanism.check", scope: "deposit:read" },
);
