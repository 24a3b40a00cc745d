// GET /api/v1/species/:inchikey — a species that takes part in a public reaction: identity, names and its reactions
import { NextResponse } from "next/server";
import { withApi } from "@/lib/auth/api";
import { appUrl } from "@/lib/config";
import { AppError } from "@/lib/errors";
import { PUBLIC_READ_CACHE } from "@/lib/http/conditional";
import { speciesPath } from "@/lib/identifiers/paths";
import { reactionPath } from "@/lib/reactions/paths";
import { findPublicSpecies, listReactionsOfSpecies } from "@/lib/reactions/public-queries";

/** An InChIKey as the standard writes it (upper case; the page redirects a lower-case one, the API does not guess). */
const INCHIKEY = /^[A-Z]{14}-[A-Z]{10}-[A-Z]$/;

export const GET = withApi<{ inchikey: string }>(
  async ({ params }) => {
    const inchiKey = params.inchikey;
    const species = INCHIKEY.test(inchiKey) ? await findPublicSpecies({ inchiKey }) : null;
    if (!species) throw new AppError("not_found", "No species with this InChIKey takes part in a published reaction");
    const reactions = await listReactionsOfSpecies({ inchiKey });
    return NextResponse.json({
      data: {
        ...species,
        landingPage: `${appUrl()}${speciesPath(inchiKey)}`,
        reactions: reactions.map((r) => ({
          ...r,
          href: `/api/v1/reactions/${encodeURIComponent(r.key.replace(">>", "~"))}`,
          landingPage: `${appUrl()}${reactionPath(r.key)}`,
        })),
      },
    });
  },
  { scope: null, cache: PUBLIC_READ_CACHE },
);
