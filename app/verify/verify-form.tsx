"use client";

import Link from "next/link";
import { useActionState } from "react";
import { FormMessage, SubmitButton } from "@/components/form-status";
import { idleState } from "@/lib/auth/action-state";
import { refuseOrcidAction, verifyAction } from "./actions";

/** `orcid`: the link belongs to a pending ORCID sign-up with this iD (confirm in its browser, or refuse). */
export function VerifyForm({ token, orcid }: { token: string; orcid: string | null }) {
  const [state, action] = useActionState(verifyAction, idleState);
  const [refused, refuse] = useActionState(refuseOrcidAction, idleState);
  const otherBrowser = state.status === "error" && state.data?.orcid !== undefined;
  const linkDead = state.status === "error" && !otherBrowser;
  if (refused.status === "ok") return <FormMessage state={refused} />;
  const offerRefusal = (orcid !== null || otherBrowser) && !linkDead;
  return (
    <div className="space-y-4">
      {state.status === "idle" &&
        (orcid ? (
          <p className="text-sm">
            This address was given when someone signed in with the ORCID iD <span className="font-mono">{orcid}</span> and asked for an
            account. If that was you, confirm in the browser you signed in with. If it was not you, choose &ldquo;This was not me&rdquo;:
            the sign-up is cancelled and your address stays free.
          </p>
        ) : (
          <p className="text-sm">One click confirms the address and activates your account.</p>
        ))}
      <form action={action} className="space-y-4">
        <FormMessage state={state} />
        {linkDead && (
          <p className="text-sm">
            Already confirmed? <Link href="/sign-in">Sign in</Link>. Otherwise{" "}
            <Link href="/verify/resend">send me a new confirmation link</Link>.
          </p>
        )}
        <input type="hidden" name="token" value={token} />
        {state.status === "idle" && <SubmitButton className="btn-primary">Confirm my address</SubmitButton>}
      </form>
      {offerRefusal && (
        <form action={refuse} className="space-y-4">
          <FormMessage state={refused} />
          <input type="hidden" name="token" value={token} />
          <SubmitButton className="btn-danger">This was not me</SubmitButton>
        </form>
      )}
    </div>
  );
}
