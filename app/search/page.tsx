import type { Metadata } from "next";
import { publicPageMetadata } from "@/lib/page-metadata";
import { Suspense } from "react";
import { redirect } from "next/navigation";
import { repositoryIdentifierIn } from "@/lib/search/parse-query";
import { FIT_CAUTION } from "@/lib/datasets/version-json";
import { parseSearchParams, searchAnswer, toSearchParams } from "@/lib/search";
import type { SearchAnswer } from "@/lib/search/types";
import { SearchClient } from "./search-client";
import { readDraftCollections } from "@/app/collections/collection-page";

export async function generateMetadata({
  searchParams,
}: {
  searchParams: Promise<Record<string, string | string[] | undefined>>;
}): Promise<Metadata> {
  const q = (await searchParams).q;
  // The tab and the history say what was searched ("methane · Search"); the canonical address stays /search.
  const typed = typeof q === "string" ? q.trim().slice(0, 80) : "";
  return publicPageMetadata({
    title: typed ? `${typed} · Search` : "Search",
    description:
      "Search every published rate-constant dataset by species, reaction, author or words, and narrow by class, conditions and findings.",
    path: "/search",
  });
}
export const dynamic = "force-dynamic";

/**
 * The first answer, searched here for the first paint; the browser takes over from it (the same
 * answer GET /api/v1/search gives). Null when the URL needs correcting or the search fails: the
 * browser then asks the API, which names the problem.
 */
async function firstAnswer(params: Record<string, string | string[] | undefined>): Promise<{ key: string; answer: SearchAnswer } | null> {
  const parsed = parseSearchParams(params);
  if (!parsed.ok) return null;
  try {
    return { key: toSearchParams(parsed.request).toString(), answer: await searchAnswer(parsed.request) };
  } catch {
    return null;
  }
}

/** /search: the URL holds the whole search; the results are fetched (and refetched) in the browser. */
export default async function SearchPage({ searchParams }: { searchParams: Promise<Record<string, string | string[] | undefined>> }) {
  const params = await searchParams;
  // A dataset's identifier pasted into the search box opens what it names (GET /api/v1/search says where, 400).
  const identifier = typeof params.q === "string" ? repositoryIdentifierIn(params.q) : null;
  if (identifier) redirect(`/id/${identifier}`);
  const [initial, collecting] = await Promise.all([firstAnswer(params), readDraftCollections()]);
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
        <SearchClient initial={initial} collecting={collecting.signedIn ? { drafts: collecting.drafts } : null} />
      </Suspense>
    </div>
  );
}
