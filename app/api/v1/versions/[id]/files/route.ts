// GET /api/v1/versions/:id/files — a version's supplementary files
// POST /api/v1/versions/:id/files — add one (multipart field "file"; owner or editor; drafts only; ≤ 25 MB; Idempotency-Key honoured)
import { createHash } from "node:crypto";
import { NextResponse } from "next/server";
import { withApi } from "@/lib/auth/api";
import { getVisibleVersionOrThrow } from "@/lib/datasets/deposits";
import { addVersionFile, listVersionFiles, MAX_FILE_BYTES, type VersionFileDto } from "@/lib/datasets/files";
import { AppError } from "@/lib/errors";
import { BODY_LIMITS, readFormDataOrThrow } from "@/lib/http/read-body";
import { withIdempotency } from "@/lib/idempotency";
import { parseIdOrThrow } from "@/lib/ids";

const idOf = (raw: string) => parseIdOrThrow(raw, "dataset version");

export const GET = withApi<{ id: string }>(
  async ({ user, params }) => {
    const versionId = idOf(params.id);
    await getVisibleVersionOrThrow({ versionId, viewer: user });
    return NextResponse.json({ data: await listVersionFiles({ versionId }) });
  },
  { identify: true, scope: "deposit:read" },
);

export const POST = withApi<{ id: string }>(
  async ({ req, user, params }) => {
    const versionId = idOf(params.id);
    // Counted before any part is decoded: an oversized upload is refused without being held.
    const form = await readFormDataOrThrow(req, {
      limit: MAX_FILE_BYTES + BODY_LIMITS.multipartOverhead,
      what: "upload",
      shownLimit: MAX_FILE_BYTES,
    });
    const file = form.get("file");
    if (!file || typeof file === "string")
      throw new AppError("validation_failed", "Send the file as multipart form field “file”", [{ pointer: "/file", message: "missing" }]);
    const content = new Uint8Array(await file.arrayBuffer());
    // The multipart boundary differs on every retry, so the key is matched on name and content.
    const fingerprint = `${file.name}\n${createHash("sha256").update(content).digest("hex")}`;
    return withIdempotency({
      req,
      user: user!,
      fingerprint,
      run: async (keep) => {
        const created = (saved: VersionFileDto) => ({ status: 201, body: { data: saved } });
        return created(await addVersionFile({ actor: user!, versionId, filename: file.name, content, beforeCommit: keep(created) }));
      },
    });
  },
  { permission: "dataset.deposit", scope: "deposit:write" },
);
