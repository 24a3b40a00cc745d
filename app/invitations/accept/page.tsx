import type { Metadata } from "next";
import { redirect } from "next/navigation";
import { getCurrentUser } from "@/lib/auth/session";
import { describeInvitation } from "@/lib/datasets/invitations";
import { isStorableText } from "@/lib/storable-text";
import { AcceptForm } from "./accept-form";

export const metadata: Metadata = { title: "Accept an invitation" };

export default async function AcceptInvitationPage({ searchParams }: { searchParams: Promise<{ token?: string }> }) {
  const { token } = await searchParams;
  const user = await getCurrentUser();
  if (!user) redirect(`/sign-in?callbackUrl=${encodeURIComponent(`/invitations/accept?token=${token ?? ""}`)}`);
  // The link's own code names the dataset; a malformed one is treated as unknown.
  const offer = token && token.length <= 512 && isStorableText(token) ? await describeInvitation({ secret: token }) : null;
  return (
    <div className="mx-auto max-w-md space-y-6">
      <h1 className="text-3xl font-semibold">Join a dataset</h1>
      <div className="card space-y-4">
        {token && offer?.usable ? (
          <>
            <p>
              {offer.inviter} invites you to {offer.role === "editor" ? "work on" : "read"} the dataset{" "}
              <strong className="break-words">“{offer.title || "untitled"}”</strong> as {offer.role === "editor" ? "an editor" : "a viewer"}
              .
            </p>
            <p className="text-sm">
              You are signed in as {user.email}
              {offer.email !== user.email ? `; the invitation was sent to ${offer.email}, so sign in with that address to accept it` : ""}.
              Accepting opens the dataset.
            </p>
            <AcceptForm token={token} />
          </>
        ) : token && offer ? (
          <p role="alert" className="text-sm text-error">
            {offer.why}
          </p>
        ) : (
          <p role="alert" className="text-sm text-error">
            This link has no invitation code. Open the link from the e-mail exactly as it was sent.
          </p>
        )}
      </div>
    </div>
  );
}
