// GET /api/v1/versions/:id — one version (published: anyone; otherwise co-editors and curators)
// PUT /api/v1/versions/:id — replace a draft's deposit document (owner or editor; If-Match: lock version)
import { NextResponse } from "next/server";
import { withApi } from "@/lib/auth/api";
import { getVisibleVersionOrThrow, updateDraft } from "@/lib/datasets/deposits";
import { versionToJson } from "@/lib/datasets/version-json";
import { MAX_DOCUMENT_BYTES } from "@/lib/deposits";
import { AppError } from "@/lib/errors";
import { readTextBodyOrThrow } from "@/lib/http/read-body";
import { parseIdOrThrow } from "@/lib/ids";

const versionIdOrThrow = (raw: string) => parseIdOrThrow(raw, "dataset version");

export const GET = withApi<{ id: string }>(
  async ({ user, params }) => {
    const { version, capabilities } = await getVisibleVersionOrThrow({ versionId: versionIdOrThrow(params.id), viewer: user });
    return NextResponse.json(
      { data: await versionToJson(version, { withDecisions: capabilities.view_decisions }) },
      { headers: { etag: `"${version.lockVersion}"` } },
    );
  },
  { identify: true, scope: "read" },
);

export const PUT = withApi<{ id: string }>(
  async ({ req, user, params }) => {
    const versionId = versionIdOrThrow(params.id);
    const ifMatch = req.headers.get("if-match")?.replace(/"/g, "");
    const expected = Number(ifMatch);
    if (!ifMatch || !Number.isInteger(expected)) {
      throw new AppError("validation_failed", "Send the lock version you edited as an If-Match header (the ETag of GET)", [
        { pointer: "", message: "If-Match header missing" },
      ]);
    }
    // Parsed and validated on an analysis worker thread, not here.
    const saved = await updateDraft({
      actor: user!,
      versionId,
      expectedLockVersion: expected,
      text: await readTextBodyOrThrow(req, { limit: MAX_DOCUMENT_BYTES, what: "deposit document" }),
    });
    return NextResponse.json(
      { data: { versionId: saved.id, lockVersion: saved.lockVersion, state: saved.state } },
      { headers: { etag: `"${saved.lockVersion}"` } },
    );
  },
  { permission: "dataset.deposit", scope: "deposit" },
);
