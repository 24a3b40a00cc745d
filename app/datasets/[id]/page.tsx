import { notFound, redirect } from "next/navigation";
import { listPublicVersions } from "@/lib/datasets/queries";

// /datasets/:id — what a series identifier resolves to: the newest public version.
export default async function DatasetSeriesPage({ params }: { params: Promise<{ id: string }> }) {
  const { id } = await params;
  const datasetId = Number(id);
  if (!Number.isInteger(datasetId) || datasetId <= 0) notFound();
  const versions = await listPublicVersions({ datasetId });
  const newest = versions.find((v) => v.state === "published") ?? versions[0];
  if (!newest) notFound();
  redirect(`/datasets/${datasetId}/v${newest.number}`);
}
