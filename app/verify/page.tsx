import type { Metadata } from "next";
import Link from "next/link";
import { pendingOrcidOfLink } from "@/lib/users/queries";
import { VerifyForm } from "./verify-form";

export const metadata: Metadata = { title: "Confirm your e-mail address" };

// Confirming takes a click rather than happening on page load, so link scanners in mail
// systems cannot use up the link. A link of a pending ORCID sign-up names its iD at once and
// offers to refuse it beside confirming.
export default async function VerifyPage({ searchParams }: { searchParams: Promise<{ token?: string | string[] }> }) {
  const given = (await searchParams).token;
  const token = typeof given === "string" && given.length <= 512 ? given : undefined;
  const orcid = token && token.length >= 10 ? await pendingOrcidOfLink({ secret: token }) : null;
  return (
    <div className="mx-auto max-w-md space-y-6">
      <h1 className="text-3xl font-semibold">{orcid ? "Confirm or refuse an ORCID sign-up" : "Confirm your e-mail address"}</h1>
      <div className="card space-y-4">
        {token ? (
          <VerifyForm token={token} orcid={orcid} />
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
