"use client";

import { useRouter } from "next/navigation";
import { useRef, useState } from "react";

interface Problem {
  title?: string;
  detail?: string;
  errors?: { pointer: string; message: string; value?: { line?: number; column?: number } }[];
}

/** Paste or choose a mechanism file, set the use window, and send it to POST /api/v1/mechanism-checks. */
export function MechanismForm({ demo }: { demo: string }) {
  const router = useRouter();
  const text = useRef<HTMLTextAreaElement>(null);
  const [file, setFile] = useState<File | null>(null);
  const [Tmin, setTmin] = useState("300");
  const [Tmax, setTmax] = useState("2500");
  const [busy, setBusy] = useState(false);
  const [problem, setProblem] = useState<Problem | null>(null);

  async function submit(event: React.FormEvent) {
    event.preventDefault();
    setProblem(null);
    const body: BodyInit | null = file ?? (text.current?.value.trim() ? text.current.value : null);
    if (!body) {
      setProblem({ detail: "Paste a mechanism or choose a file first." });
      return;
    }
    const query = new URLSearchParams({ Tmin, Tmax });
    if (file) query.set("name", file.name);
    setBusy(true);
    try {
      const res = await fetch(`/api/v1/mechanism-checks?${query}`, { method: "POST", body, headers: { "content-type": "text/plain" } });
      const json = await res.json().catch(() => ({}));
      if (res.status === 202) {
        router.push(json.data.url);
        return;
      }
      setProblem(json as Problem);
    } catch {
      setProblem({ detail: "The check could not be sent; try again." });
    } finally {
      setBusy(false);
    }
  }

  return (
    <form onSubmit={submit} className="card space-y-4" aria-describedby="mechanism-help">
      <p id="mechanism-help" className="text-sm text-muted">
        Cantera YAML or the plain-text layout (ELEMENTS / SPECIES / REACTIONS). At most 20 MB and 50 000 reactions.
      </p>
      <div>
        <label htmlFor="mechanism-text" className="block text-sm font-medium">
          Mechanism text
        </label>
        <textarea id="mechanism-text" ref={text} rows={14} spellCheck={false} className="field-input w-full font-mono text-xs" />
        <button
          type="button"
          className="btn-secondary mt-2"
          onClick={() => {
            if (text.current) text.current.value = demo;
            setFile(null);
          }}
        >
          Paste the demo mechanism
        </button>
      </div>
      <div>
        <label htmlFor="mechanism-file" className="block text-sm font-medium">
          Or a file
        </label>
        <input
          id="mechanism-file"
          type="file"
          // The browser's own file button and label are wider than a 390 px screen allows: keep it inside.
          className="block w-full max-w-full min-w-0 text-sm"
          accept=".yaml,.yml,.inp,.dat,.txt,.mech"
          onChange={(e) => setFile(e.target.files?.[0] ?? null)}
        />
      </div>
      <fieldset className="flex flex-wrap gap-4">
        <legend className="text-sm font-medium">Use window (K)</legend>
        <label className="text-sm">
          From <input className="field-input w-24" inputMode="decimal" value={Tmin} onChange={(e) => setTmin(e.target.value)} name="Tmin" />
        </label>
        <label className="text-sm">
          to <input className="field-input w-24" inputMode="decimal" value={Tmax} onChange={(e) => setTmax(e.target.value)} name="Tmax" />
        </label>
      </fieldset>
      <button type="submit" className="btn-primary" disabled={busy}>
        {busy ? "Checking…" : "Check the mechanism"}
      </button>
      {problem && (
        <div role="alert" className="rounded-md border border-danger/40 px-3 py-2 text-sm">
          <p>{problem.detail ?? problem.title ?? "The check was refused."}</p>
          {problem.errors && problem.errors.length > 0 && (
            <ul className="list-disc pl-5">
              {problem.errors.slice(0, 20).map((e, i) => (
                <li key={i}>
                  {e.value?.line ? `Line ${e.value.line}, column ${e.value.column}: ` : e.pointer ? `${e.pointer}: ` : ""}
                  {e.message}
                </li>
              ))}
            </ul>
          )}
        </div>
      )}
    </form>
  );
}
