import type { Metadata } from "next";
import Link from "next/link";
import { listReactionsWithPublicData } from "@/lib/reactions/queries";

export const metadata: Metadata = { title: "Reactions" };
export const dynamic = "force-dynamic";

export default async function ReactionsPage() {
  const rows = await listReactionsWithPublicData();
  return (
    <div className="space-y-6">
      <h1 className="text-3xl font-semibold">Reactions</h1>
      <p className="text-sm text-muted">Every reaction with at least one published dataset. Each page compares its datasets on one plot.</p>
      <ul className="card divide-y divide-line p-0">
        {rows.map((r) => (
          <li key={r.id} className="flex items-center justify-between px-6 py-3">
            <Link href={`/reactions/${r.id}`}>{r.equation}</Link>
            <span className="text-sm text-muted">
              {r.datasets} dataset{r.datasets === 1 ? "" : "s"}
            </span>
          </li>
        ))}
      </ul>
    </div>
  );
}
