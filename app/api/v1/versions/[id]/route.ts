// GET /api/v1/versions/:id — one version (published: anyone; otherwise co-editors and curators)
// PUT /api/v1/versions/:id — replace a draft's deposit document (owner or editor; If-Match: lock version, 412 when stale, 428 when missing)
import { NextResponse } from "next/server";
import { withApi } from "@/lib/auth/api";
import { getVisibleVersionOrThrow, updateDraft } from "@/lib/datasets/deposits";
import { STALE_SAVE_MESSAGE } from "@/lib/datasets/queries";
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
  { identify: true, scope: "deposit:read" },
);

export const PUT = withApi<{ id: string }>(
  async ({ req, user, params }) => {
    const versionId = versionIdOrThrow(params.id);
    const ifMatch = req.headers.get("if-match");
    // RFC 9110 §13.1.1: If-Match lists entity tags; the lock version is the ETag of GET ("3", W/"3" or 3).
    const expected = Number(ifMatch?.trim().replace(/^W\//, "").replace(/"/g, ""));
    if (ifMatch === null)
      throw new AppError("precondition_required", "Send the lock version you edited as an If-Match header (the ETag of GET)", [
        { pointer: "", message: "If-Match header missing" },
      ]);
    if (!Number.isInteger(expected) || expected < 0)
      throw new AppError("precondition_failed", 'If-Match must be the lock version you edited (the ETag of GET), e.g. "3"');
    // Parsed and validated on an analysis worker thread, not here.
    const saved = await updateDraft({
      actor: user!,
      versionId,
      expectedLockVersion: expected,
      text: await readTextBodyOrThrow(req, { limit: MAX_DOCUMENT_BYTES, what: "deposit document" }),
    }).catch((err: unknown) => {
      // Someone saved since: the precondition the client sent no longer holds (RFC 9110 §13.1.1).
      if (err instanceof AppError && err.code === "conflict" && err.message === STALE_SAVE_MESSAGE)
        throw new AppError("precondition_failed", STALE_SAVE_MESSAGE);
      throw err;
    });
    return NextResponse.json(
      { data: { versionId: saved.id, lockVersion: saved.lockVersion, state: saved.state } },
      { headers: { etag: `"${saved.lockVersion}"` } },
    );
  },
  { permission: "dataset.deposit", scope: "deposit:write" },
);
