"use client";

import { useFormStatus } from "react-dom";
import type { ActionState } from "@/lib/auth/action-state";

export function SubmitButton({ children, className = "btn-primary" }: { children: React.ReactNode; className?: string }) {
  const { pending } = useFormStatus();
  return (
    <button type="submit" className={className} disabled={pending} aria-disabled={pending}>
      {pending ? "Working…" : children}
    </button>
  );
}

/** The form-level message of an action's result, announced to screen readers. */
export function FormMessage({ state }: { state: ActionState }) {
  if (state.status === "idle" || !state.message) return null;
  const tone = state.status === "ok" ? "border-ok/40 text-ok" : "border-error/40 text-error";
  return (
    <p role={state.status === "error" ? "alert" : "status"} className={`rounded-md border bg-panel px-3 py-2 text-sm ${tone}`}>
      {state.message}
    </p>
  );
}
