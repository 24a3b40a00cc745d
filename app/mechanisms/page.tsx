import type { Metadata } from "next";
import Link from "next/link";
import { requirePagePermission } from "@/lib/auth/page-guard";
import { FIT_CAUTION } from "@/lib/datasets/version-json";
import { DEMO_MECHANISM } from "@/lib/mechanisms/demo";
import { listMechanismChecks } from "@/lib/mechanisms/queries";
import { MechanismForm } from "./mechanism-form";

export const metadata: Metadata = { title: "Check a mechanism" };

export default async function MechanismsPage() {
  const user = await requirePagePermission("mechanism.check", "/mechanisms");
  const checks = await listMechanismChecks({ ownerId: user.id });
  return (
    <div className="mx-auto max-w-5xl space-y-6 p-4">
      <h1 className="text-2xl font-semibold">Check a mechanism against the published data</h1>
      <p className="text-sm">
        Each elementary reaction&apos;s k(T) is compared with the consensus its reaction page shows, over the part of your use window the
        data cover; the rest of the window is named as extrapolation. Other rate types are listed as not checked yet.
      </p>
      <p className="rounded-md border border-warn/40 bg-panel px-3 py-2 text-sm text-warn">{FIT_CAUTION}</p>
      <MechanismForm demo={DEMO_MECHANISM} />
      <section aria-labelledby="my-checks">
        <h2 id="my-checks" className="text-lg font-semibold">
          My checks
        </h2>
        {checks.length === 0 ? (
          <p className="text-sm text-muted">None yet.</p>
        ) : (
          <ul className="divide-y">
            {checks.map((c) => (
              <li key={c.id} className="py-2 text-sm">
                <Link href={`/mechanisms/${c.id}`} className="underline">
                  {c.name}
                </Link>{" "}
                <span className="text-muted">
                  {c.createdAt.toISOString().slice(0, 16).replace("T", " ")} UTC · {c.state}
                  {c.summary ? ` · ${c.summary.agrees} agree, ${c.summary.disagrees} disagree, ${c.summary.no_data} without data` : ""}
                </span>
              </li>
            ))}
          </ul>
        )}
      </section>
    </div>
  );
}
