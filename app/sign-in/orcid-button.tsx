"use client";

import { signIn } from "next-auth/react";
import { useState } from "react";

/** Starts the ORCID sign-in (or, from settings, the linking of an iD to the signed-in account). */
export function OrcidButton({ callbackUrl, label = "Continue with ORCID" }: { callbackUrl: string; label?: string }) {
  const [pending, setPending] = useState(false);
  return (
    <button
      type="button"
      className="btn-secondary w-full"
      disabled={pending}
      onClick={() => {
        setPending(true);
        void signIn("orcid", { callbackUrl });
      }}
    >
      {pending ? "Going to ORCID…" : label}
    </button>
  );
}
