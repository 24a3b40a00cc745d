"use client";

import { useRouter } from "next/navigation";
import { useState, useTransition } from "react";
import { revokeInvitationAction } from "@/app/deposits/actions";

export interface PendingInvitationView {
  id: number;
  email: string;
  role: string;
  /** ISO 8601. */
  createdAt: string;
  expiresAt: string;
  expired: boolean;
}

const day = (iso: string) => iso.slice(0, 10);

/** The owner's list of invitations not accepted yet, each revocable. */
export function InvitationsPanel({ invitations }: { invitations: PendingInvitationView[] }) {
  const router = useRouter();
  const [pending, startTransition] = useTransition();
  const [message, setMessage] = useState<{ ok: boolean; text: string } | null>(null);

  function revoke(id: number, email: string) {
    setMessage(null);
    startTransition(async () => {
      const r = await revokeInvitationAction(id);
      setMessage({ ok: r.ok, text: r.ok ? `Invitation to ${email} revoked: its link no longer works.` : r.message });
      if (r.ok) router.refresh();
    });
  }

  return (
    <section aria-labelledby="invitations-heading" className="card space-y-3">
      <h2 id="invitations-heading" className="font-serif text-xl font-semibold">
        Invitations not accepted yet
      </h2>
      {invitations.length === 0 ? (
        <p className="text-sm text-muted">
          None. Invitations you send appear here until they are accepted; you are told by e-mail when one is.
        </p>
      ) : (
        <ul className="space-y-2">
          {invitations.map((inv) => (
            <li key={inv.id} className="flex flex-wrap items-center justify-between gap-2 rounded-md border border-line px-3 py-2 text-sm">
              <span className="break-all">
                <span className="font-medium">{inv.email}</span> as {inv.role === "editor" ? "an editor" : "a viewer"}, sent{" "}
                {day(inv.createdAt)}
                {inv.expired ? `; expired ${day(inv.expiresAt)}` : `; the link works until ${day(inv.expiresAt)}`}
              </span>
              <button type="button" className="btn-secondary" disabled={pending} onClick={() => revoke(inv.id, inv.email)}>
                Revoke<span className="sr-only"> the invitation to {inv.email}</span>
              </button>
            </li>
          ))}
        </ul>
      )}
      {message && (
        <p role={message.ok ? "status" : "alert"} className={`text-sm ${message.ok ? "text-ok" : "text-error"}`}>
          {message.text}
        </p>
      )}
    </section>
  );
}
