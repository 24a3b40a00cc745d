"use client";

import { useRouter } from "next/navigation";
import { useState } from "react";

/** The owner starts a finished or failed check again (POST /api/v1/mechanism-checks/:id/rerun). */
export function RerunButton({ id }: { id: number }) {
  const router = useRouter();
  const [busy, setBusy] = useState(false);
  const [message, setMessage] = useState<string | null>(null);
  async function rerun() {
    setBusy(true);
    setMessage(null);
    const res = await fetch(`/api/v1/mechanism-checks/${id}/rerun`, { method: "POST" }).catch(() => null);
    setBusy(false);
    if (res?.ok) router.refresh();
    else setMessage((await res?.json().catch(() => null))?.detail ?? "The check could not be started again; try again.");
  }
  return (
    <div>
      <button type="button" className="btn-secondary" disabled={busy} onClick={rerun}>
        {busy ? "Starting…" : "Check again"}
      </button>
      {message && <p className="text-sm">{message}</p>}
    </div>
  );
}
