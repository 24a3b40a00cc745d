import type { Metadata } from "next";
import Link from "next/link";
import { listReactionsCached } from "@/lib/reactions/cached";
import { reactionPath } from "@/lib/reactions/paths";
import { publicPageMetadata } from "@/lib/page-metadata";

export async function generateMetadata(): Promise<Metadata> {
  return publicPageMetadata({
    title: "Reactions",
    description: "Every reaction with at least one published rate-constant dataset, with the number of datasets of each.",
    path: "/reactions",
  });
}
export const dynamic = "force-dynamic";

export default async function ReactionsPage() {
  const rows = await listReactionsCached();
  return (
    <div className="space-y-6">
      <h1 className="text-3xl font-semibold">Reactions</h1>
      <p className="text-sm text-muted">
        Every reaction with at least one published dataset. Each page compares its datasets on one plot.{" "}
        <Link href="/classes">Browse by reaction class</Link>.
      </p>
      <ul className="card divide-y divide-line p-0">
        {rows.map((r) => (
          <li key={r.id} className="flex items-center justify-between gap-4 px-6 py-3">
            <Link href={reactionPath(r.key)}>{r.equation}</Link>
            <span className="whitespace-nowrap text-sm text-muted">
              {r.datasets} dataset{r.datasets === 1 ? "" : "s"}
            </span>
          </li>
        ))}
      </ul>
    </div>
  );
}
