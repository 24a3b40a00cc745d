import type { Metadata } from "next";
import Link from "next/link";
import { safeCallbackPath } from "@/lib/auth/callback-url";
import { appUrl } from "@/lib/config";
import { SignInForm } from "./sign-in-form";

export const metadata: Metadata = { title: "Sign in" };

export default async function SignInPage({ searchParams }: { searchParams: Promise<Record<string, string | string[] | undefined>> }) {
  const sp = await searchParams;
  return (
    <div className="mx-auto max-w-md space-y-6">
      <h1 className="text-3xl font-semibold">Sign in</h1>
      <div className="card">
        <SignInForm
          callbackUrl={safeCallbackPath(sp.callbackUrl, new URL(appUrl()).origin)}
          verified={sp.verified === "1"}
          reset={sp.reset === "1"}
        />
      </div>
      <p className="text-sm text-muted">
        New here? <Link href="/sign-up">Create an account</Link>. Forgot your password?{" "}
        <Link href="/forgot-password">Choose a new one</Link>.
      </p>
    </div>
  );
}
