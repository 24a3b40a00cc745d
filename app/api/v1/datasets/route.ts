// POST /api/v1/datasets — deposit a new dataset (a draft) from a deposit document
import { NextResponse } from "next/server";
import { withApi } from "@/lib/auth/api";
import { depositNewDataset } from "@/lib/datasets/deposits";
import { MAX_DOCUMENT_BYTES } from "@/lib/deposits";
import { AppError } from "@/lib/errors";

export const POST = withApi(
  async ({ req, user }) => {
    const declared = Number(req.headers.get("content-length") ?? 0);
    if (declared > MAX_DOCUMENT_BYTES) throw new AppError("payload_too_large", `The document is larger than ${Math.round(MAX_DOCUMENT_BYTES / 1024 / 1024)} MB`);
    // Parsed and validated on an analysis worker thread, not here.
    const version = await depositNewDataset({ actor: user!, text: await req.text() });
    return NextResponse.json({ data: { versionId: version.id, datasetId: version.datasetId, number: version.number, state: version.state, lockVersion: version.lockVersion } }, { status: 201, headers: { location: `/api/v1/versions/${version.id}` } });
  },
  { permission: "dataset.deposit", scope: "deposit" },
);
