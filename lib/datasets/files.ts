import "server-only";
import { createHash, randomUUID } from "node:crypto";
import { eq } from "drizzle-orm";
import { getDb, type Transaction } from "@/db/client";
import { versionFiles } from "@/db/datasets";
import { recordAuditEvent } from "@/lib/audit/record";
import { AppError } from "@/lib/errors";
import { getStorage } from "@/lib/storage";
import type { UserDto } from "@/lib/users/queries";
import { getVersionForOrThrow, getVisibleVersionOrThrow } from "./deposits";

export const MAX_FILE_BYTES = 25 * 1024 * 1024;

/** Accepted supplementary file types: data, text, documents and images that cannot carry scripts. */
export const FILE_TYPES: Record<string, string> = {
  csv: "text/csv",
  tsv: "text/tab-separated-values",
  txt: "text/plain",
  json: "application/json",
  log: "text/plain",
  out: "text/plain",
  dat: "text/plain",
  inp: "text/plain",
  xyz: "chemical/x-xyz",
  cif: "chemical/x-cif",
  pdf: "application/pdf",
  png: "image/png",
  jpg: "image/jpeg",
  jpeg: "image/jpeg",
  zip: "application/zip",
  xlsx: "application/vnd.openxmlformats-officedocument.spreadsheetml.sheet",
};

const fileColumns = {
  id: versionFiles.id,
  versionId: versionFiles.versionId,
  filename: versionFiles.filename,
  contentType: versionFiles.contentType,
  sizeBytes: versionFiles.sizeBytes,
  sha256: versionFiles.sha256,
  createdAt: versionFiles.createdAt,
};

/** A stored file as the API shows it. */
export interface VersionFileDto {
  id: number;
  versionId: number;
  filename: string;
  contentType: string;
  sizeBytes: number;
  sha256: string;
  createdAt: Date;
}

function safeName(name: string): string {
  return (
    name
      .replace(/[/\\]/g, "_")
      .replace(/[^\w.\- ()+]/g, "_")
      .slice(0, 200) || "file"
  );
}

/** Stores one supplementary file on a draft (owner or editor): type allowlist, size limit, SHA-256 recorded. */
export async function addVersionFile({
  actor,
  versionId,
  filename,
  content,
  beforeCommit,
}: {
  actor: UserDto;
  versionId: number;
  filename: string;
  content: Uint8Array;
  /** Work that commits or rolls back with the file's row (an Idempotency-Key's record). */
  beforeCommit?: (tx: Transaction, saved: VersionFileDto) => Promise<void>;
}) {
  const { version } = await getVersionForOrThrow({ versionId, actor, action: "upload_files" });
  const name = safeName(filename);
  const ext = name.split(".").pop()?.toLowerCase() ?? "";
  const contentType = FILE_TYPES[ext];
  if (!contentType) {
    throw new AppError(
      "validation_failed",
      `Files of type “.${ext}” are not accepted. Accepted: ${Object.keys(FILE_TYPES)
        .map((e) => `.${e}`)
        .join(", ")}.`,
      [{ pointer: "/file", message: "type not accepted", value: name }],
    );
  }
  if (content.byteLength > MAX_FILE_BYTES) {
    throw new AppError("payload_too_large", `The file is ${(content.byteLength / 1024 / 1024).toFixed(1)} MB; the limit is 25 MB.`);
  }
  if (content.byteLength === 0) throw new AppError("validation_failed", "The file is empty", [{ pointer: "/file", message: "empty file" }]);
  const sha256 = createHash("sha256").update(content).digest("hex");
  const storageKey = `${version.datasetId}/${version.id}/${randomUUID()}-${name}`;
  await getStorage().put(storageKey, content);
  try {
    return await getDb().transaction(async (tx) => {
      const [row] = await tx
        .insert(versionFiles)
        .values({ versionId, filename: name, contentType, sizeBytes: content.byteLength, sha256, storageKey })
        .returning(fileColumns);
      await recordAuditEvent(tx, {
        actorId: actor.id,
        action: "dataset.file_added",
        subjectType: "dataset_version",
        subjectId: versionId,
        details: { filename: name, sha256 },
      });
      await beforeCommit?.(tx, row);
      return row;
    });
  } catch (err) {
    await getStorage().remove(storageKey); // nothing half-stored
    throw err;
  }
}

export async function listVersionFiles({ versionId }: { versionId: number }) {
  return getDb().select(fileColumns).from(versionFiles).where(eq(versionFiles.versionId, versionId)).orderBy(versionFiles.createdAt);
}

/** One file with its content, for whoever may see its version. */
export async function readVersionFile({ viewer, fileId }: { viewer: UserDto | null; fileId: number }) {
  const [row] = await getDb()
    .select({ ...fileColumns, storageKey: versionFiles.storageKey })
    .from(versionFiles)
    .where(eq(versionFiles.id, fileId));
  if (!row) throw new AppError("not_found", "No such file");
  await getVisibleVersionOrThrow({ versionId: row.versionId, viewer });
  return { ...row, content: await getStorage().get(row.storageKey) };
}

export async function removeVersionFile({ actor, fileId }: { actor: UserDto; fileId: number }) {
  const [row] = await getDb()
    .select({ versionId: versionFiles.versionId, storageKey: versionFiles.storageKey, filename: versionFiles.filename })
    .from(versionFiles)
    .where(eq(versionFiles.id, fileId));
  if (!row) throw new AppError("not_found", "No such file");
  await getVersionForOrThrow({ versionId: row.versionId, actor, action: "upload_files" });
  await getDb().transaction(async (tx) => {
    // The database refuses this for published versions.
    await tx.delete(versionFiles).where(eq(versionFiles.id, fileId));
    await recordAuditEvent(tx, {
      actorId: actor.id,
      action: "dataset.file_removed",
      subjectType: "dataset_version",
      subjectId: row.versionId,
      details: { filename: row.filename },
    });
  });
  // A newer version may list the same stored object; keep it while any row refers to it.
  const [still] = await getDb()
    .select({ id: versionFiles.id })
    .from(versionFiles)
    .where(eq(versionFiles.storageKey, row.storageKey))
    .limit(1);
  if (!still) await getStorage().remove(row.storageKey);
}
