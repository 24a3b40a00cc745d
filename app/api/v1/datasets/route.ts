// POST /api/v1/datasets — deposit a new dataset (a draft) from a deposit document (Idempotency-Key honoured)
import { NextResponse } from "next/server";
import { withApi } from "@/lib/auth/api";
import { depositNewDataset } from "@/lib/datasets/deposits";
import { MAX_DOCUMENT_BYTES, parseDepositJson } from "@/lib/deposits";
import { AppError } from "@/lib/errors";
import { readBodyOrThrow } from "@/lib/http/read-body";
import { withIdempotency } from "@/lib/idempotency";

export const POST = withApi(
  async ({ req, user }) => {
    const body = await readBodyOrThrow(req, { limit: MAX_DOCUMENT_BYTES, what: "deposit document" });
    return withIdempotency({
      req,
      user: user!,
      fingerprint: body,
      run: async () => {
        const parsed = parseDepositJson(new TextDecoder().decode(body));
        if (!parsed.ok) throw new AppError("validation_failed", parsed.errors[0].message, parsed.errors);
        const version = await depositNewDataset({ actor: user!, document: parsed.value });
        return NextResponse.json({ data: { versionId: version.id, datasetId: version.datasetId, number: version.number, state: version.state, lockVersion: version.lockVersion } }, { status: 201, headers: { location: `/api/v1/versions/${version.id}` } });
      },
    });
  },
  { permission: "dataset.deposit", scope: "deposit" },
);
