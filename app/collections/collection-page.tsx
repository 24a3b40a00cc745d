import Link from "next/link";
import { DateTime } from "@/components/date-time";
import { getCurrentUser } from "@/lib/auth/session";
import { listMyCollections } from "@/lib/collections/queries";
import {
  collectionCitationLine,
  listMemberParameters,
  loadCollectionVersionOrThrow,
  type CollectionVersionView,
} from "@/lib/collections/view";
import { FIT_CAUTION } from "@/lib/datasets/version-json";
import { AppError } from "@/lib/errors";
import { formatRange, formatSignificant } from "@/lib/format";
import { collectionPath, collectionVersionPath, versionPath } from "@/lib/identifiers/paths";
import { reactionPath } from "@/lib/reactions/paths";
import { WatchToggle } from "@/app/watches/watch-forms";
import { readWatchState } from "@/app/watches/watch-control";
import { CollectionStepButton, EditCollectionForm, MemberNoteForm, RemoveMemberButton } from "./collection-forms";
import { notFound } from "next/navigation";

const CITATION_DOWNLOADS = [
  ["bibtex", "BibTeX"],
  ["ris", "RIS"],
  ["csl-json", "CSL-JSON"],
  ["text", "Text"],
] as const;

/** The view a collection page renders, read by the page itself (so a missing one is its 404, at once). */
export async function loadCollectionPage({ collectionId, number }: { collectionId: number; number?: number }) {
  const viewer = await getCurrentUser();
  try {
    return await loadCollectionVersionOrThrow({ collectionId, number, viewerId: viewer?.id ?? null });
  } catch (err) {
    if (err instanceof AppError && err.status === 404) notFound();
    throw err;
  }
}

/**
 * One version of a collection: its members with their citation, reaction and parameters, the
 * caution, the downloads and its versions; for its owner, the draft's editing and the next step.
 */
export async function CollectionVersionPage({ view }: { view: CollectionVersionView }) {
  const { collection, version, members, isOwner } = view;
  const collectionId = collection.id;
  const published = version.state === "published";
  const [parameters, watch] = await Promise.all([
    listMemberParameters(members),
    published ? readWatchState({ kind: "collection", id: collectionId }) : Promise.resolve(null),
  ]);
  const newestPublished = collection.versions.find((v) => v.state === "published");
  const api = `/api/v1/collections/${collectionId}/versions/${version.number}`;
  const latest = collection.versions[0];
  return (
    <div className="space-y-6">
      <header className="space-y-2">
        <p className="text-sm text-muted">
          Collection · version {version.number}
          {published ? "" : " · draft, visible to you only"}
        </p>
        <h1 className="text-3xl font-semibold">{version.title}</h1>
        <p className="text-sm">
          Made by {collection.ownerName}
          {version.publishedAt && (
            <>
              {" "}
              · published <DateTime value={version.publishedAt} />
            </>
          )}
          {version.versionIdentifier && <> · identifier {version.versionIdentifier}</>}
        </p>
        {version.description && <p className="whitespace-pre-line">{version.description}</p>}
        {published && newestPublished && newestPublished.number > version.number && (
          <p className="rounded-md border border-warn/40 bg-panel px-3 py-2 text-sm">
            A newer version of this collection exists:{" "}
            <Link href={collectionVersionPath(collectionId, newestPublished.number)}>version {newestPublished.number}</Link>.
          </p>
        )}
      </header>
      <p className="rounded-md border border-warn/40 bg-panel px-3 py-2 text-sm text-warn">{FIT_CAUTION}</p>

      {published && (
        <section aria-labelledby="cite-heading" className="card space-y-2">
          <h2 id="cite-heading" className="text-xl font-semibold">
            Cite this collection
          </h2>
          <p className="text-sm" data-testid="collection-citation">
            {collectionCitationLine(view)}
          </p>
          <p className="flex flex-wrap gap-3 text-sm">
            {CITATION_DOWNLOADS.map(([format, label]) => (
              <a key={format} href={`${api}/citation?format=${format}`} download>
                {label}
              </a>
            ))}
            <a href={`${api}/citation?format=bibtex&members=1`} download>
              BibTeX with every member
            </a>
            <a href={`${api}/citation?format=csl-json&members=1`} download>
              CSL-JSON with every member
            </a>
          </p>
          <h3 className="font-medium">Mechanism parameters of every member</h3>
          <p className="flex flex-wrap gap-3 text-sm">
            <a href={`${api}/parameters?format=cantera-yaml`} download>
              Cantera YAML
            </a>
            <a href={`${api}/parameters?format=table`} download>
              Plain text
            </a>
            <a href={`${api}/datacite.json`}>DataCite metadata</a>
          </p>
        </section>
      )}
      {watch && (
        <WatchToggle
          subject={{ kind: "collection", id: collectionId }}
          what="this collection"
          watching={watch.watching}
          signedIn={watch.signedIn}
          backPath={collectionPath(collectionId)}
          news="one of its versions is retracted or superseded"
        />
      )}

      <section aria-labelledby="members-heading" className="space-y-3">
        <h2 id="members-heading" className="text-xl font-semibold">
          Members ({members.length})
        </h2>
        {members.length === 0 ? (
          <p className="text-sm text-muted">No versions yet: add them from a dataset, a reaction or a search, or from a mechanism check.</p>
        ) : (
          <ol className="space-y-3">
            {members.map((m) => {
              const p = parameters.get(m.versionId);
              const label = `${m.title}, version ${m.number}`;
              return (
                <li key={m.versionId} className="card space-y-1" data-testid="collection-member">
                  <div className="flex flex-wrap items-start justify-between gap-2">
                    <Link href={versionPath(m.datasetId, m.number)} className="font-medium">
                      {label}
                    </Link>
                    {isOwner && version.state === "draft" && (
                      <RemoveMemberButton collectionId={collectionId} versionId={m.versionId} label={label} />
                    )}
                  </div>
                  <p className="text-sm">{m.reactionKey ? <Link href={reactionPath(m.reactionKey)}>{m.equation}</Link> : m.equation}</p>
                  {m.state === "retracted" && (
                    <p className="text-sm text-error">Retracted{m.retractionNotice ? `: ${m.retractionNotice}` : ""}</p>
                  )}
                  {m.newer && (
                    <p className="text-sm text-warn">
                      Superseded: <Link href={versionPath(m.datasetId, m.newer.number)}>version {m.newer.number}</Link> of this dataset is
                      published.
                    </p>
                  )}
                  {p && (
                    <p className="text-sm">
                      {p.model}: A = {formatSignificant(p.A)} {p.kUnit}, n = {formatSignificant(p.n)}, Ea = {formatSignificant(p.Ea)} kJ
                      mol⁻¹ (T0 = {formatSignificant(p.T0)} K), measured over {formatRange(p.Tmin, p.Tmax, "K")}
                    </p>
                  )}
                  {p?.citation && <p className="text-xs text-muted">{p.citation}</p>}
                  {isOwner && version.state === "draft" ? (
                    <MemberNoteForm collectionId={collectionId} versionId={m.versionId} note={m.note} label={label} />
                  ) : (
                    m.note && <p className="text-sm">Note: {m.note}</p>
                  )}
                </li>
              );
            })}
          </ol>
        )}
      </section>

      {isOwner && (
        <section aria-labelledby="owner-heading" className="card space-y-4">
          <h2 id="owner-heading" className="text-xl font-semibold">
            Your collection
          </h2>
          {version.state === "draft" ? (
            <>
              <EditCollectionForm collectionId={collectionId} title={version.title} description={version.description} />
              <p className="text-sm text-muted">
                Publishing freezes this version and gives it an identifier; a later change is a new version, and this one stays as it is.
              </p>
              <CollectionStepButton collectionId={collectionId} step="publish" />
            </>
          ) : (
            latest.state === "published" && <CollectionStepButton collectionId={collectionId} step="revise" />
          )}
          {latest.state === "draft" && latest.number !== version.number && (
            <p className="text-sm">
              <Link href={collectionVersionPath(collectionId, latest.number)}>Your draft of version {latest.number}</Link>
            </p>
          )}
        </section>
      )}

      {collection.versions.length > 1 && (
        <section aria-labelledby="versions-heading" className="space-y-2">
          <h2 id="versions-heading" className="text-xl font-semibold">
            Versions
          </h2>
          <ul className="text-sm">
            {collection.versions.map((v) => (
              <li key={v.number}>
                <Link href={collectionVersionPath(collectionId, v.number)}>Version {v.number}</Link> —{" "}
                {v.state === "draft" ? "draft" : v.versionIdentifier} ({v.memberCount} {v.memberCount === 1 ? "member" : "members"})
              </li>
            ))}
          </ul>
        </section>
      )}
    </div>
  );
}

/** The person's own draft collections, for "Add to a collection" forms (empty when signed out). */
export async function readDraftCollections(): Promise<{ signedIn: boolean; drafts: { id: number; title: string }[] }> {
  const viewer = await getCurrentUser();
  if (!viewer) return { signedIn: false, drafts: [] };
  const mine = await listMyCollections({ ownerId: viewer.id });
  return { signedIn: true, drafts: mine.filter((c) => c.state === "draft").map((c) => ({ id: c.id, title: c.title })) };
}
