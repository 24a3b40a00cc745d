"use client";

import { useRouter } from "next/navigation";
import { useState, useTransition } from "react";
import { transitionAction } from "@/app/deposits/actions";
import type { VersionCapabilities } from "@/lib/curation/capabilities";
import type { Transition } from "@/lib/curation/lifecycle";
import { stateWords } from "@/components/deposit-editor/words";

const decisions: { value: Transition; label: string; hint: string }[] = [
  { value: "accept", label: "Accept and publish", hint: "The version is frozen and gets its identifier." },
  { value: "return", label: "Return to the authors", hint: "The authors get your reason and can resubmit." },
  { value: "decline", label: "Decline", hint: "The version will not be published." },
];

const doneWords: Record<string, string> = {
  in_review: "Done: the version is now in review.",
  returned: "Done: the version is returned to the authors for revision.",
  published: "Done: the version is published.",
  declined: "Done: the version is declined.",
  retracted: "Done: the version is retracted.",
};

/** Start the review, or record a decision with its reason; or retract a published version. */
export function DecisionForm({
  versionId,
  coEditing,
  capabilities,
}: {
  versionId: number;
  coEditing: boolean;
  capabilities: VersionCapabilities;
}) {
  const router = useRouter();
  const [pending, start] = useTransition();
  const [message, setMessage] = useState<{ ok: boolean; text: string } | null>(null);
  // No decision is preselected: publishing cannot be undone.
  const [choice, setChoice] = useState<Transition | null>(null);
  const [reason, setReason] = useState("");

  function run(t: Transition, why?: string) {
    start(async () => {
      const r = await transitionAction(versionId, t, why);
      if (r.ok) {
        setMessage({ ok: true, text: doneWords[r.state] ?? `Done: the version is now ${stateWords(r.state)}.` });
        setReason("");
        router.refresh();
      } else setMessage({ ok: false, text: r.message });
    });
  }

  if (coEditing) return <p className="text-sm text-muted">You co-edit this dataset, so another curator must review it.</p>;
  const feedback = message && (
    <p role={message.ok ? "status" : "alert"} className={`text-sm ${message.ok ? "text-ok" : "text-error"}`}>
      {message.text}
    </p>
  );

  if (capabilities.retract) {
    return (
      <form
        className="space-y-3"
        onSubmit={(e) => {
          e.preventDefault();
          run("retract", reason);
        }}
      >
        {feedback}
        <label htmlFor="retract-notice" className="block text-sm font-medium">
          Retraction notice (shown publicly with the version)
        </label>
        <textarea
          id="retract-notice"
          value={reason}
          onChange={(e) => setReason(e.target.value)}
          rows={3}
          className="field-input"
          required
          minLength={3}
        />
        <button type="submit" className="btn-danger" disabled={pending}>
          Retract this version
        </button>
      </form>
    );
  }
  // After "return to the authors" or "decline" the form has nothing left to offer, but the curator still needs the outcome.
  if (!capabilities.accept) {
    return (
      <div className="space-y-2">
        {feedback}
        <p className="text-sm text-muted">Nothing to decide in this state.</p>
      </div>
    );
  }
  return (
    <div className="space-y-4">
      {feedback}
      {capabilities.start_review && (
        <button type="button" className="btn-secondary" disabled={pending} onClick={() => run("start_review")}>
          Take into review
        </button>
      )}
      <form
        className="space-y-3"
        onSubmit={(e) => {
          e.preventDefault();
          if (choice) run(choice, reason);
        }}
      >
        <fieldset className="space-y-2">
          <legend className="text-sm font-medium">Decision</legend>
          {decisions.map((d) => (
            <label key={d.value} className="flex items-start gap-2 text-sm">
              <input
                type="radio"
                name="decision"
                value={d.value}
                checked={choice === d.value}
                onChange={() => setChoice(d.value)}
                className="mt-1"
                required
              />
              <span>
                <span className="font-medium">{d.label}</span> <span className="text-muted">— {d.hint}</span>
              </span>
            </label>
          ))}
        </fieldset>
        <label htmlFor="decision-reason" className="block text-sm font-medium">
          Reason, also when accepting (sent to the authors and kept on the record)
          <span className="font-normal text-muted"> (required, at least 3 characters)</span>
        </label>
        <textarea
          id="decision-reason"
          value={reason}
          onChange={(e) => setReason(e.target.value)}
          rows={4}
          className="field-input"
          required
          minLength={3}
        />
        <button type="submit" className="btn-primary" disabled={pending}>
          {pending ? "Recording…" : "Record the decision"}
        </button>
      </form>
    </div>
  );
}
