"use client";

import { useActionState } from "react";
import { FormField } from "@/components/form-field";
import { FormMessage, SubmitButton } from "@/components/form-status";
import { idleState } from "@/lib/auth/action-state";
import { resetPasswordAction } from "./actions";

export function ResetForm({ token }: { token: string }) {
  const [state, action] = useActionState(resetPasswordAction, idleState);
  const e = state.fieldErrors ?? {};
  return (
    <form action={action} className="space-y-4">
      <FormMessage state={state} />
      <input type="hidden" name="token" value={token} />
      <FormField
        label="New password"
        name="password"
        type="password"
        autoComplete="new-password"
        required
        minLength={10}
        hint="At least 10 characters."
        error={e.password}
      />
      <FormField label="New password again" name="confirm" type="password" autoComplete="new-password" required error={e.confirm} />
      <SubmitButton>Save the new password</SubmitButton>
    </form>
  );
}
