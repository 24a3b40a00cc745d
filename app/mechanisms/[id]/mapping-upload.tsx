"use client";

import { useState } from "react";

/** Upload a species mapping CSV (name,inchikey) to POST /api/v1/mechanism-checks/species-choices. */
export function MappingUpload() {
  const [message, setMessage] = useState<string | null>(null);
  async function upload(file: File) {
    setMessage(null);
    const res = await fetch("/api/v1/mechanism-checks/species-choices", {
      method: "POST",
      body: file,
      headers: { "content-type": "text/csv" },
    });
    const json = await res.json().catch(() => ({}));
    if (res.ok) setMessage(`Saved ${json.data.saved} choices; they apply to your next check of a mechanism.`);
    else
      setMessage(
        [json.detail ?? "The mapping was refused.", ...(json.errors ?? []).slice(1, 10).map((e: { message: string }) => e.message)].join(
          " ",
        ),
      );
  }
  return (
    <div className="text-sm">
      <label htmlFor="mapping-file">Upload a mapping (CSV with the columns name and inchikey)</label>{" "}
      <input id="mapping-file" type="file" accept=".csv,text/csv" onChange={(e) => e.target.files?.[0] && upload(e.target.files[0])} />
      {message && <p role="status">{message}</p>}
    </div>
  );
}
