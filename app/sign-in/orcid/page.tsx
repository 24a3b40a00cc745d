import type { Metadata } from "next";
import Link from "next/link";
import { orcidTicketFromCookie } from "@/lib/auth/orcid-browser";
import { readOrcidTicket, TICKET_REFUSED } from "@/lib/auth/orcid-ticket";
import { OrcidId } from "@/components/orcid-id";
import { ConfirmOrcidForm } from "./confirm-form";

export const metadata: Metadata = { title: "Create an account with ORCID" };

/** The first ORCID sign-in of an unknown iD: a name and an address before any account exists. */
// The ticket is in this browser's cookie (set by the ORCID callback), never in the address.
export default async function ConfirmOrcidPage() {
  const text = await orcidTicketFromCookie();
  const read = text ? readOrcidTicket(text) : null;
  return (
    <div className="mx-auto max-w-md space-y-6">
      <h1 className="text-3xl font-semibold">Create an account with ORCID</h1>
      <div className="card space-y-4">
        {read && text ? (
          <ConfirmOrcidForm name={read.name}>
            <p className="text-sm">
              ORCID confirmed the iD <OrcidId orcid={read.orcid} verified />. No account has it yet: give your name and e-mail address to
              create one (role: researcher).
            </p>
          </ConfirmOrcidForm>
        ) : (
          <p role="alert" className="text-sm text-error">
            {TICKET_REFUSED} <Link href="/sign-in">Sign in</Link>
          </p>
        )}
      </div>
    </div>
  );
}
