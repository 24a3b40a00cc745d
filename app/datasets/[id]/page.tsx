import type { Metadata } from "next";
import { NOT_FOUND_METADATA, publicPageMetadata } from "@/lib/page-metadata";
import { versionPath } from "@/lib/identifiers/paths";
import { notFound, redirect } from "next/navigation";
import { listPublicVersions } from "@/lib/datasets/queries";
import { parseIdOrNull } from "@/lib/ids";

/** The series redirects to its newest public version, whose page is the canonical one. */
export async function generateMetadata({ params }: { params: Promise<{ id: string }> }): Promise<Metadata> {
  const datasetId = parseIdOrNull((await params).id);
  const versions = datasetId === null ? [] : await listPublicVersions({ datasetId });
  const newest = versions.find((v) => v.state === "published") ?? versions[0];
  if (datasetId === null || !newest) return NOT_FOUND_METADATA;
  return publicPageMetadata({
    title: "Dataset",
    description: "A published rate-constant dataset; this address leads to its newest public version.",
    path: versionPath(datasetId, newest.number),
  });
}

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
