import "server-only";
import { AppError } from "@/lib/errors";
import { parseIdOrThrow } from "@/lib/ids";
import { getPublicVersionPoints, pointsFileName } from "./public-version";

/**
 * What both point downloads need: the public version behind a path id, its rows and header, and
 * the response headers (an attachment with its file name).
 * Any version that is not published or retracted is not found, whoever asks.
 */
export async function pointsDownloadOrThrow(rawId: string, ext: "csv" | "json") {
  const found = await getPublicVersionPoints({ versionId: parseIdOrThrow(rawId, "dataset version") });
  if (!found) throw new AppError("not_found", "No published dataset version with this id");
  const name = pointsFileName(found.version, ext);
  return {
    ...found,
    headers: {
      "content-disposition": `attachment; filename="${name}"`,
      "x-content-type-options": "nosniff",
    },
  };
}
