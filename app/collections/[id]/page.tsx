import type { Metadata } from "next";
import { getCurrentUser } from "@/lib/auth/session";
import { notFound } from "next/navigation";
import { getCollection } from "@/lib/collections/queries";
import { collectionPath } from "@/lib/identifiers/paths";
import { parseIdOrNull } from "@/lib/ids";
import { NOT_FOUND_METADATA, publicPageMetadata } from "@/lib/page-metadata";
import { CollectionVersionPage, loadCollectionPage } from "../collection-page";

export async function generateMetadata({ params }: { params: Promise<{ id: string }> }): Promise<Metadata> {
  const id = parseIdOrNull((await params).id);
  // Its owner reads a draft here too: the tab names it (a draft is never indexed).
  const viewer = await getCurrentUser();
  const found = id === null ? null : await getCollection({ collectionId: id, viewerId: viewer?.id ?? null });
  if (!found) return NOT_FOUND_METADATA;
  if (found.versions[0].state === "draft") return { title: `${found.versions[0].title} (draft)`, robots: { index: false, follow: false } };
  return publicPageMetadata({
    title: found.versions[0].title,
    description: `A collection of ${found.versions[0].memberCount} rate-constant dataset versions, made by ${found.ownerName}.`,
    path: collectionPath(found.id),
  });
}

// /collections/:id — a collection at its newest published version (its owner: the newest, a draft included).
export default async function CollectionPage({ params }: { params: Promise<{ id: string }> }) {
  const id = parseIdOrNull((await params).id);
  if (id === null) notFound();
  return <CollectionVersionPage view={await loadCollectionPage({ collectionId: id })} />;
}
