// POST /api/v1/validate — check a deposit document as a deposit would be checked, and fit it; nothing is stored
import { NextResponse } from "next/server";
import { withApi } from "@/lib/auth/api";
import { prepareDepositBytesOrThrow } from "@/lib/datasets/prepare";
import { MAX_DOCUMENT_BYTES } from "@/lib/deposits";
import { AppError } from "@/lib/errors";
import { readBodyOrThrow } from "@/lib/http/read-body";

export const POST = withApi(
  async ({ req }) => {
    const body = await readBodyOrThrow(req, { limit: MAX_DOCUMENT_BYTES, what: "deposit document" });
    try {
      // The same checks and fit as a deposit, on an analysis worker thread; prepare stores nothing.
      const prepared = await prepareDepositBytesOrThrow(body);
      return NextResponse.json({
        data: { valid: true, title: prepared.title, points: prepared.points.length, errors: [], analysis: prepared.analysis },
      });
    } catch (err) {
      // An invalid document is the answer, not a failure of the request.
      if (!(err instanceof AppError) || err.code !== "validation_failed") throw err;
      return NextResponse.json({ data: { valid: false, summary: err.message, errors: err.errors, analysis: null } });
    }
  },
  { permission: "dataset.deposit", scope: "deposit:read" },
);
