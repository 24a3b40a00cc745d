"use client";

import { useRouter } from "next/navigation";
import { useState } from "react";

/** Forget a remembered species choice, then check the mechanism again with the choices as they now are. */
export function ForgetChoiceButton({ checkId, name }: { checkId: number; name: string }) {
  const router = useRouter();
  const [busy, setBusy] = useState(false);
  const [message, setMessage] = useState<string | null>(null);
  async function forget() {
    setBusy(true);
    setMessage(null);
    try {
      const res = await fetch(`/api/v1/mechanism-checks/species-choices?name=${encodeURIComponent(name)}`, { method: "DELETE" });
      if (!res.ok && res.status !== 404) {
        const problem = await res.json().catch(() => ({}));
        setMessage(problem.detail ?? `The choice could not be forgotten (HTTP ${res.status}).`);
        return;
      }
      const rerun = await fetch(`/api/v1/mechanism-checks/${checkId}/rerun`, { method: "POST" });
      if (!rerun.ok) {
        setMessage("Forgotten; start the check again to see the effect.");
        return;
      }
      router.refresh();
    } catch {
      setMessage("The request could not be sent; try again.");
    } finally {
      setBusy(false);
    }
  }
  return (
    <span className="inline-flex flex-wrap items-center gap-2">
      <button type="button" className="underline" disabled={busy} onClick={forget}>
        {busy ? "Forgetting…" : "Forget this choice"}
        <span className="sr-only"> for {name}</span>
      </button>
      {message && (
        <span role="alert" className="text-xs">
          {message}
        </span>
      )}
    </span>
  );
}
