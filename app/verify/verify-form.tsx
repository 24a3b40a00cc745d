"use client";

import Link from "next/link";
import { useActionState } from "react";
import { FormMessage, SubmitButton } from "@/components/form-status";
import { idleState } from "@/lib/auth/action-state";
import { verifyAction } from "./actions";

export function VerifyForm({ token }: { token: string }) {
  const [state, action] = useActionState(verifyAction, idleState);
  return (
    <form action={action} className="space-y-4">
      <FormMessage state={state} />
      {state.status === "error" && (
        <p className="text-sm">
          <Link href="/verify/resend">Send me a new confirmation link</Link>
        </p>
      )}
      <input type="hidden" name="token" value={token} />
      <SubmitButton>Confirm my address</SubmitButton>
    </form>
  );
}
