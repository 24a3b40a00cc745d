"use client";

import { useActionState } from "react";
import { FormField } from "@/components/form-field";
import { FormMessage, SubmitButton } from "@/components/form-status";
import { idleState, type ActionState } from "@/lib/auth/action-state";

/** One e-mail field and a button, for the forms that mail a link (password reset, confirmation); the answer replaces the form. */
export function EmailRequestForm({
  action: serverAction,
  button,
  email,
}: {
  action: (state: ActionState, formData: FormData) => Promise<ActionState>;
  button: string;
  email?: string;
}) {
  const [state, action] = useActionState(serverAction, idleState);
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
      <SubmitButton>{button}</SubmitButton>
    </form>
  );
}
