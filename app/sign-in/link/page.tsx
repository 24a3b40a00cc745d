import type { Metadata } from "next";
import Link from "next/link";
import { SignInLinkForm } from "./sign-in-link-form";

export const metadata: Metadata = { title: "Sign in with the mailed link" };

export default async function SignInLinkPage({ searchParams }: { searchParams: Promise<{ token?: string | string[] }> }) {
  const { token } = await searchParams;
  const code = Array.isArray(token) ? token[0] : token;
  return (
    <div className="mx-auto max-w-md space-y-6">
      <h1 className="text-3xl font-semibold">Sign in with the mailed link</h1>
      <div className="card">
        {code ? (
          <SignInLinkForm token={code} />
        ) : (
          <p role="alert" className="text-sm text-error">
            This link has no sign-in code. <Link href="/sign-in">Sign in again</Link> to get a new one.
          </p>
        )}
      </div>
    </div>
  );
}
