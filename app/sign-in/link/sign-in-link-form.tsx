"use client";

import { signIn } from "next-auth/react";
import Link from "next/link";
import { useRouter } from "next/navigation";
import { useState } from "react";

// The link is used only when the person presses the button, so a mail scanner that opens
// links cannot spend it.
export function SignInLinkForm({ token }: { token: string }) {
  const router = useRouter();
  const [error, setError] = useState<string | null>(null);
  const [pending, setPending] = useState(false);

  async function onSubmit(event: React.FormEvent<HTMLFormElement>) {
    event.preventDefault();
    setPending(true);
    setError(null);
    const result = await signIn("sign-in-link", { token, redirect: false });
    setPending(false);
    if (!result || result.error) {
      setError(
        result?.error && result.error !== "CredentialsSignin"
          ? result.error
          : "This link is invalid, has expired, or was already used. Sign in with your password: a locked sign-in with the right password mails a new link.",
      );
      return;
    }
    router.push("/");
    router.refresh();
  }

  return (
    <form onSubmit={onSubmit} method="post" className="space-y-4">
      <p className="text-sm">
        The link works once. Sign-in for your account was paused after many failed attempts; this signs you in and lifts the pause.
      </p>
      {error && (
        <p role="alert" className="rounded-md border border-error/40 px-3 py-2 text-sm text-error">
          {error}
        </p>
      )}
      {error ? (
        <Link href="/sign-in" className="btn-primary block w-full text-center">
          Sign in with your password
        </Link>
      ) : (
        <button type="submit" className="btn-primary w-full" disabled={pending}>
          {pending ? "Signing in…" : "Sign in"}
        </button>
      )}
    </form>
  );
}
