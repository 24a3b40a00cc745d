import type { Metadata } from "next";
import Link from "next/link";
import { OrcidId } from "@/components/orcid-id";
import { parseIdOrNull } from "@/lib/ids";
import { publicPageMetadata } from "@/lib/page-metadata";
import { listPublicProfiles, PROFILES_PAGE_SIZE } from "@/lib/people/queries";

export const metadata: Metadata = publicPageMetadata({
  title: "People",
  description: "People who deposited or created published rate-constant datasets.",
  path: "/people",
});

// /people — the profiles their people chose to list, by name, a hundred a page.
export default async function PeoplePage({ searchParams }: { searchParams: Promise<{ page?: string | string[] }> }) {
  const raw = (await searchParams).page;
  const page = parseIdOrNull(Array.isArray(raw) ? raw[0] : (raw ?? "1")) ?? 1;
  const { profiles, total } = await listPublicProfiles({ page });
  const pages = Math.max(1, Math.ceil(total / PROFILES_PAGE_SIZE));
  return (
    <div className="space-y-6">
      <header className="space-y-1">
        <h1 className="text-3xl font-semibold">People</h1>
        <p className="text-sm text-muted">
          {total} listed {total === 1 ? "person" : "people"} with a verified ORCID iD or a published dataset. Each chooses in their settings
          whether to be listed here.
        </p>
      </header>
      <ul className="space-y-2">
        {profiles.map((p) => (
          <li key={p.id}>
            <Link href={`/people/${p.id}`} className="font-medium">
              {p.name}
            </Link>
            {p.affiliation && <span className="text-sm text-muted"> — {p.affiliation}</span>}
            {p.verifiedOrcid && (
              <span className="text-sm">
                {" "}
                <OrcidId orcid={p.verifiedOrcid} verified />
              </span>
            )}
          </li>
        ))}
      </ul>
      {pages > 1 && (
        <nav aria-label="Pages" className="flex gap-4 text-sm">
          {page > 1 && <Link href={`/people?page=${page - 1}`}>Previous {PROFILES_PAGE_SIZE}</Link>}
          {page < pages && <Link href={`/people?page=${page + 1}`}>Next {PROFILES_PAGE_SIZE}</Link>}
        </nav>
      )}
    </div>
  );
}
