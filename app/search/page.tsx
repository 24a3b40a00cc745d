import type { Metadata } from "next";
import { publicPageMetadata } from "@/lib/page-metadata";

export async function generateMetadata(): Promise<Metadata> {
  return publicPageMetadata({
    title: "Search",
    description: "Search published rate-constant datasets by species, reaction, author, technique or words of their description.",
    path: "/search",
  });
}

export default async function SearchPage({ searchParams }: { searchParams: Promise<{ q?: string }> }) {
  const { q } = await searchParams;
  return (
    <div className="space-y-4">
      <h1 className="text-3xl font-semibold">Search</h1>
      <p className="text-sm text-muted">
        {q ? <>No published datasets match “{q}” yet.</> : "Type a reaction, species or author in the search box above."} Search covers
        published datasets only.
      </p>
    </div>
  );
}
