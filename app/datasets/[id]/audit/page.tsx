import type { Metadata } from "next";
import Link from "next/link";
import { notFound, redirect } from "next/navigation";
import { ScrollRegion } from "@/components/scroll-region";
import { getDatasetAuditTrailOrThrow, type AuditEntry } from "@/lib/audit/queries";
import { getCurrentUser } from "@/lib/auth/session";
import { AppError } from "@/lib/errors";
import { parseIdOrNull } from "@/lib/ids";

export const metadata: Metadata = { title: "Audit trail" };

/** Our words for each audited action on a dataset. */
const ACTION_WORDS: Record<string, string> = {
  "dataset.created": "created the dataset",
  "dataset.draft_saved": "saved the draft",
  "dataset.version_started": "started a new version",
  "dataset.submit": "submitted it for review",
  "dataset.withdraw": "withdrew it from review",
  "dataset.start_review": "took it into review",
  "dataset.return": "returned it to the authors",
  "dataset.accept": "accepted and published it",
  "dataset.decline": "declined it",
  "dataset.retract": "retracted it",
  "dataset.file_added": "added a file",
  "dataset.file_removed": "removed a file",
  "dataset.member_added": "added a co-editor",
  "dataset.invited": "sent an invitation",
  "dataset.invitation_revoked": "revoked an invitation",
  "dataset.invitation_accepted": "accepted an invitation",
  "consensus.excluded": "left it out of the reaction's consensus",
  "consensus.exclusion_changed": "changed why it is left out of the reaction's consensus",
  "consensus.included": "counted it in the reaction's consensus again",
};

/** What of an event's details a reader needs: reasons, replies, names and roles, file names. */
function detailWords(d: Record<string, unknown>): string[] {
  const out: string[] = [];
  const str = (k: string) => (typeof d[k] === "string" ? (d[k] as string) : null);
  if (str("reason")) out.push(`Reason: ${str("reason")}`);
  if (str("reply")) out.push(`Reply to the curator: ${str("reply")}`);
  if (str("email")) out.push(`To ${str("email")}${str("role") ? ` as ${str("role")}` : ""}`);
  else if (str("role")) out.push(`Role: ${str("role")}`);
  if (str("filename")) out.push(`File: ${str("filename")}`);
  const ids = d.identifiers as { version?: string } | undefined;
  if (ids?.version) out.push(`Identifier: ${ids.version}`);
  return out;
}

/** Consecutive saves of the draft by one person read as one line with a count. */
function collapseSaves(entries: AuditEntry[]) {
  const out: (AuditEntry & { times: number })[] = [];
  for (const e of entries) {
    const last = out[out.length - 1];
    if (
      last &&
      e.action === "dataset.draft_saved" &&
      last.action === e.action &&
      last.actor === e.actor &&
      last.versionNumber === e.versionNumber
    )
      last.times++;
    else out.push({ ...e, times: 1 });
  }
  return out;
}

// /datasets/:id/audit — who did what to a dataset and when, with reasons (members, curators, admins)
export default async function DatasetAuditPage({ params }: { params: Promise<{ id: string }> }) {
  const { id } = await params;
  const user = await getCurrentUser();
  if (!user) redirect(`/sign-in?callbackUrl=${encodeURIComponent(`/datasets/${id}/audit`)}`);
  const datasetId = parseIdOrNull(id);
  if (datasetId === null) notFound();
  let trail;
  try {
    trail = await getDatasetAuditTrailOrThrow({ datasetId, viewer: user });
  } catch (err) {
    if (err instanceof AppError && err.code === "not_found") notFound();
    throw err;
  }
  const rows = collapseSaves(trail.entries);
  return (
    <div className="space-y-4">
      {trail.latestVersionId && (
        <p className="text-sm">
          <Link href={`/deposits/${trail.latestVersionId}`}>← {trail.title || "The dataset"}</Link>
        </p>
      )}
      <h1 className="text-3xl font-semibold break-words">Audit trail: {trail.title || "untitled dataset"}</h1>
      <p className="text-sm text-muted">
        Every change to this dataset and its versions, newest first, as written when it happened. It cannot be edited. Times in UTC.
      </p>
      {rows.length === 0 ? (
        <p className="text-sm text-muted">Nothing recorded yet.</p>
      ) : (
        <ScrollRegion label="Audit trail">
          <table className="table text-sm">
            <thead>
              <tr>
                <th scope="col">When</th>
                <th scope="col">Who</th>
                <th scope="col">What</th>
                <th scope="col">Version</th>
                <th scope="col">Details</th>
              </tr>
            </thead>
            <tbody>
              {rows.map((r) => (
                <tr key={r.id}>
                  <td className="whitespace-nowrap">
                    <time dateTime={r.at.toISOString()}>{r.at.toISOString().slice(0, 16).replace("T", " ")}</time>
                  </td>
                  <td>{r.actor ?? "a removed account"}</td>
                  <td>
                    {ACTION_WORDS[r.action] ?? r.action}
                    {r.times > 1 ? ` (${r.times} times)` : ""}
                  </td>
                  <td>{r.versionNumber !== null ? `v${r.versionNumber}` : "—"}</td>
                  <td className="max-w-md break-words">
                    {detailWords(r.details).map((w, i) => (
                      <p key={i} className="whitespace-pre-line">
                        {w}
                      </p>
                    ))}
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        </ScrollRegion>
      )}
      {trail.more && <p className="text-sm text-muted">Only the newest {trail.entries.length} events are shown.</p>}
    </div>
  );
}
