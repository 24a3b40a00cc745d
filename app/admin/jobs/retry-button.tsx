"use client";

import { useActionState } from "react";
import { SubmitButton } from "@/components/form-status";
import { idleState } from "@/lib/auth/action-state";
import { retryJobAction } from "./actions";

export function RetryButton({ queue, id }: { queue: string; id: string }) {
  const [state, action] = useActionState(retryJobAction, idleState);
  return (
    <form action={action}>
      <input type="hidden" name="queue" value={queue} />
      <input type="hidden" name="id" value={id} />
      <SubmitButton className="btn-secondary py-1">
        Retry<span className="sr-only"> job {id}</span>
      </SubmitButton>
      {state.message && <p className={state.status === "error" ? "text-xs text-error" : "text-xs text-ok"}>{state.message}</p>}
    </form>
  );
}
