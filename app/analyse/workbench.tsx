"use client";

import { useMutation } from "@tanstack/react-query";
import { useMemo, useState } from "react";
import { ArrheniusPlot } from "@/components/arrhenius-plot";
import type { AnalysisResponse } from "@/lib/analyses/analyse-request";
import { parseColumns } from "@/lib/analyses/parse-columns";
import {
  SUPPORTED_UNITS,
  convertEnergy,
  displayConversion,
  fromCanonicalRateConstant,
  toCanonicalRateConstant,
  toKelvin,
} from "@/lib/kinetics/units";
import type { ReactionOrder } from "@/lib/kinetics/types";
import { ResultTables } from "@/components/result-tables";

interface Problem {
  title: string;
  errors?: { pointer: string; message: string }[];
}

const EXAMPLE = `# T/K   k/(cm3 molecule-1 s-1)
250   2.09e-15
270   3.31e-15
290   4.90e-15
310   6.92e-15
330   9.40e-15
350   1.23e-14
375   1.66e-14
400   2.17e-14`;

async function postAnalysis(body: unknown): Promise<AnalysisResponse> {
  const res = await fetch("/api/v1/analyses", {
    method: "POST",
    headers: { "content-type": "application/json" },
    body: JSON.stringify(body),
  });
  const json = await res.json().catch(() => ({ title: `The server answered ${res.status}` }));
  if (!res.ok) throw json as Problem;
  return json as AnalysisResponse;
}

export function AnalyseWorkbench() {
  const [text, setText] = useState(EXAMPLE);
  const [order, setOrder] = useState<ReactionOrder>(2);
  const [kUnit, setKUnit] = useState("cm3 molecule-1 s-1");
  const [TUnit, setTUnit] = useState("K");
  const [energyUnit, setEnergyUnit] = useState("kJ mol-1");
  const parsed = useMemo(() => parseColumns(text), [text]);
  const mutation = useMutation<AnalysisResponse, Problem, { lines: number[]; body: unknown }>({
    mutationFn: ({ body }) => postAnalysis(body),
  });

  // A result belongs to the units and order it was fitted with: changing them clears it.
  function changeKUnit(next: string) {
    setKUnit(next);
    mutation.reset();
  }

  function changeTUnit(next: string) {
    setTUnit(next);
    mutation.reset();
  }

  function changeOrder(next: ReactionOrder) {
    mutation.reset();
    setOrder(next);
    setKUnit(SUPPORTED_UNITS.rateConstant[next][0].id);
  }

  function submit(event: React.FormEvent) {
    event.preventDefault();
    if (parsed.errors.length || parsed.points.length < 2) return;
    mutation.mutate({ lines: parsed.lines, body: { points: parsed.points, order, units: { k: kUnit, T: TUnit } } });
  }

  // Map "/points/3/T" in an API error back to the pasted line.
  const lineOf = (pointer: string) => {
    const m = /^\/points\/(\d+)/.exec(pointer);
    return m ? parsed.lines[Number(m[1])] : undefined;
  };
  const result = mutation.data;
  const outliers = new Set(result?.analysis.flags.filter((f) => f.code === "outlier").flatMap((f) => f.points ?? []) ?? []);
  const kLabel = SUPPORTED_UNITS.rateConstant[order].find((u) => u.id === kUnit)?.label ?? kUnit;
  const canonicalLabel = SUPPORTED_UNITS.rateConstant[order][0].label;

  return (
    <div className="space-y-8">
      <form onSubmit={submit} className="card grid gap-6 md:grid-cols-[1fr_18rem]" aria-describedby="paste-help">
        <div className="space-y-2">
          <label htmlFor="points" className="block text-sm font-medium">
            Data: temperature and rate constant, one point per line (optional third column: σ of ln k)
          </label>
          <textarea
            id="points"
            value={text}
            onChange={(e) => setText(e.target.value)}
            rows={12}
            spellCheck={false}
            className="field-input font-mono"
            aria-invalid={parsed.errors.length > 0}
            aria-describedby="paste-help row-errors"
          />
          <p id="paste-help" className="text-xs text-muted">
            Paste from a spreadsheet: tabs, commas, semicolons or spaces separate columns; a header line and lines starting with # are
            skipped. {parsed.points.length} point{parsed.points.length === 1 ? "" : "s"} read.
          </p>
          {parsed.errors.length > 0 && (
            <ul id="row-errors" role="alert" className="space-y-1 text-sm text-error">
              {parsed.errors.slice(0, 10).map((e) => (
                <li key={e.line}>{e.message}</li>
              ))}
              {parsed.errors.length > 10 && <li>… and {parsed.errors.length - 10} more lines</li>}
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
          <button
            type="submit"
            className="btn-primary w-full"
            disabled={mutation.isPending || parsed.errors.length > 0 || parsed.points.length < 2}
            aria-describedby="fit-needs"
          >
            {mutation.isPending ? "Fitting…" : "Fit"}
          </button>
          <p id="fit-needs" className="text-xs text-muted">
            {parsed.errors.length > 0
              ? "Correct the lines marked above to fit."
              : parsed.points.length < 2
                ? "Paste at least two points at two different temperatures."
                : "Changing a unit or the order clears the result; fit again."}
          </p>
        </div>
      </form>

      {mutation.isError && (
        <div role="alert" className="card border-error/40 text-sm text-error">
          <p className="font-medium">{mutation.error.title}</p>
          <ul className="mt-1 list-disc pl-5">
            {(mutation.error.errors ?? []).slice(0, 10).map((e, i) => (
              <li key={i}>
                {lineOf(e.pointer) ? `line ${lineOf(e.pointer)}: ` : e.pointer ? `${e.pointer}: ` : ""}
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
          <p className="rounded-md border border-warn/40 bg-panel px-3 py-2 text-sm text-warn">{result.caution}</p>
          <div className="card">
            <ArrheniusPlot
              kUnitLabel={canonicalLabel}
              band={result.analysis.band}
              points={parsed.points.map((p, i) => ({
                T: toKelvin(p.T, TUnit),
                lnk: Math.log(toCanonicalRateConstant(p.k, kUnit, order)),
                outlier: outliers.has(i),
              }))}
            />
          </div>
          <ResultTables
            analysis={result.analysis}
            order={order}
            kUnit={kUnit}
            kLabel={kLabel}
            energyUnit={energyUnit}
            convertK={(k) => displayConversion(() => fromCanonicalRateConstant(k, kUnit, order))}
            convertE={(e) => displayConversion(() => convertEnergy(e, "J mol-1", energyUnit))}
            temperatureUnit={TUnit}
            lineOf={(i) => parsed.lines[i]}
          />
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
