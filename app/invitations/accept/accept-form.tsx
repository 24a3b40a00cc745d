"use client";

import { useActionState } from "react";
import { FormMessage, SubmitButton } from "@/components/form-status";
import { idleState } from "@/lib/auth/action-state";
import { acceptInvitationAction } from "./actions";

export function AcceptForm({ token }: { token: string }) {
  const [state, action] = useActionState(acceptInvitationAction, idleState);
  return (
    <form action={action} className="space-y-4">
      <FormMessage state={state} />
      <input type="hidden" name="token" value={token} />
      <SubmitButton>Accept the invitation</SubmitButton>
    </form>
  );
}
