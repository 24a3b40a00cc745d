import type { Metadata } from "next";
import Link from "next/link";
import { DateTime } from "@/components/date-time";
import { getCurrentUser } from "@/lib/auth/session";
import { listMyCollections, listPublishedCollections, type CollectionListItem } from "@/lib/collections/queries";
import { collectionPath } from "@/lib/identifiers/paths";
import { publicPageMetadata } from "@/lib/page-metadata";

export const metadata: Metadata = publicPageMetadata({
  title: "Collections",
  description: "Citable sets of published rate-constant dataset versions, chosen by modellers.",
  path: "/collections",
});

function CollectionList({ items, empty }: { items: CollectionListItem[]; empty: string }) {
  if (items.length === 0) return <p className="text-sm text-muted">{empty}</p>;
  return (
    <ul className="space-y-3">
      {items.map((c) => (
        <li key={c.id} className="card space-y-1">
          <Link href={collectionPath(c.id)} className="font-medium">
            {c.title}
          </Link>
          <p className="text-xs text-muted">
            {c.state === "draft" ? `draft of version ${c.number}` : `version ${c.number}`} · {c.memberCount}{" "}
            {c.memberCount === 1 ? "member" : "members"} · by {c.ownerName}
            {c.publishedAt && (
              <>
                {" "}
                · published <DateTime value={c.publishedAt} />
              </>
            )}
            {c.versionIdentifier && <> · {c.versionIdentifier}</>}
          </p>
        </li>
      ))}
    </ul>
  );
}

// /collections — the published collections, and the signed-in person's own.
export default async function CollectionsPage() {
  const viewer = await getCurrentUser();
  const [published, mine] = await Promise.all([
    listPublishedCollections({ limit: 100 }),
    viewer ? listMyCollections({ ownerId: viewer.id }) : [],
  ]);
  return (
    <div className="space-y-8">
      <header className="space-y-2">
        <h1 className="text-3xl font-semibold">Collections</h1>
        <p>
          A collection is a chosen list of published dataset versions — the rate data behind a mechanism, say — that can be published with
          an identifier of its own and cited in one line.
        </p>
      </header>
      {viewer && (
        <section aria-labelledby="mine-heading" className="space-y-3">
          <h2 id="mine-heading" className="text-xl font-semibold">
            My collections
          </h2>
          <p className="text-sm">
            <Link href="/collections/new">Make a new collection</Link>
          </p>
          <CollectionList items={mine} empty="You have no collection yet." />
        </section>
      )}
      <section aria-labelledby="published-heading" className="space-y-3">
        <h2 id="published-heading" className="text-xl font-semibold">
          Published collections
        </h2>
        <CollectionList items={published} empty="No collection is published yet." />
      </section>
    </div>
  );
}
