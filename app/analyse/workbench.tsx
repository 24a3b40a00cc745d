"use client";

import { useCallback, useEffect, useRef, useState } from "react";
import { ArrheniusPlot } from "@/components/arrhenius-plot";
import { ResultTables } from "@/components/result-tables";
import { SUPPORTED_UNITS, convertEnergy, displayConversion, fromCanonicalRateConstant } from "@/lib/kinetics/units";
import type { ReactionOrder } from "@/lib/kinetics/types";
import type { ExportFormat, FitProblem, WorkbenchReply, WorkbenchRequest } from "./workbench-protocol";

const EXAMPLE = `# T/K   k/(cm3 molecule-1 s-1)
250   2.09e-15
270   3.31e-15
290   4.90e-15
310   6.92e-15
330   9.40e-15
350   1.23e-14
375   1.66e-14
400   2.17e-14`;

// Pasted text is read this long after the last keystroke.
const READ_DELAY_MS = 150;
// A text box holding 100 000 lines blocks the page for seconds whenever the browser lays it out
// (and Chromium inserts pasted lines one by one: minutes for 100 000). A paste larger than this is
// kept beside the box, summarised, and read from there; the person can still open it as text.
const LARGE_PASTE_CHARS = 20_000;

type Parsed = Extract<WorkbenchReply, { type: "parsed" }>;
type Fitted = Extract<WorkbenchReply, { type: "fitted" }> & { order: ReactionOrder; kUnit: string; TUnit: string };

/**
 * The worker that reads, fits and exports off the main thread, and a send function whose answers
 * come back to `onReply`. Each request carries a sequence number so a late answer to older text
 * is recognised and dropped.
 */
function useWorkbenchWorker(onReply: (reply: WorkbenchReply) => void) {
  const worker = useRef<Worker | null>(null);
  const handler = useRef(onReply);
  useEffect(() => {
    handler.current = onReply;
  });
  useEffect(() => {
    const w = new Worker(new URL("./workbench-worker.ts", import.meta.url), { type: "module" });
    w.onmessage = (e: MessageEvent<WorkbenchReply>) => handler.current(e.data);
    worker.current = w;
    return () => w.terminate();
  }, []);
  return useCallback((message: WorkbenchRequest) => worker.current?.postMessage(message), []);
}

export function AnalyseWorkbench() {
  // The textarea is left uncontrolled: React writing 100 000 lines back into it on every change
  // (value and default value) blocked the page for seconds; the worker reads the text instead.
  const textarea = useRef<HTMLTextAreaElement>(null);
  const readTimer = useRef<ReturnType<typeof setTimeout> | undefined>(undefined);
  const pastedText = useRef<string | null>(null);
  const [largePaste, setLargePaste] = useState<{ lines: number; chars: number } | null>(null);
  const [order, setOrder] = useState<ReactionOrder>(2);
  const [kUnit, setKUnit] = useState("cm3 molecule-1 s-1");
  const [TUnit, setTUnit] = useState("K");
  const [energyUnit, setEnergyUnit] = useState("kJ mol-1");
  const [parsed, setParsed] = useState<Parsed | null>(null);
  const [fitting, setFitting] = useState(false);
  const [result, setResult] = useState<Fitted | null>(null);
  const [problem, setProblem] = useState<FitProblem | null>(null);
  const seq = useRef(0);
  const textSeq = useRef(0);
  const fitSeq = useRef(-1);
  const fitArgs = useRef<{ order: ReactionOrder; kUnit: string; TUnit: string } | null>(null);

  const send = useWorkbenchWorker((reply) => {
    if (reply.type === "parsed") {
      if (reply.seq === textSeq.current) setParsed(reply);
    } else if (reply.type === "fitted" || reply.type === "fit-failed") {
      if (reply.seq !== fitSeq.current) return; // the text or a unit changed since
      setFitting(false);
      if (reply.type === "fitted") setResult({ ...reply, ...fitArgs.current! });
      else setProblem(reply.problem);
    } else if (reply.type === "exported") {
      const url = URL.createObjectURL(reply.blob);
      const a = document.createElement("a");
      a.href = url;
      a.download = `arrhenia-fit.${reply.format}`;
      a.click();
      setTimeout(() => URL.revokeObjectURL(url), 10_000);
    }
  });

  // Any change to the text, a unit or the order makes the result and any error stale: both go.
  const clearOutcome = useCallback(() => {
    fitSeq.current = -1;
    setFitting(false);
    setResult(null);
    setProblem(null);
  }, []);

  const readText = useCallback(() => {
    const s = ++seq.current;
    textSeq.current = s;
    clearTimeout(readTimer.current);
    readTimer.current = setTimeout(
      () => send({ type: "parse", seq: s, text: pastedText.current ?? textarea.current?.value ?? "" }),
      READ_DELAY_MS,
    );
  }, [send]);

  useEffect(() => {
    readText();
    return () => clearTimeout(readTimer.current);
  }, [readText]);

  function textChanged() {
    setParsed(null);
    clearOutcome();
    readText();
  }

  function paste(event: React.ClipboardEvent<HTMLTextAreaElement>) {
    const pasted = event.clipboardData.getData("text/plain");
    if (pasted.length < LARGE_PASTE_CHARS) return;
    event.preventDefault();
    const el = event.currentTarget;
    const text = el.value.slice(0, el.selectionStart) + pasted + el.value.slice(el.selectionEnd);
    pastedText.current = text;
    let lines = 1;
    for (let i = text.indexOf("\n"); i >= 0; i = text.indexOf("\n", i + 1)) lines++;
    setLargePaste({ lines, chars: text.length });
    textChanged();
  }

  /** Back to the text box: with the large paste in it (slow, but editable), or empty. */
  function leaveLargePaste(keep: boolean) {
    const text = keep ? (pastedText.current ?? "") : "";
    pastedText.current = null;
    setLargePaste(null);
    requestAnimationFrame(() => {
      if (textarea.current) textarea.current.value = text;
      textChanged();
    });
  }

  function changeKUnit(next: string) {
    setKUnit(next);
    clearOutcome();
  }

  function changeTUnit(next: string) {
    setTUnit(next);
    clearOutcome();
  }

  function changeOrder(next: ReactionOrder) {
    clearOutcome();
    setOrder(next);
    setKUnit(SUPPORTED_UNITS.rateConstant[next][0].id);
  }

  const ready = parsed !== null && parsed.errorCount === 0 && parsed.count >= 2;

  function submit(event: React.FormEvent) {
    event.preventDefault();
    if (!ready) return;
    const s = ++seq.current;
    fitSeq.current = s;
    fitArgs.current = { order, kUnit, TUnit };
    setProblem(null);
    setResult(null);
    setFitting(true);
    send({ type: "fit", seq: s, order, kUnit, TUnit });
  }

  function download(format: ExportFormat) {
    send({ type: "export", seq: ++seq.current, format, energyUnit });
  }

  const rOrder = result?.order ?? order;
  const rKUnit = result?.kUnit ?? kUnit;
  const kLabel = SUPPORTED_UNITS.rateConstant[rOrder].find((u) => u.id === rKUnit)?.label ?? rKUnit;
  const canonicalLabel = SUPPORTED_UNITS.rateConstant[rOrder][0].label;

  return (
    <div className="space-y-8">
      <form onSubmit={submit} className="card grid gap-6 md:grid-cols-[1fr_18rem]" aria-describedby="paste-help">
        <div className="min-w-0 space-y-2">
          <label htmlFor="points" className="block text-sm font-medium">
            Data: temperature and rate constant, one point per line (optional third column: σ of ln k)
          </label>
          {largePaste && (
            <div
              id="large-paste"
              className="rounded-md border border-line bg-panel px-3 py-2 text-sm"
              role="group"
              aria-label="Pasted data"
            >
              <p>
                {largePaste.lines.toLocaleString("en")} lines pasted ({(largePaste.chars / 1_000_000).toFixed(1)} MB), kept out of the text
                box so the page stays quick. Everything pasted is read and fitted.
              </p>
              <div className="mt-2 flex flex-wrap gap-3">
                <button type="button" className="btn-secondary py-1" onClick={() => leaveLargePaste(true)}>
                  Edit as text (slow)
                </button>
                <button type="button" className="btn-secondary py-1" onClick={() => leaveLargePaste(false)}>
                  Clear
                </button>
              </div>
            </div>
          )}
          <textarea
            hidden={largePaste !== null}
            id="points"
            ref={textarea}
            defaultValue={EXAMPLE}
            onChange={textChanged}
            onPaste={paste}
            rows={12}
            spellCheck={false}
            className="field-input font-mono"
            aria-invalid={(parsed?.errorCount ?? 0) > 0}
            aria-describedby="paste-help row-errors"
          />
          <p id="paste-help" className="text-xs text-muted">
            Paste from a spreadsheet: tabs, commas, semicolons or spaces separate columns; when tabs or semicolons do, a comma in a number
            is read as a decimal comma (2,09e-15 = 2.09e-15). A header line and lines starting with # are skipped; lines are counted as you
            see them. Up to 100 000 points.{" "}
            <span aria-live="polite">
              {parsed === null ? "Reading…" : `${parsed.count.toLocaleString("en")} point${parsed.count === 1 ? "" : "s"} read.`}
            </span>
          </p>
          {parsed && parsed.errorCount > 0 && (
            <ul id="row-errors" role="alert" className="space-y-1 text-sm text-error">
              {parsed.errors.map((e) => (
                <li key={e.line}>{e.message}</li>
              ))}
              {parsed.errorCount > parsed.errors.length && (
                <li>… and {(parsed.errorCount - parsed.errors.length).toLocaleString("en")} more lines</li>
              )}
            </ul>
          )}
        </div>
        <div className="space-y-4">
          <Select
            label="Reaction order"
            value={String(order)}
            onChange={(v) => changeOrder(Number(v) as ReactionOrder)}
            options={[
              ["1", "1 (unimolecular)"],
              ["2", "2 (bimolecular)"],
              ["3", "3 (termolecular)"],
            ]}
          />
          <Select
            label="Unit of k"
            value={kUnit}
            onChange={changeKUnit}
            options={SUPPORTED_UNITS.rateConstant[order].map((u) => [u.id, u.label])}
          />
          <Select
            label="Unit of T"
            value={TUnit}
            onChange={changeTUnit}
            options={SUPPORTED_UNITS.temperature.map((u) => [u.id, u.label])}
          />
          <Select
            label="Show energies in"
            value={energyUnit}
            onChange={setEnergyUnit}
            options={SUPPORTED_UNITS.energy.map((u) => [u.id, u.label])}
          />
          <button type="submit" className="btn-primary w-full" disabled={fitting || !ready} aria-describedby="fit-needs">
            {fitting ? "Fitting…" : "Fit"}
          </button>
          <p id="fit-needs" className="text-xs text-muted">
            {parsed === null
              ? "Reading the pasted lines…"
              : parsed.errorCount > 0
                ? "Correct the lines marked above to fit."
                : parsed.count < 2
                  ? "Paste at least two points at two different temperatures."
                  : "Changing the data, a unit or the order clears the result; fit again."}
          </p>
        </div>
      </form>

      {problem && (
        <div role="alert" className="card border-error/40 text-sm text-error">
          <p className="font-medium">{problem.title}</p>
          <ul className="mt-1 list-disc pl-5">
            {problem.errors.map((e, i) => (
              <li key={i}>
                {e.line ? `line ${e.line}: ` : e.pointer ? `${e.pointer}: ` : ""}
                {e.message}
              </li>
            ))}
          </ul>
        </div>
      )}

      {result && (
        <section aria-labelledby="result-heading" className="space-y-6">
          <h2 id="result-heading" className="text-2xl font-semibold">
            Result
          </h2>
          <p className="rounded-md border border-warn/40 bg-panel px-3 py-2 text-sm text-warn">{result.response.caution}</p>
          <div className="card">
            <ArrheniusPlot
              kUnitLabel={canonicalLabel}
              band={result.response.analysis.band}
              points={result.drawn}
              totalPoints={result.total}
              tableHref="#fit-downloads"
            />
          </div>
          <ResultTables
            analysis={result.response.analysis}
            order={result.order}
            kUnit={result.kUnit}
            kLabel={kLabel}
            energyUnit={energyUnit}
            convertK={(k) => displayConversion(() => fromCanonicalRateConstant(k, result.kUnit, result.order))}
            convertE={(e) => displayConversion(() => convertEnergy(e, "J mol-1", energyUnit))}
            temperatureUnit={result.TUnit}
            lineOf={(i) => result.flagLines[i]}
          />
          <section id="fit-downloads" aria-labelledby="downloads-heading" className="card space-y-2">
            <h3 id="downloads-heading" className="text-lg font-semibold">
              Download the fit
            </h3>
            <p className="text-sm text-muted">
              The parameters with their units (energies in the unit chosen above), the caution above, and for every point its line, the
              fitted k of each model and the ln k residual.
            </p>
            <div className="flex flex-wrap gap-3">
              <button type="button" className="btn-secondary" onClick={() => download("csv")}>
                Download CSV
              </button>
              <button type="button" className="btn-secondary" onClick={() => download("json")}>
                Download JSON
              </button>
            </div>
          </section>
        </section>
      )}
    </div>
  );
}

function Select({
  label,
  value,
  onChange,
  options,
}: {
  label: string;
  value: string;
  onChange: (v: string) => void;
  options: (readonly [string, string])[] | [string, string][];
}) {
  const id = `select-${label.toLowerCase().replace(/\W+/g, "-")}`;
  return (
    <div className="space-y-1">
      <label htmlFor={id} className="block text-sm font-medium">
        {label}
      </label>
      <select id={id} value={value} onChange={(e) => onChange(e.target.value)} className="field-input">
        {options.map(([v, l]) => (
          <option key={v} value={v}>
            {l}
          </option>
        ))}
      </select>
    </div>
  );
}
