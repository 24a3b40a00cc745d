// POST /api/v1/datasets — deposit a new dataset (a draft) from a deposit document (Idempotency-Key honoured)
import { withApi } from "@/lib/auth/api";
import { depositNewDataset } from "@/lib/datasets/deposits";
import type { VersionDto } from "@/lib/datasets/queries";
import { MAX_DOCUMENT_BYTES } from "@/lib/deposits";
import { readBodyOrThrow } from "@/lib/http/read-body";
import { withIdempotency } from "@/lib/idempotency";

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
  { permission: "dataset.deposit", scope: "deposit" },
);
