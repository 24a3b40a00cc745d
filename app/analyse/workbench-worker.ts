// The /analyse page's worker: reads the pasted text, sends the fit request, reads the answer and
// builds the exports, so that 100 000 points never block the page's main thread. The page gets
// back only what it shows: counts, the first errors, the parameters and the points it draws.
import type { AnalysisResponse } from "@/lib/analyses/analyse-request";
import { buildFitCsv, buildFitJson, type FitExportInput } from "@/lib/analyses/fit-export";
import { parseColumns, type ParsedColumns } from "@/lib/analyses/parse-columns";
import { thinForDrawing } from "@/lib/analyses/thin-points";
import { toCanonicalRateConstant, toKelvin } from "@/lib/kinetics/units";
import type { ReactionOrder } from "@/lib/kinetics/types";
import type { WorkbenchReply, WorkbenchRequest } from "./workbench-protocol";

// The DOM and webworker type libraries cannot share one program: the few worker members used here.
const scope = globalThis as unknown as {
  postMessage(message: WorkbenchReply): void;
  onmessage: ((event: MessageEvent<WorkbenchRequest>) => void) | null;
  location: Location;
};

let parsed: ParsedColumns = { points: [], lines: [], errors: [] };
let lastFit: FitExportInput | null = null;

const reply = (message: WorkbenchReply) => scope.postMessage(message);

scope.onmessage = async (event: MessageEvent<WorkbenchRequest>) => {
  const m = event.data;
  if (m.type === "parse") {
    parsed = parseColumns(m.text);
    reply({
      type: "parsed",
      seq: m.seq,
      count: parsed.points.length,
      errors: parsed.errors.slice(0, 10),
      errorCount: parsed.errors.length,
    });
  } else if (m.type === "fit") {
    const points = parsed.points;
    const lines = parsed.lines;
    try {
      const res = await fetch(new URL("/api/v1/analyses", scope.location.origin), {
        method: "POST",
        headers: { "content-type": "application/json" },
        body: JSON.stringify({ points, order: m.order, units: { k: m.kUnit, T: m.TUnit } }),
      });
      const json = await res.json().catch(() => ({ title: `The server answered ${res.status}` }));
      if (!res.ok) {
        const errors = ((json.errors ?? []) as { pointer: string; message: string }[]).slice(0, 10).map((e) => {
          // "/points/3/T" → the pasted line of point 3, as the person counts lines.
          const i = /^\/points\/(\d+)/.exec(e.pointer);
          return { ...e, line: i ? lines[Number(i[1])] : undefined };
        });
        reply({ type: "fit-failed", seq: m.seq, problem: { title: json.title ?? "The fit failed", errors } });
        return;
      }
      const response = json as AnalysisResponse;
      lastFit = { response, points, lines, order: m.order, kUnit: m.kUnit, TUnit: m.TUnit, energyUnit: "J mol-1" };
      reply({ type: "fitted", seq: m.seq, ...summarise(response, points, lines, m) });
    } catch (err) {
      reply({ type: "fit-failed", seq: m.seq, problem: { title: err instanceof Error ? err.message : "The fit failed", errors: [] } });
    }
  } else if (m.type === "export" && lastFit) {
    const input = { ...lastFit, energyUnit: m.energyUnit };
    const blob =
      m.format === "csv"
        ? new Blob([buildFitCsv(input)], { type: "text/csv;charset=utf-8" })
        : new Blob([buildFitJson(input)], { type: "application/json" });
    reply({ type: "exported", seq: m.seq, format: m.format, blob });
  }
};

/** The answer without its per-point arrays, the line of each flagged point, and the points to draw. */
function summarise(
  response: AnalysisResponse,
  points: ParsedColumns["points"],
  lines: number[],
  m: { order: ReactionOrder; kUnit: string; TUnit: string },
) {
  const a = response.analysis;
  const flagged = new Set(a.flags.flatMap((f) => f.points ?? []));
  const outliers = new Set(a.flags.filter((f) => f.code === "outlier").flatMap((f) => f.points ?? []));
  const flagLines: Record<number, number> = {};
  for (const i of flagged) flagLines[i] = lines[i];
  const all = points.map((p, index) => ({
    x: 1000 / toKelvin(p.T, m.TUnit),
    y: Math.log(toCanonicalRateConstant(p.k, m.kUnit, m.order)),
    index,
  }));
  const drawn = thinForDrawing(all, outliers).map((d) => ({
    T: 1000 / d.x,
    lnk: d.y,
    outlier: outliers.has(d.index),
    ...(points[d.index].sigmaLnK !== undefined ? { sigmaLnK: points[d.index].sigmaLnK } : {}),
  }));
  const slim: AnalysisResponse = {
    ...response,
    analysis: {
      ...a,
      arrhenius: { ...a.arrhenius, residuals: [], fitted: [] },
      modifiedArrhenius: a.modifiedArrhenius ? { ...a.modifiedArrhenius, residuals: [], fitted: [] } : null,
      diagnostics: null,
    },
  };
  return { response: slim, flagLines, drawn, total: points.length };
}
