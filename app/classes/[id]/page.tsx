import type { Metadata } from "next";
import Link from "next/link";
import { notFound, permanentRedirect } from "next/navigation";
import { reactionClassFor } from "@/lib/deposits/vocabulary";
import { classPath } from "@/lib/identifiers/paths";
import { NOT_FOUND_METADATA, publicPageMetadata } from "@/lib/page-metadata";
import { listReactionsOfClassCached } from "@/lib/reactions/cached";
import { reactionPath } from "@/lib/reactions/paths";

export async function generateMetadata({ params }: { params: Promise<{ id: string }> }): Promise<Metadata> {
  const found = reactionClassFor((await params).id);
  if (!found) return NOT_FOUND_METADATA;
  return publicPageMetadata({
    title: `${found.label} reactions`,
    description: `${found.hint} Every reaction of this class with published rate constants.`,
    path: classPath(found.id),
    feedPath: `${classPath(found.id)}/feed.xml`,
  });
}
export const dynamic = "force-dynamic";

/** The public reactions of one reaction class, with their datasets of that class. */
export default async function ClassPage({ params }: { params: Promise<{ id: string }> }) {
  const { id } = await params;
  const found = reactionClassFor(id);
  if (!found) notFound();
  // An id from before the classes were renamed leads to the current page.
  if (found.id !== id) permanentRedirect(classPath(found.id));
  const rows = await listReactionsOfClassCached({ classId: found.id });
  return (
    <div className="space-y-6">
      <header className="space-y-2">
        <p className="text-sm text-muted">Reaction class</p>
        <h1 className="text-3xl font-semibold">{found.label}</h1>
        <p className="text-sm">{found.hint}</p>
      </header>
      {rows.length === 0 ? (
        <p className="card text-sm">No published dataset of this class yet.</p>
      ) : (
        <ul className="card divide-y divide-line p-0" aria-label={`Reactions of the class ${found.label}`}>
          {rows.map((r) => (
            <li key={r.id} className="flex items-center justify-between gap-4 px-6 py-3">
              <Link href={reactionPath(r.key)}>{r.equation}</Link>
              <span className="whitespace-nowrap text-sm text-muted">
                {r.datasets} dataset{r.datasets === 1 ? "" : "s"}
                {r.retracted ? ` (and ${r.retracted} retracted)` : ""}
              </span>
            </li>
          ))}
        </ul>
      )}
      <p className="flex flex-wrap gap-4 text-sm">
        <Link href="/classes">All reaction classes</Link>
        <Link href="/reactions">All reactions</Link>
        {/* A plain link, not Next's: the feed is XML for a feed reader, not a page. */}
        <a href={`${classPath(found.id)}/feed.xml`} type="application/atom+xml">
          Atom feed of new and retracted versions
        </a>
      </p>
    </div>
  );
}
