"use client";

import { type ReactNode, useActionState } from "react";
import { FormField } from "@/components/form-field";
import { FormMessage, SubmitButton } from "@/components/form-status";
import { idleState } from "@/lib/auth/action-state";
import { confirmOrcidSignUpAction } from "./actions";

/** `children`: what the page says before the form (gone once the account is made). */
export function ConfirmOrcidForm({ name, children }: { name: string; children: ReactNode }) {
  const [state, action] = useActionState(confirmOrcidSignUpAction, idleState);
  if (state.status === "ok") return <FormMessage state={state} />;
  const e = state.fieldErrors ?? {};
  return (
    <form action={action} className="space-y-4">
      {children}
      <FormMessage state={state} />
      <FormField label="Full name" name="name" autoComplete="name" required error={e.name} defaultValue={state.values?.name ?? name} />
      <FormField
        label="E-mail"
        name="email"
        type="email"
        autoComplete="email"
        required
        hint="We send a confirmation link here; it is never shown on your public profile."
        error={e.email}
        defaultValue={state.values?.email}
      />
      <SubmitButton className="btn-primary w-full">Create my account</SubmitButton>
    </form>
  );
}
