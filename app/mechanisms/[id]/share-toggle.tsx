"use client";

import { useState } from "react";

/** The owner's switch for the check's share link (POST /api/v1/mechanism-checks/:id/share). */
export function ShareToggle({ id, initialUrl }: { id: number; initialUrl: string | null }) {
  const [url, setUrl] = useState(initialUrl);
  const [error, setError] = useState<string | null>(null);
  async function change(shared: boolean) {
    setError(null);
    const res = await fetch(`/api/v1/mechanism-checks/${id}/share`, {
      method: "POST",
      body: JSON.stringify({ shared }),
      headers: { "content-type": "application/json" },
    });
    if (!res.ok) return setError("The share link could not be changed; try again.");
    setUrl((await res.json()).data.url);
  }
  return (
    <div className="text-sm">
      {url ? (
        <p>
          Anyone with this link can read the report: <code className="break-all">{new URL(url, window.location.origin).toString()}</code>{" "}
          <button type="button" className="btn-secondary" onClick={() => change(false)}>
            Stop sharing
          </button>
        </p>
      ) : (
        <p>
          Only you can read this report.{" "}
          <button type="button" className="btn-secondary" onClick={() => change(true)}>
            Make a share link
          </button>
        </p>
      )}
      {error && <p role="alert">{error}</p>}
    </div>
  );
}
