import { findingsOnly, passedCheckWords } from "@/lib/curation/check-summary";
import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { SubmissionChanges } from "@/components/submission-changes";
import { MarkdownText } from "@/components/markdown-text";
import { SeverityLabel, StateLabel } from "@/components/state-label";
import { requirePagePermission } from "@/lib/auth/page-guard";
import { findPossibleDuplicates, getPreviousVersion, listSubmissionSnapshots } from "@/lib/curation/queries";
import { stateWords } from "@/lib/curation/lifecycle";
import { diffSubmissions } from "@/lib/curation/submission-diff";
import { auditTrailPath } from "@/lib/audit/paths";
import { getVisibleVersionOrThrow } from "@/lib/datasets/deposits";
import { getLatestAnalysis, getVersionPoints, listDecisions } from "@/lib/datasets/queries";
import { drawableFit, FIT_CAUTION } from "@/lib/datasets/version-json";
import { toAnalysisInput, validateDeposit } from "@/lib/deposits";
import { AppError } from "@/lib/errors";
import { parseIdOrNull, parseIdOrThrow } from "@/lib/ids";
import { getCurrentUser } from "@/lib/auth/session";
import type { Flag } from "@/lib/kinetics";
import { readerFlagMessage } from "@/lib/flag-words";
import { DecisionForm } from "./decision-form";
import { DECISION_WORDS } from "@/components/deposit-editor/words";
import { formatRange } from "@/lib/format";
import { ReviewFit, type ReportedCanonical } from "./review-fit";

/** "Review of <title>" in the browser tab, for a reader who may see the version. */
export async function generateMetadata({ params }: { params: Promise<{ id: string }> }): Promise<Metadata> {
  const versionId = parseIdOrNull((await params).id);
  const user = await getCurrentUser();
  if (!user || versionId === null) return { title: user ? "Not found" : "Review" };
  try {
    const { version } = await getVisibleVersionOrThrow({ versionId, viewer: user });
    return { title: `Review of ${version.title || "an untitled deposit"}` };
  } catch {
    return { title: "Not found" };
  }
}

const utc = (d: Date) => `${d.toISOString().slice(0, 16).replace("T", " ")} UTC`;

type Decision = Awaited<ReturnType<typeof listDecisions>>[number];
type Snapshot = Awaited<ReturnType<typeof listSubmissionSnapshots>>[number];

interface Exchange {
  snapshotId: number;
  returned?: Decision;
  reply: string;
  repliedAt: Date;
  by: string;
}

/** Each reply with the return it answers (the newest return before it). */
function replyExchanges(decisions: Decision[], snapshots: Snapshot[]): Exchange[] {
  return snapshots
    .filter((s) => s.reply)
    .map((s) => ({
      snapshotId: s.id,
      returned: decisions.find((d) => d.decision === "return" && d.createdAt <= s.createdAt),
      reply: s.reply!,
      repliedAt: s.createdAt,
      by: s.submittedBy ?? "the owner",
    }));
}

/** Decisions and submissions of this version, newest first. */
function historyOf(decisions: Decision[], snapshots: Snapshot[]) {
  return [
    ...decisions.map((d) => ({
      key: `d${d.id}`,
      at: d.createdAt,
      what: DECISION_WORDS[d.decision] ?? d.decision,
      who: d.curator,
      text: d.reason,
    })),
    ...snapshots.map((s) => ({
      key: `s${s.id}`,
      at: s.createdAt,
      what: s.sequence === 1 ? "submitted" : `submitted again (submission ${s.sequence})`,
      who: s.submittedBy ?? "the owner",
      text: s.reply ? `Reply: ${s.reply}` : "",
    })),
  ].sort((a, b) => b.at.getTime() - a.at.getTime());
}

/** The curator's reason for the return and the authors' reply, side by side. */
function ReturnAndReply({ exchange }: { exchange: Exchange }) {
  return (
    <div className="grid gap-3 sm:grid-cols-2">
      <div className="rounded-md border border-line bg-panel px-3 py-2 text-sm">
        <h3 className="font-semibold">Reason for returning it</h3>
        {exchange.returned ? (
          <>
            <p className="text-xs text-muted">
              {exchange.returned.curator}, {utc(exchange.returned.createdAt)}
            </p>
            <p className="mt-1 whitespace-pre-line break-words">{exchange.returned.reason}</p>
          </>
        ) : (
          <p className="text-muted">Not on record.</p>
        )}
      </div>
      <div className="rounded-md border border-line bg-panel px-3 py-2 text-sm">
        <h3 className="font-semibold">The authors&apos; reply</h3>
        <p className="text-xs text-muted">
          {exchange.by}, {utc(exchange.repliedAt)}
        </p>
        <p className="mt-1 whitespace-pre-line break-words">{exchange.reply}</p>
      </div>
    </div>
  );
}

/** Findings with their severity in words; a check that passed is said plainly, never counted as a finding. */
function CheckList({ items }: { items: { code: string; severity: string; message: string }[] }) {
  const findings = findingsOnly(items);
  const passed = passedCheckWords(items).map((words) => (
    <p key={words} className="text-sm text-ok" data-testid="passed-check">
      {words}.
    </p>
  ));
  if (!findings.length)
    return (
      <>
        {passed}
        <p className="text-sm text-ok">No findings.</p>
      </>
    );
  return (
    <>
      {passed}
      <ul className="space-y-2">
        {findings.map((f, i) => (
          <li key={i} className="rounded-md border border-line bg-panel px-3 py-2 text-sm">
            <SeverityLabel severity={f.severity} /> <span className="ml-1">{f.message}</span>
          </li>
        ))}
      </ul>
    </>
  );
}

export default async function ReviewPage({ params }: { params: Promise<{ id: string }> }) {
  const { id } = await params;
  const curator = await requirePagePermission("dataset.review", `/review/${id}`);
  let found;
  try {
    found = await getVisibleVersionOrThrow({ versionId: parseIdOrThrow(id, "dataset version"), viewer: curator });
  } catch (err) {
    if (err instanceof AppError) notFound();
    throw err;
  }
  const { version, datasetRole, capabilities } = found;
  const [analysis, points, duplicates, previous, decisions, snapshots] = await Promise.all([
    getLatestAnalysis({ versionId: version.id }),
    getVersionPoints({ versionId: version.id }),
    findPossibleDuplicates({ versionId: version.id }),
    getPreviousVersion({ datasetId: version.datasetId, number: version.number }),
    listDecisions({ versionId: version.id }),
    listSubmissionSnapshots({ versionId: version.id }),
  ]);
  const schema = validateDeposit(version.payload);
  const result = drawableFit(analysis?.result);
  const flags: Flag[] = (result?.flags ?? []).map((f) => ({ ...f, message: readerFlagMessage(f) }));
  const outliers = flags.filter((f) => f.code === "outlier").flatMap((f) => f.points ?? []);
  // The authors' expression in the storage units (A: s⁻¹, cm³ molecule⁻¹ s⁻¹ … by order), J mol⁻¹ (Ea) and K, with the model they report.
  const reportedInput = schema.ok ? toAnalysisInput(schema.value).reportedFit : undefined;
  const reported: ReportedCanonical | undefined =
    schema.ok && reportedInput && schema.value.reportedFit
      ? { ...reportedInput, model: schema.value.reportedFit.model ?? "arrhenius" }
      : undefined;
  const docKUnit = schema.ok ? schema.value.units.k : "";
  const order = schema.ok ? schema.value.reaction.order : null;

  // Submissions of this version, newest first. While it waits for a curator, the newest snapshot is
  // what is under review and the one before it the last submission; once returned, the draft is
  // compared with the newest snapshot (what the authors changed so far).
  const underReview = version.state === "submitted" || version.state === "in_review";
  const [latest, earlier] = underReview ? [snapshots[0], snapshots[1]] : [undefined, snapshots[0]];
  const sinceSubmission = earlier ? diffSubmissions(earlier.payload, latest?.payload ?? version.payload) : null;
  const sinceVersion = previous ? diffSubmissions(previous.payload, version.payload) : null;
  const exchanges = replyExchanges(decisions, snapshots);
  const lastExchange = latest?.reply ? exchanges.find((e) => e.snapshotId === latest.id) : undefined;

  return (
    <div className="space-y-6">
      <nav aria-label="Review" className="flex flex-wrap gap-x-4 gap-y-1 text-sm">
        <Link href="/review">← Review queue</Link>
        <Link href={`/deposits/${version.id}`}>The full record (reaction, data table, method, source, files)</Link>
        <Link href={auditTrailPath(version.datasetId)}>Audit trail of this dataset</Link>
      </nav>
      <header className="space-y-2">
        <h1 className="text-3xl font-semibold break-words">{version.title}</h1>
        <p className="flex flex-wrap items-center gap-3 text-sm text-muted">
          <StateLabel state={version.state} /> <span>version {version.number}</span> <span>{version.pointCount} points</span>
          {version.tMin !== null && <span>{formatRange(version.tMin, version.tMax ?? version.tMin, "K")}</span>}
          {snapshots.length > 0 && <span>submission {snapshots[0].sequence} of this version</span>}
          {version.versionIdentifier && <span>identifier {version.versionIdentifier}</span>}
        </p>
      </header>

      <div className="grid gap-6 lg:grid-cols-[minmax(0,1fr)_22rem]">
        <div className="min-w-0 space-y-6">
          <section className="card space-y-3" aria-labelledby="resubmission-heading">
            <h2 id="resubmission-heading" className="text-xl font-semibold">
              {underReview ? "Changes since the last submission" : "Changes since the last submission (the draft now)"}
            </h2>
            {lastExchange && <ReturnAndReply exchange={lastExchange} />}
            {!sinceSubmission ? (
              <p className="text-sm text-muted">
                {snapshots.length <= 1
                  ? "This is the first submission of this version: nothing to compare within it."
                  : "Nothing to compare yet."}
              </p>
            ) : (
              <>
                <p className="text-sm text-muted">
                  Submission {earlier!.sequence} ({earlier!.createdAt.toISOString().slice(0, 16).replace("T", " ")} UTC) compared with{" "}
                  {latest ? `submission ${latest.sequence} (${stateWords[version.state]} now)` : "the draft as saved now"}.
                </p>
                <SubmissionChanges diff={sinceSubmission} label="Changes since the last submission" />
              </>
            )}
          </section>

          {typeof (version.payload as { description?: unknown }).description === "string" && (
            <section className="card space-y-2" aria-labelledby="about-heading">
              <h2 id="about-heading" className="text-xl font-semibold">
                What the authors say
              </h2>
              <MarkdownText text={(version.payload as { description: string }).description} />
            </section>
          )}
          <section className="card space-y-3" aria-labelledby="report-heading">
            <h2 id="report-heading" className="text-xl font-semibold">
              Check report
            </h2>
            <h3 className="font-semibold">Deposit format</h3>
            {schema.ok ? (
              <p className="text-sm text-ok">Valid against deposit format v1.</p>
            ) : (
              <CheckList items={schema.errors.map((e) => ({ code: "schema", severity: "error", message: `${e.pointer}: ${e.message}` }))} />
            )}
            <h3 className="font-semibold">Reaction and units</h3>
            <CheckList items={analysis?.checks ?? []} />
            <h3 className="font-semibold">Fit diagnostics</h3>
            <CheckList items={flags} />
          </section>

          {result && points.length > 0 && order !== null && (
            <section className="card min-w-0 space-y-3" aria-labelledby="plot-heading">
              <h2 id="plot-heading" className="text-xl font-semibold">
                Data, re-fit and the authors&apos; expression
              </h2>
              <ReviewFit result={result} points={points} outliers={outliers} order={order} initialKUnit={docKUnit} reported={reported} />
              <p className="text-xs text-muted">{FIT_CAUTION}</p>
            </section>
          )}

          <section className="card space-y-2" aria-labelledby="dup-heading">
            <h2 id="dup-heading" className="text-xl font-semibold">
              Possible duplicates
            </h2>
            {duplicates.length === 0 ? (
              <p className="text-sm text-muted">No other dataset of this reaction overlaps in temperature or cites the same source.</p>
            ) : (
              <ul className="list-disc space-y-1 pl-5 text-sm">
                {duplicates.map((d) => (
                  <li key={d.versionId}>
                    <Link href={`/review/${d.versionId}`}>{d.title}</Link> (v{d.number}, {stateWords[d.state]},{" "}
                    {formatRange(d.tMin, d.tMax, "K")}){d.sameDoi ? " — same source DOI" : ""}
                  </li>
                ))}
              </ul>
            )}
          </section>

          <section className="card space-y-2" aria-labelledby="diff-heading">
            <h2 id="diff-heading" className="text-xl font-semibold">
              {previous ? `Changes since version ${previous.number} (${stateWords[previous.state]})` : "Changes since the previous version"}
            </h2>
            {!sinceVersion ? (
              <p className="text-sm text-muted">This is the dataset&apos;s first version: there is no earlier version to compare with.</p>
            ) : (
              <SubmissionChanges diff={sinceVersion} label={`Changes since version ${previous!.number}`} />
            )}
          </section>
        </div>

        <aside className="space-y-6">
          <section className="card space-y-3" aria-labelledby="decide-heading">
            <h2 id="decide-heading" className="text-xl font-semibold">
              Decision
            </h2>
            <DecisionForm versionId={version.id} coEditing={datasetRole !== null} capabilities={capabilities} />
          </section>
          <section className="card space-y-2" aria-labelledby="history-heading">
            <h2 id="history-heading" className="text-xl font-semibold">
              Earlier decisions and replies
            </h2>
            {decisions.length === 0 && snapshots.length === 0 ? (
              <p className="text-sm text-muted">None yet.</p>
            ) : (
              <ol className="space-y-2 text-sm">
                {historyOf(decisions, snapshots).map((h) => (
                  <li key={h.key} className="rounded-md border border-line px-3 py-2">
                    <p>
                      <span className="font-medium">{h.what}</span> by {h.who}, <time dateTime={h.at.toISOString()}>{utc(h.at)}</time>
                    </p>
                    {h.text && <p className="mt-1 whitespace-pre-line break-words">{h.text}</p>}
                  </li>
                ))}
              </ol>
            )}
            <p className="text-xs">
              <Link href={auditTrailPath(version.datasetId)}>Every event of this dataset, in the audit trail</Link>
            </p>
          </section>
        </aside>
      </div>
    </div>
  );
}
