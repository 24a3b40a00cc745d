import { versionPath } from "@/lib/identifiers/paths";
import { notFound, redirect } from "next/navigation";
import { listPublicVersions } from "@/lib/datasets/queries";
import { parseIdOrNull } from "@/lib/ids";

// /datasets/:id — what a series identifier resolves to: the newest public version.
export default async function DatasetSeriesPage({ params }: { params: Promise<{ id: string }> }) {
  const { id } = await params;
  const datasetId = parseIdOrNull(id);
  if (datasetId === null) notFound();
  const versions = await listPublicVersions({ datasetId });
  const newest = versions.find((v) => v.state === "published") ?? versions[0];
  if (!newest) notFound();
  redirect(versionPath(datasetId, newest.number));
}
