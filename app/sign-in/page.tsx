import type { Metadata } from "next";
import Link from "next/link";
import { safeCallbackPath } from "@/lib/auth/callback-url";
import { appUrl, orcidSettings } from "@/lib/config";
import { OrcidButton } from "./orcid-button";
import { orcidMessage } from "./orcid-messages";
import { SignInForm } from "./sign-in-form";

export const metadata: Metadata = { title: "Sign in" };

export default async function SignInPage({ searchParams }: { searchParams: Promise<Record<string, string | string[] | undefined>> }) {
  const sp = await searchParams;
  const callbackUrl = safeCallbackPath(sp.callbackUrl, new URL(appUrl()).origin);
  const orcidError = orcidMessage(sp.error);
  return (
    <div className="mx-auto max-w-md space-y-6">
      <h1 className="text-3xl font-semibold">Sign in</h1>
      {orcidError && (
        <p role="alert" className="rounded-md border border-error/40 px-3 py-2 text-sm text-error">
          {orcidError}
        </p>
      )}
      {sp.verified === "orcid" && (
        <p role="status" className="rounded-md border border-ok/40 px-3 py-2 text-sm text-ok">
          Your address is confirmed. Your account has no password yet: sign in with ORCID below.
        </p>
      )}
      <div className="card">
        <SignInForm callbackUrl={callbackUrl} verified={sp.verified === "1"} reset={sp.reset === "1"} />
      </div>
      <div className="card space-y-2">
        <OrcidButton callbackUrl={callbackUrl} />
        <p className="text-sm text-muted">
          {orcidSettings().standIn
            ? "This server has no ORCID connection configured: the button goes to a local stand-in that accepts any well-formed iD, for trying things out."
            : "A first sign-in with an iD no account has yet creates one, after you confirm your name and e-mail address."}
        </p>
      </div>
      <p className="text-sm text-muted">
        New here? <Link href="/sign-up">Create an account</Link>. Forgot your password?{" "}
        <Link href="/forgot-password">Choose a new one</Link>.
      </p>
    </div>
  );
}
