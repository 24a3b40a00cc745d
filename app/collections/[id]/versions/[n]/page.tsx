import type { Metadata } from "next";
import { getCurrentUser } from "@/lib/auth/session";
import { notFound } from "next/navigation";
import { getCollection } from "@/lib/collections/queries";
import { collectionVersionPath } from "@/lib/identifiers/paths";
import { parseIdOrNull } from "@/lib/ids";
import { NOT_FOUND_METADATA, publicPageMetadata } from "@/lib/page-metadata";
import { CollectionVersionPage, loadCollectionPage } from "../../../collection-page";

type Params = { params: Promise<{ id: string; n: string }> };

export async function generateMetadata({ params }: Params): Promise<Metadata> {
  const { id: rawId, n } = await params;
  const id = parseIdOrNull(rawId);
  const number = parseIdOrNull(n);
  const viewer = await getCurrentUser();
  const found = id === null || number === null ? null : await getCollection({ collectionId: id, viewerId: viewer?.id ?? null });
  const version = found?.versions.find((v) => v.number === number);
  if (!found || !version) return NOT_FOUND_METADATA;
  if (version.state === "draft")
    return { title: `${version.title} (draft of version ${version.number})`, robots: { index: false, follow: false } };
  return publicPageMetadata({
    title: `${version.title} (version ${version.number})`,
    description: `A collection of ${version.memberCount} rate-constant dataset versions, made by ${found.ownerName}.`,
    path: collectionVersionPath(found.id, version.number),
  });
}

// /collections/:id/versions/:n — one version of a collection, at its own address for good (its identifier resolves here).
export default async function CollectionVersionRoute({ params }: Params) {
  const { id: rawId, n } = await params;
  const id = parseIdOrNull(rawId);
  const number = parseIdOrNull(n);
  if (id === null || number === null) notFound();
  return <CollectionVersionPage view={await loadCollectionPage({ collectionId: id, number })} />;
}
