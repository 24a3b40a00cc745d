import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { OrcidId } from "@/components/orcid-id";
import { citeVersion } from "@/lib/datasets/public-version";
import { versionPath } from "@/lib/identifiers/paths";
import { parseIdOrNull } from "@/lib/ids";
import { NOT_FOUND_METADATA, publicPageMetadata } from "@/lib/page-metadata";
import { getPublicProfile, listProfileDatasets } from "@/lib/people/queries";

export async function generateMetadata({ params }: { params: Promise<{ id: string }> }): Promise<Metadata> {
  const id = parseIdOrNull((await params).id);
  const profile = id === null ? null : await getPublicProfile({ id });
  if (!profile) return NOT_FOUND_METADATA;
  const metadata = publicPageMetadata({
    title: profile.name,
    description: `Published rate-constant datasets of ${profile.name}.`,
    path: `/people/${id}`,
  });
  // An unlisted profile still answers at its address (a dataset page links it) but asks search engines to leave it out.
  return profile.listed ? metadata : { ...metadata, robots: { index: false, follow: true } };
}

// /people/:id — a person's public profile: name, iD, affiliation and every published dataset they created or deposited.
export default async function PersonPage({ params }: { params: Promise<{ id: string }> }) {
  const id = parseIdOrNull((await params).id);
  if (id === null) notFound();
  const profile = await getPublicProfile({ id });
  if (!profile) notFound();
  const datasets = await listProfileDatasets({ userId: id });
  return (
    <div className="space-y-6">
      <header className="space-y-1">
        <h1 className="text-3xl font-semibold break-words">{profile.name}</h1>
        {profile.affiliation && <p className="text-muted">{profile.affiliation}</p>}
        {profile.verifiedOrcid && (
          <p className="text-sm">
            ORCID iD: <OrcidId orcid={profile.verifiedOrcid} verified />
          </p>
        )}
        {profile.typedOrcid && (
          <p className="text-sm">
            ORCID iD: <OrcidId orcid={profile.typedOrcid} verified={false} />
          </p>
        )}
      </header>
      <section aria-labelledby="datasets-heading" className="space-y-3">
        <h2 id="datasets-heading" className="text-xl font-semibold">
          Published datasets ({datasets.length})
        </h2>
        {datasets.length === 0 ? (
          <p className="text-sm text-muted">No published dataset yet.</p>
        ) : (
          <ul className="space-y-3">
            {datasets.map((d) => (
              <li key={d.datasetId} className="card space-y-1">
                <Link href={versionPath(d.datasetId, d.number)} className="font-medium">
                  {d.title}
                </Link>
                <p className="text-xs text-muted">
                  {[d.created ? "creator" : null, d.deposited ? "depositor" : null].filter(Boolean).join(" and ")} · version {d.number}
                </p>
                <p className="text-sm">{citeVersion(d)}</p>
              </li>
            ))}
          </ul>
        )}
      </section>
    </div>
  );
}
