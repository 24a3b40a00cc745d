import type { Metadata } from "next";
import Link from "next/link";
import { SignUpForm } from "./sign-up-form";

export const metadata: Metadata = { title: "Create an account" };

export default function SignUpPage() {
  return (
    <div className="mx-auto max-w-md space-y-6">
      <h1 className="text-3xl font-semibold">Create an account</h1>
      <p className="text-sm text-muted">
        An account lets you deposit datasets, work on drafts with co-authors and use the API. Reading and citing published data needs none.
      </p>
      <div className="card">
        <SignUpForm />
      </div>
      <p className="text-sm text-muted">
        Already registered? <Link href="/sign-in">Sign in</Link>.
      </p>
    </div>
  );
}
