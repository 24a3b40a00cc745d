// GET /api/v1/versions/:id/files — a version's supplementary files
// POST /api/v1/versions/:id/files — add one (multipart field "file"; owner or editor; drafts only; ≤ 25 MB)
import { NextResponse } from "next/server";
import { withApi } from "@/lib/auth/api";
import { getVisibleVersionOrThrow } from "@/lib/datasets/deposits";
import { addVersionFile, listVersionFiles, MAX_FILE_BYTES } from "@/lib/datasets/files";
import { AppError } from "@/lib/errors";
import { parseIdOrThrow } from "@/lib/ids";

const idOf = (raw: string) => parseIdOrThrow(raw, "dataset version");

export const GET = withApi<{ id: string }>(
  async ({ user, params }) => {
    const versionId = idOf(params.id);
    await getVisibleVersionOrThrow({ versionId, viewer: user });
    return NextResponse.json({ data: await listVersionFiles({ versionId }) });
  },
  { identify: true, scope: "read" },
);

export const POST = withApi<{ id: string }>(
  async ({ req, user, params }) => {
    const versionId = idOf(params.id);
    // Refuse before reading: multipart overhead is small next to the 25 MB limit.
    if (Number(req.headers.get("content-length") ?? 0) > MAX_FILE_BYTES + 64 * 1024) throw new AppError("payload_too_large", "The file is larger than 25 MB");
    const form = await req.formData().catch(() => null);
    const file = form?.get("file");
    if (!file || typeof file === "string") throw new AppError("validation_failed", "Send the file as multipart form field “file”", [{ pointer: "/file", message: "missing" }]);
    const saved = await addVersionFile({ actor: user!, versionId, filename: file.name, content: new Uint8Array(await file.arrayBuffer()) });
    return NextResponse.json({ data: saved }, { status: 201 });
  },
  { permission: "dataset.deposit", scope: "deposit" },
);
