// GET /api/v1/versions/:id — one version (published: anyone; otherwise co-editors and curators)
// PUT /api/v1/versions/:id — replace a draft's deposit document (owner or editor; If-Match: lock version)
import { NextResponse } from "next/server";
import { withApi } from "@/lib/auth/api";
import { can } from "@/lib/auth/permissions";
import { getVisibleVersionOrThrow, updateDraft } from "@/lib/datasets/deposits";
import { versionToJson } from "@/lib/datasets/version-json";
import { MAX_DOCUMENT_BYTES } from "@/lib/deposits";
import { AppError } from "@/lib/errors";

function versionIdOrThrow(raw: string): number {
  const id = Number(raw);
  if (!Number.isInteger(id) || id <= 0) throw new AppError("not_found", "No such dataset version");
  return id;
}

export const GET = withApi<{ id: string }>(
  async ({ user, params }) => {
    const { version, datasetRole } = await getVisibleVersionOrThrow({ versionId: versionIdOrThrow(params.id), viewer: user });
    const insider = datasetRole !== null || (user !== null && can(user.role, "dataset.review"));
    return NextResponse.json({ data: await versionToJson(version, { withDecisions: insider }) }, { headers: { etag: `"${version.lockVersion}"` } });
  },
  { identify: true, scope: "read" },
);

export const PUT = withApi<{ id: string }>(
  async ({ req, user, params }) => {
    const versionId = versionIdOrThrow(params.id);
    const ifMatch = req.headers.get("if-match")?.replace(/"/g, "");
    const expected = Number(ifMatch);
    if (!ifMatch || !Number.isInteger(expected)) {
      throw new AppError("validation_failed", "Send the lock version you edited as an If-Match header (the ETag of GET)", [{ pointer: "", message: "If-Match header missing" }]);
    }
    if (Number(req.headers.get("content-length") ?? 0) > MAX_DOCUMENT_BYTES) throw new AppError("payload_too_large", "The document is larger than 25 MB");
    // Parsed and validated on an analysis worker thread, not here.
    const saved = await updateDraft({ actor: user!, versionId, expectedLockVersion: expected, text: await req.text() });
    return NextResponse.json({ data: { versionId: saved.id, lockVersion: saved.lockVersion, state: saved.state } }, { headers: { etag: `"${saved.lockVersion}"` } });
  },
  { permission: "dataset.deposit", scope: "deposit" },
);
