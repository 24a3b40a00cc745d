// GET /api/v1/collections/:id/versions/:n/datacite.json — the DataCite metadata a published collection version is registered with
import { NextResponse } from "next/server";
import { withApi } from "@/lib/auth/api";
import { getCollectionRegistrationSubject } from "@/lib/collections/queries";
import { collectionVersionPathOrThrow, loadCollectionVersionOrThrow } from "@/lib/collections/view";
import { AppError } from "@/lib/errors";
import { buildCollectionRegistrationBody } from "@/lib/identifiers/register";

export const GET = withApi<{ id: string; n: string }>(
  async ({ params }) => {
    const { collectionId, number } = collectionVersionPathOrThrow(params);
    const { version } = await loadCollectionVersionOrThrow({ collectionId, number, viewerId: null });
    const subject = version.versionIdentifier ? await getCollectionRegistrationSubject({ identifier: version.versionIdentifier }) : null;
    if (!subject) throw new AppError("not_found", `Collection ${collectionId} has no published version ${number}`);
    return NextResponse.json(buildCollectionRegistrationBody(subject));
  },
  { scope: null },
);
