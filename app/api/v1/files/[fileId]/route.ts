// GET /api/v1/files/:fileId — download a supplementary file (same visibility as its version)
// DELETE /api/v1/files/:fileId — remove one from a draft (owner or editor)
import { withApi } from "@/lib/auth/api";
import { readVersionFile, removeVersionFile } from "@/lib/datasets/files";
import { parseIdOrThrow } from "@/lib/ids";

const idOf = (raw: string) => parseIdOrThrow(raw, "file");

export const GET = withApi<{ fileId: string }>(
  async ({ user, params }) => {
    const file = await readVersionFile({ viewer: user, fileId: idOf(params.fileId) });
    return new Response(Buffer.from(file.content), {
      headers: {
        "content-type": file.contentType,
        "content-length": String(file.sizeBytes),
        "content-disposition": `attachment; filename="${file.filename.replace(/"/g, "")}"`,
        "x-content-sha256": file.sha256,
        "x-content-type-options": "nosniff",
      },
    });
  },
  { identify: true, scope: "deposit:read" },
);

export const DELETE = withApi<{ fileId: string }>(
  async ({ user, params }) => {
    await removeVersionFile({ actor: user!, fileId: idOf(params.fileId) });
    return new Response(null, { status: 204 });
  },
  { permission: "dataset.deposit", scope: "deposit:write" },
);
