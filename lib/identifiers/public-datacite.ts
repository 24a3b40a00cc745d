import "server-only";
import { listPublicVersions } from "@/lib/datasets/queries";
import type { DataciteBody } from "./datacite";
import { getRegistrationSubject } from "./queries";
import { buildRegistrationBody } from "./register";

/**
 * The DataCite metadata of one published or retracted version: exactly the body its identifier
 * registration sends (the same builder, from the same stored rows). Null for any other version.
 */
export async function getPublicVersionDatacite({
  datasetId,
  versionNumber,
}: {
  datasetId: number;
  versionNumber: number;
}): Promise<DataciteBody | null> {
  const entry = (await listPublicVersions({ datasetId })).find((v) => v.number === versionNumber);
  if (!entry?.versionIdentifier) return null;
  const subject = await getRegistrationSubject({ identifier: entry.versionIdentifier });
  return subject?.described ? buildRegistrationBody(subject) : null;
}
