import type { Metadata } from "next";
import { redirect } from "next/navigation";
import { getCurrentUser } from "@/lib/auth/session";
import { AcceptForm } from "./accept-form";

export const metadata: Metadata = { title: "Accept an invitation" };

export default async function AcceptInvitationPage({ searchParams }: { searchParams: Promise<{ token?: string }> }) {
  const { token } = await searchParams;
  const user = await getCurrentUser();
  if (!user) redirect(`/sign-in?callbackUrl=${encodeURIComponent(`/invitations/accept?token=${token ?? ""}`)}`);
  return (
    <div className="mx-auto max-w-md space-y-6">
      <h1 className="text-3xl font-semibold">Join a dataset</h1>
      <div className="card space-y-4">
        {token ? (
          <>
            <p className="text-sm">You are signed in as {user.email}. Accepting adds you to the dataset with the role the owner chose.</p>
            <AcceptForm token={token} />
          </>
        ) : (
          <p role="alert" className="text-sm text-error">
            This link has no invitation code. Open the link from the e-mail exactly as it was sent.
          </p>
        )}
      </div>
    </div>
  );
}
