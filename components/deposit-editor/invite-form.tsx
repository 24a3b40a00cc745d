"use client";

import { useState, useTransition } from "react";
import { inviteAction } from "@/app/deposits/actions";

/** The owner invites a co-editor by e-mail; the invited person accepts through the link they receive. */
export function InviteForm({ versionId }: { versionId: number }) {
  const [email, setEmail] = useState("");
  const [role, setRole] = useState<"editor" | "viewer">("editor");
  const [pending, startTransition] = useTransition();
  const [outcome, setOutcome] = useState<{ ok: boolean; message: string } | null>(null);

  return (
    <form
      className="space-y-2"
      onSubmit={(e) => {
        e.preventDefault();
        setOutcome(null);
        startTransition(async () => {
          try {
            const result = await inviteAction(versionId, email, role);
            setOutcome(result);
            if (result.ok) setEmail("");
          } catch {
            setOutcome({ ok: false, message: "The server could not be reached; no invitation was sent." });
          }
        });
      }}
    >
      <div className="flex flex-wrap items-end gap-3">
        <div className="min-w-56 flex-1 space-y-1">
          <label htmlFor="invite-email" className="block text-sm font-medium">
            Invite a co-editor by e-mail
          </label>
          <input
            id="invite-email"
            type="email"
            required
            value={email}
            onChange={(e) => setEmail(e.target.value)}
            autoComplete="off"
            className="field-input"
          />
        </div>
        <div className="space-y-1">
          <label htmlFor="invite-role" className="block text-sm font-medium">
            As
          </label>
          <select id="invite-role" value={role} onChange={(e) => setRole(e.target.value as "editor" | "viewer")} className="field-input">
            <option value="editor">editor (can change the draft)</option>
            <option value="viewer">viewer (can read it)</option>
          </select>
        </div>
        <button type="submit" className="btn-secondary" disabled={pending}>
          {pending ? "Sending…" : "Send invitation"}
        </button>
      </div>
      {outcome && (
        <p role={outcome.ok ? "status" : "alert"} className={`text-sm ${outcome.ok ? "text-ok" : "text-error"}`}>
          {outcome.message}
        </p>
      )}
    </form>
  );
}
