// GET /api/v1/datasets — published and retracted datasets matching the search parameters, a page at a time (cursor)
// POST /api/v1/datasets — deposit a new dataset (a draft) from a deposit document (Idempotency-Key honoured)
import { withApi } from "@/lib/auth/api";
import { AppError } from "@/lib/errors";
import { PUBLIC_READ_CACHE } from "@/lib/http/conditional";
import { parseSearchParamsOrThrow, searchAnswerBody, searchAnswerResponse } from "@/lib/search";
import { depositNewDataset } from "@/lib/datasets/deposits";
import type { VersionDto } from "@/lib/datasets/queries";
import { MAX_DOCUMENT_BYTES } from "@/lib/deposits";
import { readBodyOrThrow } from "@/lib/http/read-body";
import { withIdempotency } from "@/lib/idempotency";

export const GET = withApi(
  async ({ req }) => {
    const request = parseSearchParamsOrThrow(new URL(req.url).searchParams, { strict: true });
    // Datasets only: the reactions view is /api/v1/search?view=reactions.
    if (request.view !== "datasets")
      throw new AppError("bad_request", "This endpoint lists datasets; for reactions use /api/v1/search?view=reactions", [
        { pointer: "/view", parameter: "view", message: "view must be datasets here", value: request.view },
      ]);
    return searchAnswerResponse(await searchAnswerBody(request));
  },
  { scope: null, cache: PUBLIC_READ_CACHE },
);

export const POST = withApi(
  async ({ req, user }) => {
    const body = await readBodyOrThrow(req, { limit: MAX_DOCUMENT_BYTES, what: "deposit document" });
    return withIdempotency({
      req,
      user: user!,
      fingerprint: body,
      run: async (keep) => {
        const created = (version: VersionDto) => ({
          status: 201,
          body: {
            data: {
              versionId: version.id,
              datasetId: version.datasetId,
              number: version.number,
              state: version.state,
              lockVersion: version.lockVersion,
            },
          },
          headers: { location: `/api/v1/versions/${version.id}` },
        });
        // Decoded, parsed and validated on an analysis worker thread, not here (the bytes move there).
        const version = await depositNewDataset({ actor: user!, bytes: body, beforeCommit: keep(created) });
        return created(version);
      },
    });
  },
  { permission: "dataset.deposit", scope: "deposit:write" },
);
