import type { Metadata } from "next";
import Link from "next/link";
import { REACTION_CLASSES } from "@/lib/deposits/vocabulary";
import { classPath } from "@/lib/identifiers/paths";
import { publicPageMetadata } from "@/lib/page-metadata";
import { listClassCountsCached } from "@/lib/reactions/cached";

export async function generateMetadata(): Promise<Metadata> {
  return publicPageMetadata({
    title: "Reaction classes",
    description:
      "Reactions with published rate constants, grouped by the kind of elementary step, with the number of reactions and datasets.",
    path: "/classes",
  });
}
export const dynamic = "force-dynamic";

/** Every reaction class with its counts of public reactions and datasets. */
export default async function ClassesPage() {
  const counts = await listClassCountsCached();
  return (
    <div className="space-y-6">
      <h1 className="text-3xl font-semibold">Reaction classes</h1>
      <p className="text-sm text-muted">
        Depositors say what kind of elementary step each dataset measures. A reaction appears under every class its published datasets name.
      </p>
      <ul className="grid gap-4 sm:grid-cols-2">
        {REACTION_CLASSES.map((c) => {
          const n = counts.find((x) => x.id === c.id);
          return (
            <li key={c.id} className="card space-y-1">
              <h2 className="text-lg font-semibold">
                <Link href={classPath(c.id)}>{c.label}</Link>
              </h2>
              <p className="text-sm">{c.hint}</p>
              <p className="text-sm text-muted">
                {n?.reactions ?? 0} reaction{n?.reactions === 1 ? "" : "s"}, {n?.datasets ?? 0} dataset{n?.datasets === 1 ? "" : "s"}
              </p>
            </li>
          );
        })}
      </ul>
    </div>
  );
}
