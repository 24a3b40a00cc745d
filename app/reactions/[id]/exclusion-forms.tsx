"use client";

import { useActionState } from "react";
import { SubmitButton } from "@/components/form-status";
import { idleState, type ActionState } from "@/lib/auth/action-state";
import { EXCLUSION_REASON_MAX, EXCLUSION_REASON_MIN } from "@/lib/reactions/schemas";
import { excludeFromConsensusAction, includeInConsensusAction } from "./actions";

function Outcome({ state }: { state: ActionState }) {
  if (state.status === "idle" || !state.message) return null;
  return (
    <p role={state.status === "error" ? "alert" : "status"} className={`text-sm ${state.status === "error" ? "text-error" : "text-ok"}`}>
      {state.message}
    </p>
  );
}

/**
 * A curator leaves one version out of the consensus with a reason, changes the reason, or includes
 * it again. One component per version keeps its message when the page refreshes after the action;
 * the forms post without JavaScript too.
 */
export function ExclusionControls({ versionId, title, currentReason }: { versionId: number; title: string; currentReason: string | null }) {
  const [excludeState, exclude] = useActionState(excludeFromConsensusAction, idleState);
  const [includeState, include] = useActionState(includeInConsensusAction, idleState);
  const fieldId = `exclude-reason-${versionId}`;
  const error = excludeState.fieldErrors?.reason;
  return (
    <div className="space-y-2 text-sm">
      {currentReason !== null && (
        // Two steps, as leaving out is: open, read what will change, confirm.
        <details open={includeState.status === "error" || undefined}>
          <summary className="cursor-pointer text-link">
            Include again<span className="sr-only"> {title}</span>
          </summary>
          <form action={include} className="mt-2 space-y-2">
            <input type="hidden" name="versionId" value={versionId} />
            <p>
              {title} will count in the consensus again, and readers will no longer see the reason “{currentReason}”. The change is audited.
            </p>
            <SubmitButton className="btn-secondary py-1">
              Yes, include it again<span className="sr-only"> ({title})</span>
            </SubmitButton>
          </form>
        </details>
      )}
      <Outcome state={includeState} />
      <details open={excludeState.status === "error" || undefined}>
        <summary className="cursor-pointer text-link">
          {currentReason !== null ? "Change the reason" : "Leave out of the consensus"}
          <span className="sr-only"> for {title}</span>
        </summary>
        <form action={exclude} className="mt-2 space-y-2">
          <input type="hidden" name="versionId" value={versionId} />
          <label htmlFor={fieldId} className="block font-medium">
            Reason (shown to readers beside the dataset)
          </label>
          <textarea
            id={fieldId}
            name="reason"
            rows={2}
            className="field-input"
            required
            minLength={EXCLUSION_REASON_MIN}
            maxLength={EXCLUSION_REASON_MAX}
            defaultValue={excludeState.values?.reason ?? currentReason ?? ""}
            aria-invalid={error ? true : undefined}
            aria-describedby={error ? `${fieldId}-error` : undefined}
          />
          {error && (
            <p id={`${fieldId}-error`} className="text-error">
              {error}
            </p>
          )}
          <SubmitButton className="btn-secondary py-1">{currentReason !== null ? "Save the reason" : "Leave it out"}</SubmitButton>
        </form>
      </details>
      <Outcome state={excludeState} />
    </div>
  );
}
