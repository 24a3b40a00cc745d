"use client";

import { useState } from "react";
import { CONFIDENCE_LEVELS } from "@/lib/deposits/vocabulary";
import { useEditorContext } from "./editor-context";
import { FieldMessages, NumberField, SelectField, TextField } from "./fields";
import { blankPoint, type EditorForm, type PointRow } from "./form-model";
import { fieldId } from "./pointers";
import { ROW_WINDOW, visibleRows, windowStartFor } from "./row-window";
import { removeAt, replaceAt, type SectionProps } from "./section-props";
import { ScrollRegion } from "@/components/scroll-region";

const KIND_SHORT = [
  { value: "absolute", label: "± in k's unit" },
  { value: "relative", label: "± %" },
  { value: "factor", label: "factor f" },
];

const COVERAGE_SHORT = [
  { value: "", label: "not stated (1σ)" },
  ...CONFIDENCE_LEVELS.map((c) => ({ value: c.id, label: c.id === "1sigma" ? "1σ" : "2σ" })),
];

function RowMessages({ index }: { index: number }) {
  const { messagesFor } = useEditorContext();
  const messages = messagesFor(`/points/${index}`);
  if (!messages.length) return null;
  return <FieldMessages id={fieldId(`/points/${index}`)} messages={messages} />;
}

/**
 * The data as an editable table. A large table shows ROW_WINDOW rows at a time, with controls to move
 * through it; all rows are kept and saved.
 */
export function PointsTable({
  form,
  update,
  windowStart,
  onWindowStart,
  kLabel,
  TLabel,
}: SectionProps & { windowStart: number; onWindowStart: (start: number) => void; kLabel: string; TLabel: string }) {
  const { readOnly, clearErrors, messagesFor } = useEditorContext();
  const rowHasProblem = (i: number) =>
    ["", "/T", "/k", "/uncertainty", "/pressure", "/bathGas", "/note"].some((leaf) => messagesFor(`/points/${i}${leaf}`).length > 0);
  const [goTo, setGoTo] = useState("");
  const total = form.points.length;
  const { from, to, windowed } = visibleRows(total, windowStart);
  const showPressure = form.points.some((p) => p.pressure.trim() !== "");
  const showBathGas = form.points.some((p) => p.bathGas.trim() !== "");
  const pressureLabel = form.units.pressure;

  const setRow = (i: number, patch: Partial<PointRow>) =>
    update((f) => ({ ...f, points: replaceAt(f.points, i, (p) => ({ ...p, ...patch })) }));
  const removeRow = (i: number) => {
    // Rows after this one move up: the server's row problems no longer match their rows.
    clearErrors("/points");
    update((f) => ({ ...f, points: removeAt(f.points, i) }));
  };
  const addRow = () => {
    const last = form.points[form.points.length - 1];
    update((f: EditorForm) => ({ ...f, points: [...f.points, blankPoint(last?.uKind, last?.uConfidence)] }));
    onWindowStart(windowStartFor(total));
  };

  if (total === 0) {
    return (
      <div className="space-y-2">
        <p className="text-sm text-muted">No rows yet. Bring in a table above, or add rows one by one.</p>
        {!readOnly && (
          <button type="button" className="btn-secondary" onClick={addRow}>
            Add a row
          </button>
        )}
      </div>
    );
  }

  return (
    <div className="space-y-3">
      {windowed && (
        <nav
          aria-label="Rows of the data table"
          className="flex flex-wrap items-end gap-3 rounded-md border border-line bg-paper px-3 py-2 text-sm"
        >
          <p className="mr-auto">
            Showing rows {(from + 1).toLocaleString("en")}–{to.toLocaleString("en")} of {total.toLocaleString("en")}. Large tables show{" "}
            {ROW_WINDOW} rows at a time; every row is kept and saved.
          </p>
          <button type="button" className="btn-secondary" disabled={from === 0} onClick={() => onWindowStart(from - ROW_WINDOW)}>
            Previous {ROW_WINDOW}
          </button>
          <button type="button" className="btn-secondary" disabled={to >= total} onClick={() => onWindowStart(from + ROW_WINDOW)}>
            Next {ROW_WINDOW}
          </button>
          <form
            className="flex items-end gap-2"
            onSubmit={(e) => {
              e.preventDefault();
              const n = Number(goTo);
              if (Number.isInteger(n) && n >= 1 && n <= total) onWindowStart(windowStartFor(n - 1));
            }}
          >
            <label className="space-y-1">
              <span className="block text-xs">Go to row</span>
              <input type="text" inputMode="numeric" value={goTo} onChange={(e) => setGoTo(e.target.value)} className="field-input w-24" />
            </label>
            <button type="submit" className="btn-secondary">
              Show
            </button>
          </form>
        </nav>
      )}
      <ScrollRegion label="Data rows" scrollClassName="max-h-[36rem] overflow-auto rounded-md border border-line">
        <table className="table">
          <caption className="sr-only">Data rows: temperature, rate constant, uncertainty and note</caption>
          <thead className="sticky top-0 z-10 bg-panel">
            <tr>
              <th scope="col">Row</th>
              <th scope="col">T ({TLabel})</th>
              <th scope="col">k ({kLabel})</th>
              <th scope="col">Uncertainty</th>
              <th scope="col">Stated as</th>
              <th scope="col">Covers</th>
              {showPressure && <th scope="col">Pressure ({pressureLabel})</th>}
              {showBathGas && <th scope="col">Bath gas</th>}
              <th scope="col">Note</th>
              {!readOnly && (
                <th scope="col">
                  <span className="sr-only">Remove</span>
                </th>
              )}
            </tr>
          </thead>
          <tbody>
            {form.points.slice(from, to).map((p, j) => {
              const i = from + j;
              const n = i + 1;
              return (
                <tr key={i} id={fieldId(`/points/${i}`)} className={`scroll-mt-24 ${rowHasProblem(i) ? "bg-error/5" : ""}`}>
                  <th scope="row" className="font-normal text-muted">
                    {n}
                    <RowMessages index={i} />
                  </th>
                  <td className="min-w-28">
                    <NumberField
                      pointer={`/points/${i}/T`}
                      label={`T, row ${n}`}
                      hideLabel
                      value={p.T}
                      onChange={(v) => setRow(i, { T: v })}
                    />
                  </td>
                  <td className="min-w-36">
                    <NumberField
                      pointer={`/points/${i}/k`}
                      label={`k, row ${n}`}
                      hideLabel
                      value={p.k}
                      onChange={(v) => setRow(i, { k: v })}
                    />
                  </td>
                  <td className="min-w-28">
                    <NumberField
                      pointer={`/points/${i}/uncertainty`}
                      label={`Uncertainty, row ${n}`}
                      hideLabel
                      value={p.u}
                      onChange={(v) => setRow(i, { u: v })}
                    />
                  </td>
                  <td className="min-w-32">
                    <SelectField
                      pointer={`/points/${i}/uncertainty/kind`}
                      label={`Uncertainty stated as, row ${n}`}
                      hideLabel
                      value={p.uKind}
                      onChange={(v) => setRow(i, { uKind: v as PointRow["uKind"] })}
                      options={KIND_SHORT}
                    />
                  </td>
                  <td className="min-w-32">
                    <SelectField
                      pointer={`/points/${i}/uncertainty/confidence`}
                      label={`Uncertainty covers, row ${n}`}
                      hideLabel
                      value={p.uConfidence}
                      onChange={(v) => setRow(i, { uConfidence: v as PointRow["uConfidence"] })}
                      options={COVERAGE_SHORT}
                    />
                  </td>
                  {showPressure && (
                    <td className="min-w-24">
                      <NumberField
                        pointer={`/points/${i}/pressure`}
                        label={`Pressure, row ${n}`}
                        hideLabel
                        value={p.pressure}
                        onChange={(v) => setRow(i, { pressure: v })}
                      />
                    </td>
                  )}
                  {showBathGas && (
                    <td className="min-w-24">
                      <TextField
                        pointer={`/points/${i}/bathGas`}
                        label={`Bath gas, row ${n}`}
                        hideLabel
                        value={p.bathGas}
                        onChange={(v) => setRow(i, { bathGas: v })}
                      />
                    </td>
                  )}
                  <td className="min-w-40">
                    <TextField
                      pointer={`/points/${i}/note`}
                      label={`Note, row ${n}`}
                      hideLabel
                      value={p.note}
                      onChange={(v) => setRow(i, { note: v })}
                    />
                  </td>
                  {!readOnly && (
                    <td>
                      <button type="button" className="btn-secondary px-2 py-1" onClick={() => removeRow(i)}>
                        Remove<span className="sr-only"> row {n}</span>
                      </button>
                    </td>
                  )}
                </tr>
              );
            })}
          </tbody>
        </table>
      </ScrollRegion>
      {!readOnly && (
        <button type="button" className="btn-secondary" onClick={addRow}>
          Add a row
        </button>
      )}
    </div>
  );
}
