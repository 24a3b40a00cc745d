import type { Metadata } from "next";
import { Suspense } from "react";
import { FIT_CAUTION } from "@/lib/datasets/version-json";
import { SearchClient } from "./search-client";

export const metadata: Metadata = {
  title: "Search",
  description:
    "Search every published rate-constant dataset by species, reaction, author or words, and narrow by class, conditions and findings.",
};
export const dynamic = "force-dynamic";

/** /search: the URL holds the whole search; the results are fetched (and refetched) in the browser. */
export default async function SearchPage() {
  return (
    <div className="space-y-6">
      <header className="space-y-2">
        <h1 className="text-3xl font-semibold">Search</h1>
        <p className="text-sm text-muted">
          Every published dataset (retracted ones marked), with the parameters of its automatic re-fit. Drafts and submissions are never
          listed.
        </p>
        <p className="rounded-md border border-warn/40 bg-panel px-3 py-2 text-sm text-warn">{FIT_CAUTION}</p>
      </header>
      <Suspense fallback={<p className="text-sm text-muted">Loading the search…</p>}>
        <SearchClient initial={null} />
      </Suspense>
    </div>
  );
}
