"use client";

import { marksExcitedState } from "@/lib/chem/excited-state";
import { useRouter } from "next/navigation";
import { useState } from "react";

export interface ChooserRow {
  name: string;
  by: "ambiguous" | "none";
  formula: string | null;
  candidates: { inchiKey: string; formula: string; name: string }[];
}

interface Found {
  inchiKey: string;
  formula: string;
  smiles: string | null;
  name: string;
  names: string[];
}

/**
 * One row per mechanism species that is not matched or has several candidates: the owner picks a candidate or searches
 * a species by name, formula, SMILES or InChI (GET /api/v1/mechanism-checks/species-search), then saves the choices
 * (remembered for the account) and the check runs again with them.
 */
export function SpeciesChooser({ checkId, rows }: { checkId: number; rows: ChooserRow[] }) {
  const router = useRouter();
  const [chosen, setChosen] = useState<Record<string, { inchiKey: string; label: string }>>({});
  const [busy, setBusy] = useState(false);
  const [message, setMessage] = useState<string | null>(null);
  const choices = Object.entries(chosen).map(([name, c]) => ({ name, inchiKey: c.inchiKey }));

  async function saveAndRerun() {
    setBusy(true);
    setMessage(null);
    try {
      const saved = await fetch("/api/v1/mechanism-checks/species-choices", {
        method: "POST",
        headers: { "content-type": "application/json" },
        body: JSON.stringify({ choices }),
      });
      if (!saved.ok) {
        const problem = await saved.json().catch(() => ({}));
        setMessage(problem.detail ?? "The choices were refused.");
        return;
      }
      const rerun = await fetch(`/api/v1/mechanism-checks/${checkId}/rerun`, { method: "POST" });
      if (!rerun.ok) {
        const problem = await rerun.json().catch(() => ({}));
        setMessage(`Your choices are saved, but the check could not be started again: ${problem.detail ?? `HTTP ${rerun.status}`}`);
        return;
      }
      router.refresh();
    } catch {
      setMessage("The choices could not be sent; try again.");
    } finally {
      setBusy(false);
    }
  }

  return (
    <div className="card space-y-3" data-testid="species-chooser">
      <h3 className="font-semibold">Choose the species the check could not settle</h3>
      {/* On a phone each name is a block of its own (three columns of inputs do not fit 390 px). */}
      <table className="w-full text-sm max-sm:block">
        <thead className="max-sm:sr-only">
          <tr>
            <th className="px-2 text-left">Name in the mechanism</th>
            <th className="px-2 text-left">Why</th>
            <th className="px-2 text-left">Your choice</th>
          </tr>
        </thead>
        <tbody className="max-sm:block">
          {rows.map((row) => (
            <ChooserRowView
              key={row.name}
              row={row}
              chosen={chosen[row.name] ?? null}
              onChoose={(c) =>
                setChosen((all) => {
                  const next = { ...all };
                  if (c) next[row.name] = c;
                  else delete next[row.name];
                  return next;
                })
              }
            />
          ))}
        </tbody>
      </table>
      <button type="button" className="btn-primary" disabled={busy || choices.length === 0} onClick={saveAndRerun}>
        {busy ? "Saving…" : `Save ${choices.length === 1 ? "this choice" : "these choices"} and check again`}
      </button>
      {message && (
        <p role="alert" className="text-sm">
          {message}
        </p>
      )}
    </div>
  );
}

/** Why a name is left to the person, in words: one excited-state candidate is not "several". */
function whyWords(row: ChooserRow): string {
  if (row.by !== "ambiguous") return "nothing found by name or composition";
  const of = row.formula ? ` of ${row.formula}` : "";
  if (row.candidates.length === 1 && marksExcitedState(row.candidates[0].name))
    return `only one species${of}, and it is an excited state: a mechanism's plain name usually means the ground state. Choose it only if that is what the mechanism means; otherwise leave it unmatched.`;
  return `several candidates${of}`;
}

function ChooserRowView({
  row,
  chosen,
  onChoose,
}: {
  row: ChooserRow;
  chosen: { inchiKey: string; label: string } | null;
  onChoose: (c: { inchiKey: string; label: string } | null) => void;
}) {
  const [text, setText] = useState("");
  const [found, setFound] = useState<Found[] | null>(null);
  const [error, setError] = useState<string | null>(null);
  const id = `choose-${row.name.replace(/[^A-Za-z0-9_-]/g, "_")}`;

  async function search(event: React.FormEvent | React.MouseEvent) {
    event.preventDefault();
    setError(null);
    if (!text.trim()) return;
    const res = await fetch(`/api/v1/mechanism-checks/species-search?q=${encodeURIComponent(text.trim())}`);
    const json = await res.json().catch(() => ({}));
    if (!res.ok) {
      setError(json.detail ?? `The search failed (HTTP ${res.status}).`);
      return;
    }
    setFound(json.data);
  }

  const label = (c: { name: string; formula: string }) => `${c.name} (${c.formula})`;
  return (
    <tr className="border-t align-top max-sm:block max-sm:py-2" data-species={row.name}>
      <td className="px-2 py-1 font-mono max-sm:block">{row.name}</td>
      <td className="px-2 py-1 max-sm:block">{whyWords(row)}</td>
      <td className="space-y-1 px-2 py-1 max-sm:block">
        {row.candidates.length > 0 && (
          <div>
            <label htmlFor={`${id}-candidate`} className="sr-only">
              Candidate for {row.name}
            </label>
            <select
              id={`${id}-candidate`}
              className="field-input"
              value={chosen && row.candidates.some((c) => c.inchiKey === chosen.inchiKey) ? chosen.inchiKey : ""}
              onChange={(e) => {
                const c = row.candidates.find((x) => x.inchiKey === e.target.value);
                onChoose(c ? { inchiKey: c.inchiKey, label: label(c) } : null);
              }}
            >
              <option value="">Not chosen</option>
              {row.candidates.map((c) => (
                <option key={c.inchiKey} value={c.inchiKey}>
                  {label(c)}
                </option>
              ))}
            </select>
          </div>
        )}
        <div className="flex flex-wrap gap-2">
          <label htmlFor={`${id}-search`} className="sr-only">
            Search a species for {row.name}
          </label>
          <input
            id={`${id}-search`}
            className="field-input w-56 max-w-full"
            placeholder="Name, formula, SMILES or InChI"
            value={text}
            onChange={(e) => setText(e.target.value)}
            onKeyDown={(e) => e.key === "Enter" && void search(e as unknown as React.FormEvent)}
          />
          <button type="button" className="btn-secondary" onClick={search}>
            Search
          </button>
        </div>
        {error && <p className="text-sm text-danger">{error}</p>}
        {found && found.length === 0 && <p className="text-sm text-muted">No species found.</p>}
        {found && found.length > 0 && (
          <ul className="space-y-1">
            {found.map((f) => (
              <li key={f.inchiKey}>
                <button
                  type="button"
                  className="underline"
                  aria-pressed={chosen?.inchiKey === f.inchiKey}
                  onClick={() => onChoose({ inchiKey: f.inchiKey, label: label(f) })}
                >
                  Choose {label(f)}
                </button>{" "}
                <span className="text-xs text-muted">
                  {f.smiles ?? ""}
                  {f.names.length > 1 ? ` · also named ${f.names.filter((n) => n !== f.name).join(", ")}` : ""}
                </span>
              </li>
            ))}
          </ul>
        )}
        {chosen && <p className="text-sm">Chosen: {chosen.label}</p>}
      </td>
    </tr>
  );
}
