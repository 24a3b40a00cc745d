"use client";

import { useActionState } from "react";
import { FormField } from "@/components/form-field";
import { FormMessage, SubmitButton } from "@/components/form-status";
import { idleState } from "@/lib/auth/action-state";
import { resendConfirmationAction } from "./actions";

export function ResendForm({ email }: { email?: string }) {
  const [state, action] = useActionState(resendConfirmationAction, idleState);
  if (state.status === "ok") return <FormMessage state={state} />;
  return (
    <form action={action} className="space-y-4">
      <FormMessage state={state} />
      <FormField
        label="E-mail"
        name="email"
        type="email"
        autoComplete="email"
        required
        error={state.fieldErrors?.email}
        defaultValue={state.values?.email ?? email}
      />
      <SubmitButton>Send me a new confirmation link</SubmitButton>
    </form>
  );
}
