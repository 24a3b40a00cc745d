"use client";

import { signIn } from "next-auth/react";
import Link from "next/link";
import { useRouter } from "next/navigation";
import { useState } from "react";
import { FormField } from "@/components/form-field";
import { safeCallbackPath } from "@/lib/auth/callback-url";

// The start of lib/auth/options.ts's answer to the right password of an unconfirmed account.
const UNCONFIRMED = "Confirm your e-mail address first";

export function SignInForm({ callbackUrl, verified, reset }: { callbackUrl: string; verified: boolean; reset: boolean }) {
  const router = useRouter();
  const [error, setError] = useState<string | null>(null);
  const [unconfirmed, setUnconfirmed] = useState<string | null>(null);
  const [pending, setPending] = useState(false);

  async function onSubmit(event: React.FormEvent<HTMLFormElement>) {
    event.preventDefault();
    setPending(true);
    setError(null);
    setUnconfirmed(null);
    const form = new FormData(event.currentTarget);
    const result = await signIn("credentials", {
      email: String(form.get("email") ?? ""),
      password: String(form.get("password") ?? ""),
      redirect: false,
    });
    setPending(false);
    if (!result || result.error) {
      setError(result?.error && result.error !== "CredentialsSignin" ? result.error : "E-mail or password is not right.");
      // Said only after the right password, so it tells nothing about who has an account.
      if (result?.error?.startsWith(UNCONFIRMED)) setUnconfirmed(String(form.get("email") ?? ""));
      return;
    }
    // Checked again against the origin the browser is on: only a path on this site.
    router.push(safeCallbackPath(callbackUrl, window.location.origin));
    router.refresh();
  }

  return (
    // POST: sent before the scripts load (or without them), the password never goes into the address.
    <form onSubmit={onSubmit} method="post" className="space-y-4" noValidate>
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
          {unconfirmed !== null && (
            <>
              {" "}
              <Link href={`/verify/resend?email=${encodeURIComponent(unconfirmed)}`}>Send me a new confirmation link</Link>
            </>
          )}
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
