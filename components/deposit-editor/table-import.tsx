"use client";

import { useId, useState } from "react";
import { checkUploadSize, inspectTable, MAX_UPLOAD_BYTES, type ColumnMapping, type InspectedTable } from "@/lib/deposits/import-table";
import { CONFIDENCE_LEVELS, UNCERTAINTY_KINDS, type ConfidenceLevel, type UncertaintyKind } from "@/lib/deposits/vocabulary";
import { AppError, type FieldError } from "@/lib/errors";
import { SUPPORTED_UNITS } from "@/lib/kinetics/units";
import { unitLabel } from "@/lib/unit-labels";
import type { EditorForm, PointRow } from "./form-model";
import { importRows } from "./import-rows";
import { ScrollRegion } from "@/components/scroll-region";

type Role = keyof ColumnMapping;

const ROLES: { role: Role; label: string }[] = [
  { role: "T", label: "Temperature" },
  { role: "k", label: "Rate constant" },
  { role: "uncertainty", label: "Uncertainty" },
  { role: "pressure", label: "Pressure" },
  { role: "bathGas", label: "Bath gas" },
  { role: "note", label: "Note" },
];

const MIB = 1024 * 1024;

interface Inspected {
  table: InspectedTable;
  origin: string;
}

interface Outcome {
  imported: number;
  errors: FieldError[];
  dropped: number;
  /** What was read with a change (extra cells not used, a header unit not read), from the table's notices. */
  notices: string[];
}

function describeError(err: unknown): string {
  if (err instanceof AppError) return err.message;
  return "The table could not be read.";
}

/** Units named in the headers that fit this dataset, in words; nothing when none. */
function headerUnits(table: InspectedTable, form: EditorForm): { T?: string; k?: string; pressure?: string } {
  const g = table.guessedUnits;
  const out: { T?: string; k?: string; pressure?: string } = {};
  if (g.T && g.T !== form.units.T) out.T = g.T;
  if (g.k && g.k !== form.units.k && SUPPORTED_UNITS.rateConstant[form.reaction.order].some((u) => u.id === g.k)) out.k = g.k;
  if (g.pressure && g.pressure !== form.units.pressure) out.pressure = g.pressure;
  return out;
}

/**
 * Bringing a table in: paste from a spreadsheet or upload a CSV, TSV or JSON file (25 MB at most),
 * choose what each column holds, look at the first rows, then use them.
 */
export function TableImport({
  form,
  onRows,
}: {
  form: EditorForm;
  onRows: (rows: PointRow[], mode: "replace" | "append", units: Partial<EditorForm["units"]>) => void;
}) {
  const id = useId();
  const [pasted, setPasted] = useState("");
  const [problem, setProblem] = useState<string | null>(null);
  const [progress, setProgress] = useState<{ loaded: number; total: number; name: string } | null>(null);
  const [inspected, setInspected] = useState<Inspected | null>(null);
  const [mapping, setMapping] = useState<ColumnMapping>({});
  const [uKind, setUKind] = useState<UncertaintyKind>("absolute");
  const [confidence, setConfidence] = useState<ConfidenceLevel>("1sigma");
  const [useHeaderUnits, setUseHeaderUnits] = useState(true);
  const [mode, setMode] = useState<"replace" | "append">("replace");
  const [outcome, setOutcome] = useState<Outcome | null>(null);

  function inspect(text: string, origin: string, filename?: string) {
    setOutcome(null);
    try {
      const table = inspectTable(text, filename ? { filename } : {});
      setInspected({ table, origin });
      setMapping(table.guessedMapping);
      setUKind(table.guessedUncertaintyKind ?? "absolute");
      setProblem(null);
    } catch (err) {
      setInspected(null);
      setProblem(describeError(err));
    }
  }

  function readFile(file: File) {
    setOutcome(null);
    const tooBig = checkUploadSize(file.size);
    if (tooBig) {
      setProblem(tooBig.message);
      setInspected(null);
      return;
    }
    setProblem(null);
    const reader = new FileReader();
    setProgress({ loaded: 0, total: file.size, name: file.name });
    reader.onprogress = (e) => setProgress({ loaded: e.loaded, total: e.lengthComputable ? e.total : file.size, name: file.name });
    reader.onerror = () => {
      setProgress(null);
      setProblem(`The file ${file.name} could not be read.`);
    };
    reader.onload = () => {
      setProgress(null);
      inspect(String(reader.result ?? ""), `the file ${file.name}`, file.name);
    };
    reader.readAsText(file);
  }

  function takeRows() {
    if (!inspected) return;
    const units = useHeaderUnits ? headerUnits(inspected.table, form) : {};
    const result = importRows(inspected.table, mapping, {
      uncertaintyKind: uKind,
      confidence,
      temperatureUnit: units.T ?? form.units.T,
    });
    setOutcome({ imported: result.rows.length, errors: result.errors, dropped: result.dropped, notices: inspected.table.notices });
    if (result.rows.length === 0) return;
    onRows(result.rows, form.points.length ? mode : "replace", units);
    setInspected(null);
  }

  const table = inspected?.table;
  const suggestedUnits = table ? headerUnits(table, form) : {};
  const roleOf = (col: number) => ROLES.find((r) => mapping[r.role] === col)?.label;

  return (
    <div className="space-y-4 rounded-md border border-line p-4">
      <h3 className="text-base font-semibold">Bring in a table</h3>
      <div className="grid gap-4 md:grid-cols-2">
        <div className="space-y-2">
          <label htmlFor={`${id}-paste`} className="block text-sm font-medium">
            Paste from a spreadsheet
          </label>
          <textarea
            id={`${id}-paste`}
            value={pasted}
            onChange={(e) => setPasted(e.target.value)}
            rows={5}
            spellCheck={false}
            className="field-input font-mono"
            aria-describedby={`${id}-paste-hint`}
          />
          <p id={`${id}-paste-hint`} className="text-xs text-muted">
            Copy the cells (with their header row, if any) and paste them here. Tabs, commas, semicolons or bars separate the columns.
          </p>
          <button
            type="button"
            className="btn-secondary"
            disabled={pasted.trim() === ""}
            onClick={() => inspect(pasted, "the pasted table")}
          >
            Read the pasted table
          </button>
        </div>
        <div className="space-y-2">
          <label htmlFor={`${id}-file`} className="block text-sm font-medium">
            Upload a file
          </label>
          <input
            id={`${id}-file`}
            type="file"
            accept=".csv,.tsv,.tab,.txt,.json,text/csv,text/tab-separated-values,text/plain,application/json"
            aria-describedby={`${id}-file-hint`}
            className="block w-full text-sm file:mr-3 file:rounded-md file:border file:border-line file:bg-panel file:px-3 file:py-2 file:text-sm"
            onChange={(e) => {
              const file = e.target.files?.[0];
              if (file) readFile(file);
              e.target.value = "";
            }}
          />
          <p id={`${id}-file-hint`} className="text-xs text-muted">
            CSV, TSV or JSON, up to {MAX_UPLOAD_BYTES / MIB} MB. Lines starting with # are skipped.
          </p>
          {progress && (
            <div className="space-y-1">
              <label htmlFor={`${id}-progress`} className="block text-xs text-muted">
                Reading {progress.name}…
              </label>
              <progress id={`${id}-progress`} className="w-full accent-accent" max={progress.total || 1} value={progress.loaded}>
                {Math.round((100 * progress.loaded) / (progress.total || 1))} %
              </progress>
            </div>
          )}
        </div>
      </div>

      {problem && (
        <p role="alert" className="rounded-md border border-error/40 bg-panel px-3 py-2 text-sm text-error">
          <span className="font-semibold">Problem: </span>
          {problem}
        </p>
      )}

      {table && inspected && (
        <section aria-labelledby={`${id}-mapping`} className="space-y-4 border-t border-line pt-4">
          <h4 id={`${id}-mapping`} className="text-sm font-semibold">
            What each column holds — {inspected.origin}: {table.rows.length.toLocaleString("en")} row{table.rows.length === 1 ? "" : "s"},{" "}
            {table.format.toUpperCase()}
            {table.hasHeader ? ", with a header row" : ", no header row"}
          </h4>
          <div className="grid gap-3 sm:grid-cols-3 lg:grid-cols-6">
            {ROLES.map(({ role, label }) => (
              <div key={role} className="space-y-1">
                <label htmlFor={`${id}-map-${role}`} className="block text-sm font-medium">
                  {label}
                  {(role === "T" || role === "k") && <span className="font-normal text-muted"> (required)</span>}
                </label>
                <select
                  id={`${id}-map-${role}`}
                  className="field-input"
                  value={mapping[role] === undefined ? "" : String(mapping[role])}
                  onChange={(e) => setMapping((m) => ({ ...m, [role]: e.target.value === "" ? undefined : Number(e.target.value) }))}
                >
                  <option value="">— not in the table —</option>
                  {table.columns.map((c, i) => (
                    <option key={i} value={i}>
                      {c}
                    </option>
                  ))}
                </select>
              </div>
            ))}
          </div>
          {mapping.uncertainty !== undefined && (
            <div className="grid gap-3 sm:grid-cols-2">
              <div className="space-y-1">
                <label htmlFor={`${id}-ukind`} className="block text-sm font-medium">
                  The uncertainty column is
                </label>
                <select
                  id={`${id}-ukind`}
                  className="field-input"
                  value={uKind}
                  onChange={(e) => setUKind(e.target.value as UncertaintyKind)}
                >
                  {UNCERTAINTY_KINDS.map((k) => (
                    <option key={k.id} value={k.id}>
                      {k.label}
                    </option>
                  ))}
                </select>
              </div>
              <div className="space-y-1">
                <label htmlFor={`${id}-conf`} className="block text-sm font-medium">
                  It covers
                </label>
                <select
                  id={`${id}-conf`}
                  className="field-input"
                  value={confidence}
                  onChange={(e) => setConfidence(e.target.value as ConfidenceLevel)}
                >
                  {CONFIDENCE_LEVELS.map((c) => (
                    <option key={c.id} value={c.id}>
                      {c.label}
                    </option>
                  ))}
                </select>
              </div>
            </div>
          )}
          {Object.keys(suggestedUnits).length > 0 && (
            <div className="flex items-start gap-2">
              <input
                id={`${id}-units`}
                type="checkbox"
                checked={useHeaderUnits}
                onChange={(e) => setUseHeaderUnits(e.target.checked)}
                className="mt-1 h-4 w-4 accent-accent"
              />
              <label htmlFor={`${id}-units`} className="text-sm">
                Use the units named in the headers:{" "}
                {[
                  suggestedUnits.T && `T in ${unitLabel("temperature", suggestedUnits.T)}`,
                  suggestedUnits.k && `k in ${unitLabel("rateConstant", suggestedUnits.k)}`,
                  suggestedUnits.pressure && `pressure in ${unitLabel("pressure", suggestedUnits.pressure)}`,
                ]
                  .filter(Boolean)
                  .join(", ")}
              </label>
            </div>
          )}
          {table.notices.length > 0 && (
            <div role="status" className="rounded-md border border-warn/40 bg-panel p-3 text-sm">
              <p className="font-medium">Before you use these rows</p>
              <ul className="mt-1 list-disc space-y-1 pl-5">
                {table.notices.map((n) => (
                  <li key={n}>{n}</li>
                ))}
              </ul>
            </div>
          )}
          <ScrollRegion label="First rows of the imported table">
            <table className="table">
              <caption className="py-1 text-left text-xs text-muted">First {table.preview.length} rows as read</caption>
              <thead>
                <tr>
                  <th scope="col">Row</th>
                  {table.columns.map((c, i) => (
                    <th key={i} scope="col">
                      {c}
                      <span className="block text-xs font-normal">{roleOf(i) ? `→ ${roleOf(i)}` : "not used"}</span>
                    </th>
                  ))}
                </tr>
              </thead>
              <tbody>
                {table.preview.map((row, r) => (
                  <tr key={r}>
                    <td className="text-muted">{r + 1}</td>
                    {table.columns.map((_, c) => (
                      <td key={c} className="font-mono text-xs">
                        {row[c] ?? ""}
                      </td>
                    ))}
                  </tr>
                ))}
              </tbody>
            </table>
          </ScrollRegion>
          {form.points.length > 0 && (
            <fieldset className="space-y-1">
              <legend className="text-sm font-medium">The data already has {form.points.length.toLocaleString("en")} rows</legend>
              <div className="flex flex-wrap gap-4 text-sm">
                <label className="flex items-center gap-2">
                  <input
                    type="radio"
                    name={`${id}-mode`}
                    checked={mode === "replace"}
                    onChange={() => setMode("replace")}
                    className="accent-accent"
                  />{" "}
                  Replace them
                </label>
                <label className="flex items-center gap-2">
                  <input
                    type="radio"
                    name={`${id}-mode`}
                    checked={mode === "append"}
                    onChange={() => setMode("append")}
                    className="accent-accent"
                  />{" "}
                  Add these after them
                </label>
              </div>
            </fieldset>
          )}
          <div className="flex flex-wrap gap-3">
            <button type="button" className="btn-primary" onClick={takeRows}>
              Use these rows
            </button>
            <button type="button" className="btn-secondary" onClick={() => setInspected(null)}>
              Cancel
            </button>
          </div>
        </section>
      )}

      {outcome && (
        <div role={outcome.errors.length ? "alert" : "status"} className="space-y-2 text-sm">
          {outcome.imported > 0 && (
            <p className="text-ok">
              {outcome.imported.toLocaleString("en")} row{outcome.imported === 1 ? "" : "s"} brought into the data table
              {outcome.errors.length > 0 && outcome.dropped === 0
                ? "; rows with problems are kept there as typed, marked, for you to correct."
                : "."}
            </p>
          )}
          {outcome.dropped > 0 && (
            <p className="text-error">
              {outcome.dropped.toLocaleString("en")} rows with problems were left out; correct the file and bring it in again to keep them.
            </p>
          )}
          {outcome.errors.length > 0 && (
            <div className="rounded-md border border-error/40 bg-panel px-3 py-2 text-error">
              <p className="font-semibold">
                Problems in the table as it was brought in (row numbers count data rows of the table, from 1; correct them in the rows
                below):
              </p>
              <ul className="mt-1 max-h-60 list-disc space-y-0.5 overflow-y-auto pl-5">
                {outcome.errors.map((e, i) => (
                  <li key={i}>{e.message}</li>
                ))}
              </ul>
            </div>
          )}
          {outcome.imported > 0 && outcome.notices.length > 0 && (
            <div className="rounded-md border border-warn/40 bg-panel px-3 py-2">
              <p className="font-semibold">Read with a change:</p>
              <ul className="mt-1 list-disc space-y-0.5 pl-5">
                {outcome.notices.map((n) => (
                  <li key={n}>{n}</li>
                ))}
              </ul>
            </div>
          )}
        </div>
      )}
    </div>
  );
}
