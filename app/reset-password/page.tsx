import type { Metadata } from "next";
import Link from "next/link";
import { ResetForm } from "./reset-form";

export const metadata: Metadata = { title: "Choose a new password" };

export default async function ResetPasswordPage({ searchParams }: { searchParams: Promise<{ token?: string }> }) {
  const { token } = await searchParams;
  return (
    <div className="mx-auto max-w-md space-y-6">
      <h1 className="text-3xl font-semibold">Choose a new password</h1>
      <div className="card">
        {token ? (
          <ResetForm token={token} />
        ) : (
          <p role="alert" className="text-sm text-error">
            This link has no reset code. <Link href="/forgot-password">Ask for a new link</Link>.
          </p>
        )}
      </div>
    </div>
  );
}
