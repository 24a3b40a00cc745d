import type { Metadata } from "next";
import Link from "next/link";
import { VerifyForm } from "./verify-form";

export const metadata: Metadata = { title: "Confirm your e-mail address" };

// Confirming takes a click rather than happening on page load, so link scanners in mail
// systems cannot use up the link.
export default async function VerifyPage({ searchParams }: { searchParams: Promise<{ token?: string }> }) {
  const { token } = await searchParams;
  return (
    <div className="mx-auto max-w-md space-y-6">
      <h1 className="text-3xl font-semibold">Confirm your e-mail address</h1>
      <div className="card space-y-4">
        {token ? (
          <>
            <p className="text-sm">One click confirms the address and activates your account.</p>
            <VerifyForm token={token} />
          </>
        ) : (
          <>
            <p role="alert" className="text-sm text-error">
              This link has no confirmation code. Open the link from the e-mail exactly as it was sent.
            </p>
            <p className="text-sm">
              <Link href="/verify/resend">Send me a new confirmation link</Link>
            </p>
          </>
        )}
      </div>
    </div>
  );
}
