import { versionPath } from "@/lib/identifiers/paths";
import type { Metadata } from "next";
import Link from "next/link";
import { notFound, redirect } from "next/navigation";
import { DepositEditor } from "@/components/deposit-editor/deposit-editor";
import { FilesPanel } from "@/components/deposit-editor/files-panel";
import { listPendingInvitations } from "@/lib/datasets/invitations";
import { InvitationsPanel } from "./invitations-panel";
import type { StoredCheck } from "@/components/deposit-editor/words";
import { stateWords } from "@/components/deposit-editor/words";
import { getCurrentUser } from "@/lib/auth/session";
import { can } from "@/lib/auth/permissions";
import { auditTrailPath } from "@/lib/audit/paths";
import { getVisibleVersionOrThrow } from "@/lib/datasets/deposits";
import { getLatestAnalysis, listDatasetMembers, listDecisions } from "@/lib/datasets/queries";
import { returnConversation } from "@/lib/curation/conversation";
import { listSubmissionReplies } from "@/lib/curation/queries";
import type { DepositDocument } from "@/lib/deposits/types";
import { AppError } from "@/lib/errors";
import { parseIdOrNull } from "@/lib/ids";
import type { Flag } from "@/lib/kinetics";
import { readerFlagMessage } from "@/lib/flag-words";

/** The deposit's title in the browser tab, for the people who may see it. */
export async function generateMetadata({ params }: { params: Promise<{ id: string }> }): Promise<Metadata> {
  const versionId = parseIdOrNull((await params).id);
  const user = await getCurrentUser();
  if (!user || versionId === null) return { title: user ? "Not found" : "Deposit" };
  try {
    const { version } = await getVisibleVersionOrThrow({ versionId, viewer: user });
    return { title: `Deposit: ${version.title || "untitled"}` };
  } catch {
    return { title: "Not found" };
  }
}

/** The stored checks of a version: identity, balance and magnitude, then the fit's flags. */
function storedChecks(analysis: Awaited<ReturnType<typeof getLatestAnalysis>>): StoredCheck[] {
  if (!analysis) return [];
  // Flags of older engines are shown as stored; current ones are rewritten from their quantities.
  const flags = ((analysis.result as { flags?: Flag[] } | null)?.flags ?? []).map((f) => ({
    code: f.code,
    severity: f.severity,
    message: readerFlagMessage(f),
  }));
  const checks = ((analysis.checks as StoredCheck[] | null) ?? []).map(({ code, severity, message }) => ({ code, severity, message }));
  return [...checks, ...flags];
}

export default async function DepositPage({ params }: { params: Promise<{ id: string }> }) {
  const { id } = await params;
  const versionId = parseIdOrNull(id);
  const user = await getCurrentUser();
  if (!user) redirect(`/sign-in?callbackUrl=${encodeURIComponent(`/deposits/${id}`)}`);
  if (versionId === null) notFound();

  let found;
  try {
    found = await getVisibleVersionOrThrow({ versionId, viewer: user });
  } catch (err) {
    if (err instanceof AppError && err.code === "not_found") notFound();
    throw err;
  }
  const { version, datasetRole, capabilities } = found;
  // A curator or admin who is not a member reads the record as a reviewer, not as an author.
  const curatorView = !datasetRole && can(user.role, "dataset.review");
  const [analysis, decisions, replies, members, invitations] = await Promise.all([
    getLatestAnalysis({ versionId }),
    listDecisions({ versionId }),
    listSubmissionReplies({ versionId }),
    datasetRole ? listDatasetMembers({ datasetId: version.datasetId }) : Promise.resolve([]),
    datasetRole === "owner" ? listPendingInvitations({ actor: user, versionId }) : Promise.resolve(null),
  ]);

  const decisionViews = decisions.map((d) => ({
    id: d.id,
    decision: d.decision,
    reason: d.reason,
    curator: d.curator,
    createdAt: d.createdAt.toISOString(),
  }));

  return (
    <div className="space-y-6">
      <header className="space-y-2">
        {/* Members come from their deposits; curators and admins from the review of this version. */}
        <nav aria-label="Where you are" className="flex flex-wrap gap-x-4 gap-y-1 text-sm">
          {datasetRole ? (
            <span>
              <Link href="/deposits">My deposits</Link> / v{version.number}
            </span>
          ) : curatorView ? (
            <span>
              <Link href="/review">Review queue</Link> / <Link href={`/review/${version.id}`}>Review of version {version.number}</Link>
            </span>
          ) : null}
          {(datasetRole || curatorView) && <Link href={auditTrailPath(version.datasetId)}>Audit trail</Link>}
        </nav>
        <h1 className="text-3xl font-semibold">{version.title || "Untitled deposit"}</h1>
        <p className="text-sm text-muted">
          Version {version.number}, {stateWords(version.state)}.
        </p>
      </header>
      <DepositEditor
        mode="existing"
        version={{
          id: version.id,
          number: version.number,
          state: version.state,
          versionIdentifier: version.versionIdentifier,
          retractionNotice: version.retractionNotice,
          publicPath: versionPath(version.datasetId, version.number),
        }}
        payload={(version.draftDocument ?? version.payload) as unknown as DepositDocument}
        problems={version.draftProblems ?? []}
        lockVersion={version.lockVersion}
        role={datasetRole}
        capabilities={capabilities}
        checks={storedChecks(analysis)}
        decisions={decisionViews}
        conversation={returnConversation(
          decisionViews,
          replies.map((r) => ({ ...r, createdAt: r.createdAt.toISOString() })),
        )}
        members={members.map((m) => ({ name: m.name, role: m.role }))}
      />
      <FilesPanel versionId={version.id} editable={capabilities.upload_files} />
      {invitations && (
        <InvitationsPanel
          invitations={invitations.map((i) => ({ ...i, createdAt: i.createdAt.toISOString(), expiresAt: i.expiresAt.toISOString() }))}
        />
      )}
    </div>
  );
}
