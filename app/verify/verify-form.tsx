"use client";

import Link from "next/link";
import { useActionState } from "react";
import { FormMessage, SubmitButton } from "@/components/form-status";
import { idleState } from "@/lib/auth/action-state";
import { refuseOrcidAction, verifyAction } from "./actions";

export function VerifyForm({ token }: { token: string }) {
  const [state, action] = useActionState(verifyAction, idleState);
  const [refused, refuse] = useActionState(refuseOrcidAction, idleState);
  const otherBrowser = state.status === "error" && state.data?.orcid !== undefined;
  if (refused.status === "ok") return <FormMessage state={refused} />;
  return (
    <div className="space-y-4">
      <form action={action} className="space-y-4">
        <FormMessage state={state} />
        {state.status === "error" && !otherBrowser && (
          <p className="text-sm">
            <Link href="/verify/resend">Send me a new confirmation link</Link>
          </p>
        )}
        <input type="hidden" name="token" value={token} />
        {!otherBrowser && <SubmitButton>Confirm my address</SubmitButton>}
      </form>
      {otherBrowser && (
        <form action={refuse} className="space-y-4">
          <FormMessage state={refused} />
          <input type="hidden" name="token" value={token} />
          <SubmitButton>This was not me</SubmitButton>
        </form>
      )}
    </div>
  );
}
