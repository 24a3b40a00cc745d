// GET /api/v1/species/preview?smiles=…|inchi=… — identity and structure picture of one species (no sign-in; rate limited)
import { NextResponse } from "next/server";
import { withApi } from "@/lib/auth/api";
import { clientAddress } from "@/lib/auth/client-address";
import { consumeOrThrow } from "@/lib/auth/rate-limit";
import { ChemError, describeSpecies, renderSpeciesSvg } from "@/lib/chem";
import { AppError } from "@/lib/errors";

export const GET = withApi(async ({ req }) => {
  await consumeOrThrow("analysisIp", clientAddress(req), "Too many requests from this network");
  const url = new URL(req.url);
  const smiles = url.searchParams.get("smiles")?.trim() || undefined;
  const inchi = url.searchParams.get("inchi")?.trim() || undefined;
  if (!smiles && !inchi) throw new AppError("validation_failed", "Give a SMILES or an InChI", [{ pointer: "/smiles", message: "missing" }]);
  try {
    const identity = await describeSpecies({ smiles, inchi });
    const svg = identity.canonicalSmiles ? await renderSpeciesSvg(identity.canonicalSmiles, { width: 160, height: 120 }) : null;
    return NextResponse.json({ data: { ...identity, svg } }, { headers: { "cache-control": "public, max-age=86400" } });
  } catch (err) {
    if (err instanceof ChemError)
      throw new AppError("validation_failed", err.message, [
        { pointer: `/${err.field ?? (smiles ? "smiles" : "inchi")}`, message: err.message },
      ]);
    throw err;
  }
});
