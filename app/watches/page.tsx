import type { Metadata } from "next";
import Link from "next/link";
import { redirect } from "next/navigation";
import { DateTime } from "@/components/date-time";
import { getCurrentUser } from "@/lib/auth/session";
import { collectionPath, seriesPath, speciesPath } from "@/lib/identifiers/paths";
import { reactionPath } from "@/lib/reactions/paths";
import { getDailyDigest, listWatches, type WatchDto } from "@/lib/watches/queries";
import { DailyDigestForm, RemoveWatchButton } from "./watch-forms";

export const metadata: Metadata = { title: "What you watch" };

const pageOf = (w: WatchDto) =>
  w.reactionKey
    ? reactionPath(w.reactionKey)
    : w.inchiKey
      ? speciesPath(w.inchiKey)
      : w.datasetId
        ? seriesPath(w.datasetId)
        : w.collectionId
          ? collectionPath(w.collectionId)
          : null;

/** A person's watches: what they are told about, how, and a way to stop each. */
export default async function WatchesPage() {
  const user = await getCurrentUser();
  if (!user) redirect("/sign-in?callbackUrl=/watches");
  const [watches, dailyDigest] = await Promise.all([listWatches({ userId: user.id }), getDailyDigest({ userId: user.id })]);
  return (
    <div className="space-y-8">
      <header className="space-y-2">
        <h1 className="text-3xl font-semibold">What you watch</h1>
        <p className="text-sm text-muted">
          You get a mail at {user.email} when a version of a dataset you watch — or of a reaction or species you watch — is published or
          retracted, or when a re-fit changes its flags. Watch from a reaction&apos;s, species&apos; or dataset&apos;s page.
        </p>
      </header>
      <section aria-labelledby="watch-list-heading" className="card space-y-4">
        <h2 id="watch-list-heading" className="text-xl font-semibold">
          Watching
        </h2>
        {watches.length === 0 ? (
          <p className="text-sm">Nothing yet.</p>
        ) : (
          <ul className="divide-y divide-line" aria-label="What you watch">
            {watches.map((w) => {
              const href = pageOf(w);
              return (
                <li key={w.id} className="flex flex-wrap items-center justify-between gap-3 py-2">
                  <span>
                    {href ? <Link href={href}>{w.label}</Link> : w.label}{" "}
                    <span className="text-xs text-muted">
                      since <DateTime value={new Date(w.createdAt)} />
                    </span>
                  </span>
                  <RemoveWatchButton watchId={w.id} label={w.label} />
                </li>
              );
            })}
          </ul>
        )}
      </section>
      <section aria-labelledby="digest-heading" className="card space-y-4">
        <h2 id="digest-heading" className="text-xl font-semibold">
          Mail
        </h2>
        <DailyDigestForm dailyDigest={dailyDigest} />
      </section>
    </div>
  );
}
