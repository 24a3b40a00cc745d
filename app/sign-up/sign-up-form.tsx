"use client";

import { useActionState } from "react";
import { FormField } from "@/components/form-field";
import { FormMessage, SubmitButton } from "@/components/form-status";
import { idleState } from "@/lib/auth/action-state";
import { signUpAction } from "./actions";

export function SignUpForm() {
  const [state, action] = useActionState(signUpAction, idleState);
  if (state.status === "ok") return <FormMessage state={state} />;
  const e = state.fieldErrors ?? {};
  return (
    <form action={action} className="space-y-4">
      <FormMessage state={state} />
      <FormField label="Full name" name="name" autoComplete="name" required error={e.name} defaultValue={state.values?.name} />
      <FormField
        label="E-mail"
        name="email"
        type="email"
        autoComplete="email"
        required
        error={e.email}
        defaultValue={state.values?.email}
      />
      <FormField
        label="Password"
        name="password"
        type="password"
        autoComplete="new-password"
        required
        minLength={10}
        hint="At least 10 characters."
        error={e.password}
      />
      <FormField label="Password again" name="confirm" type="password" autoComplete="new-password" required error={e.confirm} />
      <SubmitButton className="btn-primary w-full">Create account</SubmitButton>
    </form>
  );
}
