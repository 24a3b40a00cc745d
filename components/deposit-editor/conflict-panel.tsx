"use client";

import { useState } from "react";
import { showValue, sideOf, type ConflictField, type Side } from "./conflict";

interface Props {
  fields: ConflictField[];
  /** Save the merge of the chosen values on top of the co-editor's draft. */
  onMerge: (choices: Record<string, Side>) => void;
  onDownloadMine: () => void;
  saving: boolean;
}

/**
 * A co-editor saved first: every field where the two drafts differ, side by side. A field only the
 * person changed is kept as theirs (no choice); elsewhere there is a choice per field (proposed:
 * theirs where only the co-editor changed it, else mine). `fields` follows the form as it is typed
 * while the panel is open. Nothing is lost until the person saves the merge.
 */
export function ConflictPanel({ fields, onMerge, onDownloadMine, saving }: Props) {
  const [choices, setChoices] = useState<Record<string, Side>>({});
  const setAll = (side: Side) => setChoices(Object.fromEntries(fields.map((f) => [f.pointer, side])));
  return (
    <section role="alert" aria-labelledby="conflict-heading" className="space-y-3 rounded-lg border-2 border-error/60 bg-panel p-4 text-sm">
      <h2 id="conflict-heading" className="font-serif text-lg font-semibold text-error">
        A co-editor saved this draft while you were editing it
      </h2>
      <p>
        Nothing of yours was stored and nothing is lost. {fields.length === 1 ? "One field differs" : `${fields.length} fields differ`}:
        yours are kept where only you changed them; elsewhere choose whether to keep yours or take theirs, then save the merge on top of
        their version.
      </p>
      <div className="flex flex-wrap gap-2">
        <button type="button" className="btn-secondary" onClick={() => setAll("mine")}>
          Keep all mine
        </button>
        <button type="button" className="btn-secondary" onClick={() => setAll("theirs")}>
          Take all theirs
        </button>
        <button type="button" className="btn-secondary" onClick={onDownloadMine}>
          Download my edits (JSON)
        </button>
      </div>
      <ul className="space-y-3">
        {fields.map((f) => (
          <li key={f.pointer} className="rounded-md border border-line p-3">
            <fieldset className="space-y-2">
              <legend className="font-medium">{f.where}</legend>
              {f.changedBy === "me" ? (
                <p>
                  <span className="block">Yours is kept: the co-editor did not change this field.</span>
                  <span className="block font-mono text-xs break-words">{showValue(f.mine)}</span>
                </p>
              ) : (
                <div className="grid gap-2 md:grid-cols-2">
                  {(["mine", "theirs"] as const).map((side) => (
                    <label key={side} className="flex min-w-0 items-start gap-2 rounded-sm border border-line p-2">
                      <input
                        type="radio"
                        name={`conflict-${f.pointer}`}
                        value={side}
                        checked={sideOf(f, choices) === side}
                        onChange={() => setChoices((c) => ({ ...c, [f.pointer]: side }))}
                      />
                      <span className="min-w-0">
                        <span className="block font-medium">{side === "mine" ? "Keep mine" : "Take theirs"}</span>
                        <span className="block font-mono text-xs break-words">{showValue(side === "mine" ? f.mine : f.theirs)}</span>
                      </span>
                    </label>
                  ))}
                </div>
              )}
            </fieldset>
          </li>
        ))}
      </ul>
      <button type="button" className="btn-primary" disabled={saving} onClick={() => onMerge(choices)}>
        Save the merged draft
      </button>
    </section>
  );
}
