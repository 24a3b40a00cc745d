"use client";

import { signIn } from "next-auth/react";
import { useRouter } from "next/navigation";
import { useState } from "react";
import { FormField } from "@/components/form-field";
import { safeCallbackPath } from "@/lib/auth/callback-url";

export function SignInForm({ callbackUrl, verified, reset }: { callbackUrl: string; verified: boolean; reset: boolean }) {
  const router = useRouter();
  const [error, setError] = useState<string | null>(null);
  const [pending, setPending] = useState(false);

  async function onSubmit(event: React.FormEvent<HTMLFormElement>) {
    event.preventDefault();
    setPending(true);
    setError(null);
    const form = new FormData(event.currentTarget);
    const result = await signIn("credentials", {
      email: String(form.get("email") ?? ""),
      password: String(form.get("password") ?? ""),
      redirect: false,
    });
    setPending(false);
    if (!result || result.error) {
      setError(result?.error && result.error !== "CredentialsSignin" ? result.error : "E-mail or password is not right.");
      return;
    }
    // Checked again against the origin the browser is on: only a path on this site.
    router.push(safeCallbackPath(callbackUrl, window.location.origin));
    router.refresh();
  }

  return (
    <form onSubmit={onSubmit} className="space-y-4" noValidate>
      {verified && (
        <p role="status" className="rounded-md border border-ok/40 px-3 py-2 text-sm text-ok">
          Your address is confirmed. Sign in to continue.
        </p>
      )}
      {reset && (
        <p role="status" className="rounded-md border border-ok/40 px-3 py-2 text-sm text-ok">
          Your password has been changed and every session of yours has ended. Sign in with the new one.
        </p>
      )}
      {error && (
        <p role="alert" className="rounded-md border border-error/40 px-3 py-2 text-sm text-error">
          {error}
        </p>
      )}
      <FormField label="E-mail" name="email" type="email" autoComplete="email" required autoFocus />
      <FormField label="Password" name="password" type="password" autoComplete="current-password" required />
      <button type="submit" className="btn-primary w-full" disabled={pending}>
        {pending ? "Signing in…" : "Sign in"}
      </button>
    </form>
  );
}
