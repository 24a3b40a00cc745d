import { versionPath } from "@/lib/identifiers/paths";
import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { MarkdownText } from "@/components/markdown-text";
import { ReportedExpression } from "@/components/reported-expression";
import { StateLabel } from "@/components/state-label";
import { VersionFit } from "@/components/version-fit";
import { getDatasetSummary, getLatestAnalysis, getVersionPoints, getVersionWithRole, listPublicVersions } from "@/lib/datasets/queries";
import { listVersionFiles } from "@/lib/datasets/files";
import { parseIdOrNull } from "@/lib/ids";
import { auditTrailPath } from "@/lib/audit/paths";
import { canReadAuditTrail } from "@/lib/audit/queries";
import { getCurrentUser } from "@/lib/auth/session";
import { drawableFit, FIT_CAUTION } from "@/lib/datasets/version-json";
import type { DepositDocument } from "@/lib/deposits/types";
import { METHOD_CATEGORIES } from "@/lib/deposits/vocabulary";
import { formatNumber } from "@/lib/format";

/** The version's own title in the browser tab, "Not found" when there is no such public version. */
export async function generateMetadata({ params }: { params: Promise<{ id: string; version: string }> }): Promise<Metadata> {
  const { id, version: v } = await params;
  const datasetId = parseIdOrNull(id);
  const number = parseIdOrNull(/^v(\d+)$/.exec(v)?.[1]);
  if (datasetId === null || number === null) return { title: "Not found" };
  const entry = (await listPublicVersions({ datasetId })).find((x) => x.number === number);
  const found = entry ? await getVersionWithRole({ versionId: entry.id, userId: null }) : null;
  return { title: found ? `${found.version.title} (version ${number})` : "Not found" };
}
export const dynamic = "force-dynamic";

/** The public page of one published (or retracted) version: what its version identifier resolves to. */
export default async function DatasetVersionPage({ params }: { params: Promise<{ id: string; version: string }> }) {
  const { id, version: v } = await params;
  const datasetId = parseIdOrNull(id);
  // Version numbers follow the id rule too: "v" then 1 … 2³¹−1.
  const number = parseIdOrNull(/^v(\d+)$/.exec(v)?.[1]);
  if (datasetId === null || number === null) notFound();
  const versions = await listPublicVersions({ datasetId });
  const entry = versions.find((x) => x.number === number);
  if (!entry) notFound();
  const [found, dataset, analysis, points, files, mayReadAudit] = await Promise.all([
    getVersionWithRole({ versionId: entry.id, userId: null }),
    getDatasetSummary({ datasetId }),
    getLatestAnalysis({ versionId: entry.id }),
    getVersionPoints({ versionId: entry.id }),
    listVersionFiles({ versionId: entry.id }),
    // Its members, curators and admins find the dataset's audit trail from here too.
    getCurrentUser().then((viewer) => canReadAuditTrail({ datasetId, viewer })),
  ]);
  if (!found) notFound();
  const version = found.version;
  const doc = version.payload as unknown as DepositDocument;
  const result = drawableFit(analysis?.result);

  return (
    <article className="space-y-6">
      <header className="space-y-3">
        <p className="flex flex-wrap items-center gap-3 text-sm text-muted">
          <StateLabel state={version.state} /> <span>Version {version.number}</span>
          {version.publishedAt && <span>published {version.publishedAt.toISOString().slice(0, 10)}</span>}
          {version.reactionId && <Link href={`/reactions/${version.reactionId}`}>All datasets of this reaction</Link>}
          {mayReadAudit && <Link href={auditTrailPath(datasetId)}>Audit trail</Link>}
        </p>
        <h1 className="text-3xl font-semibold">{version.title}</h1>
        <p className="text-sm">{doc.creators?.map((c) => c.name).join("; ")}</p>
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
          <dt className="text-muted">Content hash (SHA-256)</dt>
          <dd className="break-all font-mono text-xs">{version.payloadSha256}</dd>
        </dl>
      </header>

      {version.state === "retracted" && (
        <p role="note" className="rounded-md border border-error/40 bg-panel px-4 py-3 text-sm text-error">
          <span className="font-semibold">
            Retracted{version.retractedAt ? ` on ${version.retractedAt.toISOString().slice(0, 10)}` : ""}:{" "}
          </span>
          {version.retractionNotice}
        </p>
      )}

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
              {result ? <p>Shown beside the re-fitted parameters below, in the units chosen there.</p> : <ReportedExpression doc={doc} />}
            </>
          )}
          <p>
            Phase: {doc.reaction.phase}; order {doc.reaction.order}
            {doc.conditions?.bathGas ? `; bath gas ${doc.conditions.bathGas}` : ""}
            {doc.conditions?.pressure?.value !== undefined
              ? `; ${formatNumber(doc.conditions.pressure.value)} ${doc.units.pressure ?? ""}`
              : ""}
          </p>
        </div>
        <div className="card space-y-1 text-sm">
          <h2 className="text-lg font-semibold">Source</h2>
          {doc.source?.doi && <p>Publication: doi:{doc.source.doi}</p>}
          {doc.source?.reference && <p>{doc.source.reference.title}</p>}
          {doc.source?.locator && <p className="text-muted">Numbers from {doc.source.locator}</p>}
        </div>
      </section>

      {result && (
        <section className="space-y-3" aria-labelledby="fit-heading">
          <h2 id="fit-heading" className="text-2xl font-semibold">
            Re-fitted here
          </h2>
          <p className="rounded-md border border-warn/40 bg-panel px-3 py-2 text-sm text-warn">{FIT_CAUTION}</p>
          <VersionFit
            analysis={result}
            order={doc.reaction.order}
            points={points}
            reported={
              doc.reportedFit ? { reportedFit: doc.reportedFit, units: doc.units, reaction: { order: doc.reaction.order } } : undefined
            }
          />
        </section>
      )}

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

      {versions.length > 1 && (
        <section className="card space-y-2" aria-labelledby="versions-heading">
          <h2 id="versions-heading" className="text-lg font-semibold">
            Other versions
          </h2>
          <ul className="space-y-1 text-sm">
            {versions
              .filter((x) => x.number !== number)
              .map((x) => (
                <li key={x.id}>
                  <Link href={versionPath(datasetId, x.number)}>Version {x.number}</Link> — {x.state}, doi:{x.versionIdentifier}
                </li>
              ))}
          </ul>
        </section>
      )}
    </article>
  );
}
