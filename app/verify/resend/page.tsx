import type { Metadata } from "next";
import { ResendForm } from "./resend-form";

export const metadata: Metadata = { title: "A new confirmation link" };

export default async function ResendConfirmationPage({ searchParams }: { searchParams: Promise<{ email?: string }> }) {
  const { email } = await searchParams;
  return (
    <div className="mx-auto max-w-md space-y-6">
      <h1 className="text-3xl font-semibold">A new confirmation link</h1>
      <p className="text-sm text-muted">
        Give the address you signed up with; if its account is still waiting for confirmation, we will e-mail a new link.
      </p>
      <div className="card">
        <ResendForm email={typeof email === "string" ? email.slice(0, 320) : undefined} />
      </div>
    </div>
  );
}
