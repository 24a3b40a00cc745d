import type { Metadata } from "next";

export const metadata: Metadata = { title: "Search" };

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
