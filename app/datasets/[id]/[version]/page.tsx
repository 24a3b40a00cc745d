import { versionPath } from "@/lib/identifiers/paths";
import { getReactionCached } from "@/lib/reactions/cached";
import { StatisticGlossary } from "@/components/statistic-term";
import { reactionPath } from "@/lib/reactions/paths";
import type { Metadata } from "next";
import { NOT_FOUND_METADATA, publicPageMetadata } from "@/lib/page-metadata";
import Link from "next/link";
import { notFound } from "next/navigation";
import { MarkdownText } from "@/components/markdown-text";
import { ScrollRegion } from "@/components/scroll-region";
import { StateLabel } from "@/components/state-label";
import { VersionFit } from "@/components/version-fit";
import { datasetSummaryOf, publicVersionsOf, versionForAnyoneOf } from "@/lib/datasets/request-cache";
import { POINT_TABLE_ROWS } from "@/lib/datasets/point-table";
import { citeVersion, getPublicVersionPoints } from "@/lib/datasets/public-version";
import { unitsFromQuery } from "@/lib/unit-choice";
import { unitLabel } from "@/lib/unit-labels";
import { listVersionFiles } from "@/lib/datasets/files";
import { parseIdOrNull } from "@/lib/ids";
import { auditTrailPath } from "@/lib/audit/paths";
import { canReadAuditTrail } from "@/lib/audit/queries";
import { getCurrentUser } from "@/lib/auth/session";
import { FIT_CAUTION } from "@/lib/datasets/version-json";
import { OTHER_CONDITIONS_LABEL } from "@/lib/deposits/field-labels";
import { METHOD_CATEGORIES } from "@/lib/deposits/vocabulary";
import { formatNumber } from "@/lib/format";
import { CiteSection } from "@/components/cite/cite-section";
import { MechanismDownload } from "@/components/exports/mechanism-download";
import { DatasetJsonLd } from "@/components/cite/dataset-json-ld";
import { CreatorList } from "@/components/creator-list";
import { getVerifiedCreatorIds, listVersionCreatorPeople } from "@/lib/people/queries";
import { getPublicCitation } from "@/lib/citation/public-citation";
import { readWatchState } from "@/app/watches/watch-control";
import { WatchToggle } from "@/app/watches/watch-forms";
import { AddToCollectionForm } from "@/app/collections/collection-forms";
import { readDraftCollections } from "@/app/collections/collection-page";

/** The version's own title in the browser tab, "Not found" when there is no such public version. */
export async function generateMetadata({ params }: { params: Promise<{ id: string; version: string }> }): Promise<Metadata> {
  const { id, version: v } = await params;
  const datasetId = parseIdOrNull(id);
  const number = parseIdOrNull(/^v(\d+)$/.exec(v)?.[1]);
  if (datasetId === null || number === null) return NOT_FOUND_METADATA;
  const entry = (await publicVersionsOf(datasetId)).find((x) => x.number === number);
  const found = entry ? await versionForAnyoneOf(entry.id) : null;
  if (!found) return NOT_FOUND_METADATA;
  const shown = found.version;
  return publicPageMetadata({
    title: `${shown.title} (version ${number})`,
    description: `${shown.state === "retracted" ? "Retracted. " : ""}Rate constants of one published dataset, version ${number}${
      shown.versionIdentifier ? ` (${shown.versionIdentifier})` : ""
    }: the points, the re-fitted Arrhenius parameters and how to cite it.`,
    path: versionPath(datasetId, number),
    type: "article",
  });
}
export const dynamic = "force-dynamic";

const day = (d: Date | null) => (d ? d.toISOString().slice(0, 10) : "—");

/** The public page of one published (or retracted) version: what its version identifier resolves to. */
export default async function DatasetVersionPage({
  params,
  searchParams,
}: {
  params: Promise<{ id: string; version: string }>;
  searchParams: Promise<Record<string, string | string[] | undefined>>;
}) {
  const { id, version: v } = await params;
  const datasetId = parseIdOrNull(id);
  // Version numbers follow the id rule too: "v" then 1 … 2³¹−1.
  const number = parseIdOrNull(/^v(\d+)$/.exec(v)?.[1]);
  if (datasetId === null || number === null) notFound();
  // Only published and retracted versions are listed: any other is not found, whoever asks.
  const versions = await publicVersionsOf(datasetId);
  const entry = versions.find((x) => x.number === number);
  if (!entry) notFound();
  const [loaded, dataset, files, query, mayReadAudit, citation, verifiedIds, creatorPeople] = await Promise.all([
    getPublicVersionPoints({ versionId: entry.id }),
    datasetSummaryOf(datasetId),
    listVersionFiles({ versionId: entry.id }),
    searchParams,
    // Its members, curators and admins find the dataset's audit trail from here too.
    getCurrentUser().then((viewer) => canReadAuditTrail({ datasetId, viewer })),
    getPublicCitation({ datasetId, versionNumber: number }),
    getVerifiedCreatorIds({ versionIds: [entry.id] }).then((m) => m.get(entry.id) ?? new Map<number, string>()),
    listVersionCreatorPeople({ versionId: entry.id }),
  ]);
  if (!loaded || !citation) notFound();
  const [watch, collecting] = await Promise.all([readWatchState({ kind: "dataset", id: datasetId }), readDraftCollections()]);
  const { version, doc, analysis: result, rows } = loaded;
  // Linked by its key (the numeric id is only an alias that redirects there).
  const reaction = version.reactionId ? await getReactionCached({ id: version.reactionId }) : null;
  const units = unitsFromQuery(doc.reaction.order, query);
  // publicVersionsOf is newest first.
  const newest = versions[0];
  const newer = newest.number > version.number ? newest : null;
  const downloads = {
    csv: `/api/v1/versions/${version.id}/points.csv`,
    csvBom: `/api/v1/versions/${version.id}/points.csv?bom=1`,
    json: `/api/v1/versions/${version.id}/points.json`,
    export: `/api/v1/datasets/${datasetId}/versions/${number}/export.json`,
    parameters: `/api/v1/datasets/${datasetId}/versions/${number}/parameters`,
  };

  return (
    <article className="space-y-6">
      <DatasetJsonLd version={version} doc={doc} seriesIdentifier={dataset?.seriesIdentifier ?? null} verifiedCreatorIds={verifiedIds} />
      {version.state === "retracted" && (
        <section
          aria-labelledby="retraction-heading"
          className="space-y-2 rounded-lg border-2 border-error bg-panel px-5 py-4"
          data-testid="retraction-notice"
        >
          <h2 id="retraction-heading" className="text-xl font-semibold text-error">
            This version was retracted{version.retractedAt ? ` on ${day(version.retractedAt)}` : ""}
          </h2>
          <p>{version.retractionNotice}</p>
          <p className="text-sm text-muted">
            It stays readable so that citations of it still lead here; read the notice before using its numbers.
          </p>
        </section>
      )}
      {newer && (
        <p role="note" className="rounded-md border border-warn/50 bg-panel px-4 py-3 text-sm" data-testid="newer-version">
          <span className="font-semibold text-warn">A newer version exists: </span>
          <Link href={versionPath(datasetId, newer.number)}>
            version {newer.number}
            {newer.publishedAt ? `, published ${day(newer.publishedAt)}` : ""}
          </Link>
          {newer.state === "retracted" ? " (since retracted)" : ""}. This page shows version {version.number}, as cited.
        </p>
      )}
      <header className="space-y-3">
        <p className="flex flex-wrap items-center gap-3 text-sm text-muted">
          <StateLabel state={version.state} /> <span>Version {version.number}</span>
          {version.publishedAt && <span>published {day(version.publishedAt)}</span>}
          {reaction && <Link href={reactionPath(reaction.key)}>All datasets of this reaction</Link>}
          {mayReadAudit && <Link href={auditTrailPath(datasetId)}>Audit trail</Link>}
        </p>
        <h1 className="text-3xl font-semibold">{version.title}</h1>
        <CreatorList creators={doc.creators ?? []} people={creatorPeople} />
        <dl className="grid grid-cols-[auto_1fr] gap-x-4 gap-y-1 text-sm">
          <dt className="text-muted">This version</dt>
          <dd className="font-mono">doi:{version.versionIdentifier}</dd>
          {dataset?.seriesIdentifier && (
            <>
              <dt className="text-muted">The dataset (newest version)</dt>
              <dd className="font-mono">doi:{dataset.seriesIdentifier}</dd>
            </>
          )}
          <dt className="text-muted">Licence</dt>
          <dd>{doc.license}</dd>
          <dt className="text-muted">Cite as</dt>
          <dd data-testid="citation">{citeVersion(version)}</dd>
          <dt className="text-muted">Content hash (SHA-256)</dt>
          <dd className="break-all font-mono text-xs">{version.payloadSha256}</dd>
        </dl>
        <WatchToggle
          subject={{ kind: "dataset", id: datasetId }}
          what="this dataset"
          backPath={versionPath(datasetId, number)}
          {...watch}
        />
        {collecting.signedIn && version.state === "published" && (
          <AddToCollectionForm versionIds={[version.id]} drafts={collecting.drafts} what="this version" />
        )}
      </header>

      {doc.description && (
        <section className="card" aria-label="Description">
          <MarkdownText text={doc.description} />
        </section>
      )}

      <section className="grid gap-6 md:grid-cols-2" aria-label="How the data were obtained">
        <div className="card space-y-1 text-sm">
          <h2 className="text-lg font-semibold">Method</h2>
          <p>
            {METHOD_CATEGORIES.find((c) => c.id === doc.method?.category)?.label ?? doc.method?.category}: {doc.method?.technique}
            {doc.method?.detection ? `; detection: ${doc.method.detection}` : ""}
          </p>
          {doc.method?.notes && <p className="text-muted">{doc.method.notes}</p>}
          {doc.reportedFit && (
            <>
              <h3 className="pt-2 font-semibold">Expression the authors report</h3>
              <p>Shown below, in the units chosen there{result ? ", beside the re-fitted parameters" : ""}.</p>
            </>
          )}
          <p>
            Phase: {doc.reaction.phase}; order {doc.reaction.order}
            {doc.conditions?.bathGas ? `; bath gas ${doc.conditions.bathGas}` : ""}
            {doc.conditions?.pressure?.value !== undefined
              ? `; ${formatNumber(doc.conditions.pressure.value)} ${unitLabel("pressure", doc.units.pressure)}`
              : ""}
          </p>
          {doc.conditions?.notes && (
            <p>
              {OTHER_CONDITIONS_LABEL}: <span className="whitespace-pre-line">{doc.conditions.notes}</span>
            </p>
          )}
        </div>
        <div className="card space-y-1 text-sm">
          <h2 className="text-lg font-semibold">Source</h2>
          {doc.source?.doi && <p>Publication: doi:{doc.source.doi}</p>}
          {doc.source?.reference && <p>{doc.source.reference.title}</p>}
          {doc.source?.locator && <p className="text-muted">Numbers from {doc.source.locator}</p>}
        </div>
      </section>

      <section className="space-y-3" aria-labelledby="fit-heading">
        <h2 id="fit-heading" className="text-2xl font-semibold">
          {result ? "The data, re-fitted here" : "The data"}
        </h2>
        {result && <p className="rounded-md border border-warn/40 bg-panel px-3 py-2 text-sm text-warn">{FIT_CAUTION}</p>}
        <VersionFit
          analysis={result}
          order={doc.reaction.order}
          points={rows.map((r) => ({ T: r.T, k: r.k, sigmaLnK: r.sigmaLnK }))}
          rows={rows.slice(0, POINT_TABLE_ROWS)}
          totalRows={rows.length}
          initialKUnit={units.kUnit}
          initialEnergyUnit={units.energyUnit}
          downloadsHref="#downloads-heading"
          reported={
            doc.reportedFit ? { reportedFit: doc.reportedFit, units: doc.units, reaction: { order: doc.reaction.order } } : undefined
          }
        />
        {result && (
          <StatisticGlossary
            className="card"
            ids={["refit", "band", "standardError", "r2", "dof", "residualSD", "scatterRatio", "sigmaLnK", "residual", "residualInSigma"]}
          />
        )}
      </section>

      <section className="card space-y-2" aria-labelledby="downloads-heading">
        <h2 id="downloads-heading" className="text-lg font-semibold">
          Download the points
        </h2>
        <p className="text-sm">
          Every point as deposited and converted to K, {unitLabel("rateConstant", loaded.about.canonicalUnits.k)} and Pa (T, k and
          pressure), with its uncertainty, residual and findings, under a header with the identifier, licence, citation and the caution
          above.
        </p>
        <ul className="flex flex-wrap gap-3 text-sm">
          <li>
            <a className="btn-secondary" href={downloads.csv} download>
              Points as CSV
            </a>
          </li>
          <li>
            <a className="btn-secondary" href={downloads.csvBom} download>
              CSV for spreadsheet programs (UTF-8 with a byte order mark)
            </a>
          </li>
          <li>
            <a className="btn-secondary" href={downloads.json} download>
              Points as JSON
            </a>
          </li>
          <li>
            <a className="btn-secondary" href={downloads.export} download>
              Deposit with its re-fits and flags (JSON)
            </a>
          </li>
        </ul>
      </section>

      {result && (
        <section className="card space-y-2" aria-labelledby="mechanism-heading">
          <h2 id="mechanism-heading" className="text-lg font-semibold">
            Parameters for a mechanism
          </h2>
          <p className="text-sm">
            A, n and Ea of the re-fits in the units you choose, with T0, the measured temperature range, the reaction, the identifier and
            the caution: as a plain table, or as a YAML block that Cantera reads for an elementary reaction (A divided by T0
            <sup>n</sup>, since Cantera writes T<sup>n</sup> without T0).
          </p>
          <MechanismDownload
            endpoint={downloads.parameters}
            order={doc.reaction.order}
            initialKUnit={units.kUnit}
            initialEnergyUnit={units.energyUnit}
            fits={result.modifiedArrhenius ? ["arrhenius", "modified_arrhenius"] : ["arrhenius"]}
          />
        </section>
      )}

      <CiteSection citation={citation} />

      {files.length > 0 && (
        <section className="card space-y-2" aria-labelledby="files-heading">
          <h2 id="files-heading" className="text-lg font-semibold">
            Supplementary files
          </h2>
          <ul className="space-y-1 text-sm">
            {files.map((f) => (
              <li key={f.id}>
                <a href={`/api/v1/files/${f.id}`}>{f.filename}</a>{" "}
                <span className="break-all font-mono text-xs text-muted">sha256 {f.sha256}</span>
              </li>
            ))}
          </ul>
        </section>
      )}

      <section className="card space-y-2" aria-labelledby="versions-heading">
        <h2 id="versions-heading" className="text-lg font-semibold">
          Versions
        </h2>
        <ScrollRegion label="Versions (scrollable table)">
          <table className="table [&_td]:whitespace-nowrap">
            <thead>
              <tr>
                <th scope="col">Version</th>
                <th scope="col">Published</th>
                <th scope="col">Identifier</th>
                <th scope="col">State</th>
              </tr>
            </thead>
            <tbody>
              {versions.map((x) => (
                <tr key={x.id} aria-current={x.number === number ? "page" : undefined}>
                  <td>
                    {x.number === number ? (
                      <span className="font-semibold">Version {x.number} (this page)</span>
                    ) : (
                      <Link href={versionPath(datasetId, x.number)}>Version {x.number}</Link>
                    )}
                  </td>
                  <td>{day(x.publishedAt)}</td>
                  <td className="font-mono text-xs">doi:{x.versionIdentifier}</td>
                  <td>
                    <StateLabel state={x.state} />
                    {x.retractedAt ? <span className="text-xs text-muted"> {day(x.retractedAt)}</span> : null}
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        </ScrollRegion>
      </section>
    </article>
  );
}
