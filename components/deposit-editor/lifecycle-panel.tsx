"use client";

import { findingsOnly } from "@/lib/curation/check-summary";
import { useRouter } from "next/navigation";
import { useState, useTransition } from "react";
import { startNextVersionAction, transitionAction } from "@/app/deposits/actions";
import { CAUTION } from "@/lib/analyses/analyse-request";
import { REPLY_MAX, REPLY_MIN, type VersionCapabilities } from "@/lib/curation/capabilities";
import type { ConversationEntry } from "@/lib/curation/conversation";
import type { CoEditorRole, Transition } from "@/lib/curation/lifecycle";
import { CheckList } from "./check-list";
import { InviteForm } from "./invite-form";
import { blockingChecks, DECISION_WORDS, ROLE_WORDS, stateWords, type StoredCheck } from "./words";

export interface DecisionView {
  id: number;
  decision: string;
  reason: string;
  curator: string;
  /** ISO 8601. */
  createdAt: string;
}

export interface MemberView {
  name: string;
  role: CoEditorRole;
}

export interface VersionView {
  id: number;
  number: number;
  state: string;
  versionIdentifier: string | null;
  retractionNotice: string | null;
  /** Where the public page of a published version lives (/datasets/:id/v:n). */
  publicPath?: string;
}

interface Props {
  version: VersionView;
  role: CoEditorRole | null;
  capabilities: VersionCapabilities;
  checks: StoredCheck[];
  decisions: DecisionView[];
  /** Returns and replies so far, oldest first: read beside the reply being written. */
  conversation?: ConversationEntry[];
  members: MemberView[];
  /** Unsaved edits: submitting sends the saved draft, so they must be saved first. */
  dirty: boolean;
  /** Problems that keep the saved draft from being submitted (listed under "Not ready to submit"). */
  notReady: number;
}

const STATE_EXPLAINED: Record<string, string> = {
  draft: "Only you and your co-editors can see it. Submit it when it is ready for a curator.",
  submitted: "Waiting for a curator. You can withdraw it to make more changes.",
  in_review: "A curator is reviewing it. You can withdraw it to make more changes.",
  returned: "A curator returned this version for revision (see the reason below). Edit the draft, save, and submit it again.",
  published: "Public and citable. It can no longer be changed; a correction becomes a new version.",
  declined: "A curator declined it; the reason is below.",
  retracted: "Withdrawn from use by a curator; the notice below says why. It stays readable.",
};

/** The same states as a reader who is not an author (a curator, an admin) sees them. */
const STATE_FOR_READERS: Record<string, string> = {
  draft: "A draft: its authors are still working on it.",
  submitted: "Submitted and waiting for a curator.",
  in_review: "Taken into review by a curator.",
  returned: "Returned to the authors for revision; the reason is below.",
  published: STATE_EXPLAINED.published,
  declined: "Declined; the reason is below.",
  retracted: STATE_EXPLAINED.retracted,
};

function utc(iso: string): string {
  return `${iso.slice(0, 16).replace("T", " ")} UTC`;
}

/** The returns and replies so far, read-only, oldest first. */
function Conversation({ entries }: { entries: ConversationEntry[] }) {
  return (
    <section aria-labelledby="conversation-heading" className="min-w-0 space-y-2 text-sm">
      <h3 id="conversation-heading" className="font-medium">
        The conversation so far
      </h3>
      <ol className="space-y-2">
        {entries.map((e, i) => (
          <li key={i} className={`rounded-md border px-3 py-2 ${e.kind === "return" ? "border-line bg-panel" : "border-line bg-paper"}`}>
            <p className="text-xs text-muted">
              <span className="font-semibold text-ink">{e.kind === "return" ? "Returned" : "Your reply"}</span>{" "}
              {e.kind === "return" ? "by" : "sent by"} {e.who}, <time dateTime={e.at}>{utc(e.at)}</time>
            </p>
            <p className="mt-1 whitespace-pre-line break-words">{e.text}</p>
          </li>
        ))}
      </ol>
    </section>
  );
}

/** Where the version is in its lifecycle, what the owner can do next, and what curators said. */
export function LifecyclePanel({ version, role, capabilities, checks, decisions, conversation = [], members, dirty, notReady }: Props) {
  const router = useRouter();
  const [pending, startTransition] = useTransition();
  const [outcome, setOutcome] = useState<{ ok: boolean; message: string } | null>(null);
  // After a return, the owner answers the curator with the resubmission (required, lib/curation/capabilities.ts).
  const [reply, setReply] = useState("");
  const answersReturn = version.state === "returned" && capabilities.submit;
  const blocking = blockingChecks(checks);
  const canSubmit = capabilities.submit;
  const canWithdraw = capabilities.withdraw;
  const submitBlocked = blocking.length > 0 || dirty || notReady > 0;

  function run(transition: Transition, done: string) {
    setOutcome(null);
    startTransition(async () => {
      try {
        const result = await transitionAction(
          version.id,
          transition,
          undefined,
          transition === "submit" && answersReturn ? reply : undefined,
        );
        if (result.ok) {
          setOutcome({ ok: true, message: done });
          setReply("");
          router.refresh();
        } else {
          setOutcome({ ok: false, message: result.message });
        }
      } catch {
        setOutcome({ ok: false, message: "The server could not be reached; nothing changed. Try again." });
      }
    });
  }

  function startNext() {
    setOutcome(null);
    startTransition(async () => {
      const result = await startNextVersionAction(version.id);
      if (result.ok) router.push(`/deposits/${result.versionId}`);
      else setOutcome({ ok: false, message: result.message });
    });
  }

  return (
    <section aria-labelledby="lifecycle-heading" className="card space-y-4">
      <div className="flex flex-wrap items-baseline justify-between gap-2">
        <h2 id="lifecycle-heading" className="font-serif text-xl font-semibold">
          Version {version.number}: {stateWords(version.state)}
        </h2>
        {role && <p className="text-sm text-muted">Your role: {ROLE_WORDS[role]}</p>}
      </div>
      <p className="text-sm">{(role ? STATE_EXPLAINED : STATE_FOR_READERS)[version.state] ?? ""}</p>

      {version.state === "published" && version.versionIdentifier && (
        <div className="space-y-2">
          <p className="text-sm">
            Version identifier: <code className="rounded-sm bg-paper px-1.5 py-0.5">{version.versionIdentifier}</code>
            {version.publicPath && (
              <>
                {" "}
                — <a href={version.publicPath}>open the public page</a>
              </>
            )}
          </p>
          <p className="rounded-md border border-warn/40 bg-panel px-3 py-2 text-sm text-warn">{CAUTION}</p>
        </div>
      )}
      {version.state === "retracted" && version.retractionNotice && (
        <p className="rounded-md border border-error/40 bg-panel px-3 py-2 text-sm text-error">
          <span className="font-semibold">Retraction notice: </span>
          {version.retractionNotice}
        </p>
      )}

      {capabilities.start_next_version && (
        <div className="space-y-1">
          <button type="button" className="btn-secondary" disabled={pending} onClick={startNext}>
            {pending ? "Working…" : "Start a new version"}
          </button>
          <p className="text-xs text-muted">The new version begins as a draft copy of this one; this version stays as it is.</p>
        </div>
      )}
      {(canSubmit || canWithdraw) && (
        <div className="space-y-2">
          {answersReturn && (
            <div className={conversation.length > 0 ? "grid gap-4 md:grid-cols-2" : undefined}>
              <label className="block space-y-1 text-sm">
                <span className="block font-medium">Your reply to the curator (required)</span>
                <span className="block text-xs text-muted">
                  What you changed in answer to the reason below; the curator reads it beside that reason. Up to {REPLY_MAX} characters.
                </span>
                <textarea
                  name="reply"
                  className="field-input w-full"
                  rows={3}
                  maxLength={REPLY_MAX}
                  value={reply}
                  onChange={(e) => setReply(e.target.value)}
                />
              </label>
              {conversation.length > 0 && <Conversation entries={conversation} />}
            </div>
          )}
          <div className="flex flex-wrap gap-3">
            {canSubmit && (
              <button
                type="button"
                className="btn-primary"
                disabled={pending || submitBlocked || (answersReturn && reply.trim().length < REPLY_MIN)}
                aria-describedby={submitBlocked ? "submit-blocked" : undefined}
                onClick={() => run("submit", "Submitted. A curator has been told.")}
              >
                {pending ? "Working…" : "Submit for review"}
              </button>
            )}
            {canWithdraw && (
              <button
                type="button"
                className="btn-secondary"
                disabled={pending}
                onClick={() => run("withdraw", "Withdrawn. It is a draft again.")}
              >
                {pending ? "Working…" : "Withdraw"}
              </button>
            )}
          </div>
          {canSubmit && submitBlocked && (
            <div id="submit-blocked" className="space-y-2 text-sm">
              {dirty && <p>Save your changes first: submitting sends the saved draft.</p>}
              {notReady > 0 && (
                <p>
                  The draft is not ready to submit: <a href="#readiness">{notReady === 1 ? "1 problem" : `${notReady} problems`}</a> to
                  correct first.
                </p>
              )}
              {blocking.length > 0 && (
                <>
                  <p>Submitting needs these checks of the last save resolved:</p>
                  <CheckList checks={blocking} />
                </>
              )}
            </div>
          )}
        </div>
      )}
      {capabilities.edit && !capabilities.submit && <p className="text-sm text-muted">The owner of the dataset submits it for review.</p>}
      {outcome && (
        <p
          role={outcome.ok ? "status" : "alert"}
          className={`rounded-md border bg-panel px-3 py-2 text-sm ${outcome.ok ? "border-ok/40 text-ok" : "border-error/40 text-error"}`}
        >
          {outcome.message}
        </p>
      )}

      {/* After a resubmission the authors keep seeing what they answered, beside what they were asked. */}
      {!answersReturn && conversation.some((e) => e.kind === "reply") && <Conversation entries={conversation} />}

      <div className="space-y-2">
        <h3 className="text-base font-semibold">Decisions</h3>
        {decisions.length === 0 ? (
          <p className="text-sm text-muted">No curator has decided on this version yet.</p>
        ) : (
          <ol className="space-y-2">
            {decisions.map((d) => (
              <li key={d.id} className="rounded-md border border-line px-3 py-2 text-sm">
                <p>
                  <span className="font-semibold">{DECISION_WORDS[d.decision] ?? d.decision}</span> by {d.curator},{" "}
                  <time dateTime={d.createdAt}>{utc(d.createdAt)}</time>
                </p>
                <p className="mt-1 whitespace-pre-line">{d.reason}</p>
              </li>
            ))}
          </ol>
        )}
      </div>

      <div className="space-y-2">
        <h3 id="checks-of-last-save" className="scroll-mt-20 text-base font-semibold">
          Checks of the last save
        </h3>
        {findingsOnly(checks).length === 0 && <p className="text-sm text-muted">No findings.</p>}
        <CheckList checks={checks} />
      </div>

      {(members.length > 0 || capabilities.invite) && (
        <div className="space-y-2">
          <h3 className="text-base font-semibold">Co-editors</h3>
          <ul className="text-sm">
            {members.map((m, i) => (
              <li key={i}>
                {m.name} <span className="text-muted">({ROLE_WORDS[m.role]})</span>
              </li>
            ))}
          </ul>
          {capabilities.invite && <InviteForm versionId={version.id} />}
        </div>
      )}
    </section>
  );
}
