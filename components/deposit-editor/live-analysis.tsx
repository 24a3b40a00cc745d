"use client";

import { keepPreviousData, useQuery } from "@tanstack/react-query";
import { useMemo, useState } from "react";
import { ArrheniusPlot, type PlotPoint } from "@/components/arrhenius-plot";
import { ResultTables } from "@/components/result-tables";
import { useDebouncedValue } from "@/components/use-debounced-value";
import type { AnalysisResponse } from "@/lib/analyses/analyse-request";
import {
  SUPPORTED_UNITS,
  convertEnergy,
  displayConversion,
  fromCanonicalRateConstant,
  getCanonicalRateConstantUnit,
  toCanonicalRateConstant,
  toKelvin,
} from "@/lib/kinetics/units";
import { buildAnalysisRequest, hashText, unfittableWords, type BuiltAnalysisRequest } from "./analysis-request";
import type { EditorForm } from "./form-model";
import { plainWhat } from "./editor-messages";
import { pointRowOf } from "./pointers";
import { lowerFirst } from "@/lib/deposits/messages";

/** How long the data must stay unchanged before they are fitted again. */
export const ANALYSIS_DELAY_MS = 600;

interface Problem {
  status: number;
  title: string;
  errors?: { pointer: string; message: string }[];
}

interface Fitted {
  response: AnalysisResponse;
  built: BuiltAnalysisRequest;
}

async function postAnalysis(bodyText: string, signal: AbortSignal): Promise<AnalysisResponse> {
  let res: Response;
  try {
    res = await fetch("/api/v1/analyses", { method: "POST", headers: { "content-type": "application/json" }, body: bodyText, signal });
  } catch (err) {
    if ((err as Error).name === "AbortError") throw err;
    throw {
      status: 0,
      title: "The analysis service could not be reached; check the connection. The plot will update when it is back.",
    } satisfies Problem;
  }
  const json = await res.json().catch(() => null);
  if (!res.ok)
    throw {
      status: res.status,
      title: (json as { title?: string } | null)?.title ?? "",
      errors: (json as { errors?: Problem["errors"] } | null)?.errors,
    } satisfies Problem;
  return json as AnalysisResponse;
}

/** An API problem in plain words, with rows numbered as in the table. */
export function describeAnalysisProblem(problem: Problem, rows: number[]): { summary: string; details: string[] } {
  switch (problem.status) {
    case 0:
      return { summary: problem.title, details: [] };
    case 429:
      return { summary: "Too many fits from this network in the last minute; the plot will update again shortly.", details: [] };
    case 413:
      return {
        summary: "The data are too large to fit while you type. Saving still works, and the saved draft is analysed in full.",
        details: [],
      };
    case 422: {
      const details = (problem.errors ?? []).slice(0, 10).map((e) => {
        // The same translation as every other editor message, with the row as the table numbers it.
        const index = pointRowOf(e.pointer);
        const what = plainWhat(e.pointer, e.message);
        if (index !== null) {
          const field = /^\/points\/\d+\/(T|k|sigmaLnK)$/.exec(e.pointer)?.[1];
          const fieldWords = field === "sigmaLnK" ? "uncertainty" : field;
          return `Row ${(rows[index] ?? index) + 1}${fieldWords ? `, ${fieldWords}` : ""}: ${lowerFirst(what)}`;
        }
        if (e.pointer === "/units/k") return `Unit of k: ${lowerFirst(what)}`;
        if (e.pointer === "/units/T") return `Unit of T: ${lowerFirst(what)}`;
        return what;
      });
      return { summary: "These data cannot be fitted yet.", details: details.length ? details : [problem.title] };
    }
    default:
      return {
        summary: `The fit could not be run just now (the server answered ${problem.status}). Your data are unaffected.`,
        details: [],
      };
  }
}

function plotPoints(fitted: Fitted): PlotPoint[] | null {
  const { body } = fitted.built;
  const outliers = new Set(fitted.response.analysis.flags.filter((f) => f.code === "outlier").flatMap((f) => f.points ?? []));
  try {
    return body.points.map((p, i) => ({
      T: toKelvin(p.T, body.units.T),
      lnk: Math.log(toCanonicalRateConstant(p.k, body.units.k, body.order)),
      outlier: outliers.has(i),
    }));
  } catch {
    return null;
  }
}

/** The fit of the rows as they stand, refreshed a moment after each change. */
export function LiveAnalysis({ form }: { form: EditorForm }) {
  const built = useMemo(
    () => buildAnalysisRequest(form.points, form.reaction.order, form.units),
    [form.points, form.reaction.order, form.units],
  );
  const settled = useDebouncedValue(built, ANALYSIS_DELAY_MS);
  const bodyText = useMemo(() => JSON.stringify(settled.body), [settled]);
  const enough = settled.body.points.length >= 2;
  const [energyUnit, setEnergyUnit] = useState("kJ mol-1");

  const query = useQuery<Fitted, Problem>({
    queryKey: ["deposit-analysis", hashText(bodyText)],
    queryFn: async ({ signal }) => ({ response: await postAnalysis(bodyText, signal), built: settled }),
    enabled: enough,
    placeholderData: keepPreviousData,
    retry: false,
    staleTime: Infinity,
    refetchOnWindowFocus: false,
  });

  const fitted = enough ? query.data : undefined;
  const order = fitted?.built.body.order ?? form.reaction.order;
  const kUnit = fitted?.built.body.units.k ?? form.units.k;
  const kLabel = SUPPORTED_UNITS.rateConstant[order].find((u) => u.id === kUnit)?.label ?? kUnit;
  const points = fitted ? plotPoints(fitted) : null;
  const problem = enough && query.isError ? describeAnalysisProblem(query.error, settled.rows) : null;
  const pending = built !== settled || query.isFetching;

  return (
    <section id="section-analysis" aria-labelledby="analysis-heading" className="card scroll-mt-6 space-y-4">
      <div className="flex flex-wrap items-end justify-between gap-3">
        <div>
          <h2 id="analysis-heading" className="font-serif text-xl font-semibold">
            Fit of the current rows
          </h2>
          <p className="text-sm text-muted">
            Fitted the way every dataset here is fitted, a moment after each change. Nothing is stored until you save.
          </p>
        </div>
        <div className="space-y-1">
          <label htmlFor="analysis-energy-unit" className="block text-sm font-medium">
            Show energies in
          </label>
          <select id="analysis-energy-unit" className="field-input" value={energyUnit} onChange={(e) => setEnergyUnit(e.target.value)}>
            {SUPPORTED_UNITS.energy.map((u) => (
              <option key={u.id} value={u.id}>
                {u.label}
              </option>
            ))}
          </select>
        </div>
      </div>
      <p role="status" aria-live="polite" className="text-sm text-muted">
        {!enough
          ? "Add at least two rows with a temperature and a rate constant to see the fit."
          : pending
            ? "Updating the fit…"
            : problem
              ? ""
              : `Fitted ${settled.body.points.length.toLocaleString("en")} rows.`}
        {enough &&
          settled.skipped > 0 &&
          ` ${settled.skipped.toLocaleString("en")} row${settled.skipped === 1 ? "" : "s"} without a readable T and k left out.`}
        {enough && settled.unfittable.length > 0 && ` ${unfittableWords(settled.unfittable)}`}
      </p>
      {problem && (
        <div role="alert" className="rounded-md border border-error/40 bg-panel px-3 py-2 text-sm text-error">
          <p className="font-semibold">{problem.summary}</p>
          {problem.details.length > 0 && (
            <ul className="mt-1 list-disc pl-5">
              {problem.details.map((d, i) => (
                <li key={i}>{d}</li>
              ))}
            </ul>
          )}
        </div>
      )}
      {fitted && !problem && (
        <div className={`space-y-4 ${pending ? "opacity-70" : ""}`}>
          <p className="rounded-md border border-warn/40 bg-panel px-3 py-2 text-sm text-warn">{fitted.response.caution}</p>
          {points && (
            <ArrheniusPlot
              kUnitLabel={SUPPORTED_UNITS.rateConstant[order][0]?.label ?? getCanonicalRateConstantUnit(order)}
              band={fitted.response.analysis.band}
              points={points}
            />
          )}
          <ResultTables
            analysis={fitted.response.analysis}
            order={order}
            kUnit={kUnit}
            kLabel={kLabel}
            energyUnit={energyUnit}
            convertK={(k) => displayConversion(() => fromCanonicalRateConstant(k, kUnit, order))}
            convertE={(e) => displayConversion(() => convertEnergy(e, "J mol-1", energyUnit))}
            temperatureUnit={fitted.built.body.units.T}
            lineOf={(i) => (fitted.built.rows[i] ?? i) + 1}
            pointWord="Row"
          />
        </div>
      )}
    </section>
  );
}
