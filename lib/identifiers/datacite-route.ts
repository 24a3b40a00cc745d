import "server-only";
import { AppError } from "@/lib/errors";
import { parseIdOrThrow } from "@/lib/ids";
import type { DataciteBody } from "./datacite";
import { getPublicVersionDatacite } from "./public-datacite";

/** Both DataCite routes: the path's dataset id and version number (`2` or `v2`), then the version's metadata or a 404. */
export async function dataciteForPathOrThrow(params: { id: string; n: string }): Promise<DataciteBody> {
  const datasetId = parseIdOrThrow(params.id, "dataset");
  const versionNumber = parseIdOrThrow(params.n.replace(/^v/, ""), "version number");
  const body = await getPublicVersionDatacite({ datasetId, versionNumber });
  if (!body) throw new AppError("not_found", `Dataset ${datasetId} has no published version ${versionNumber}`);
  return body;
}
