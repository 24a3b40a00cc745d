import type { AnalysisResponse } from "./analyse-request";
import { convertEnergy, fromCanonicalRateConstant, toKelvin } from "@/lib/kinetics/units";
import type { ReactionOrder } from "@/lib/kinetics/types";

/** What a fit export needs besides the analysis: the pasted points and the units they were pasted in. */
export interface FitExportInput {
  response: AnalysisResponse;
  points: readonly { T: number; k: number; sigmaLnK?: number }[];
  /** The pasted line of each point (from 1, as the person counts lines). */
  lines: ArrayLike<number>;
  order: ReactionOrder;
  kUnit: string;
  TUnit: string;
  energyUnit: string;
}

interface Parameter {
  name: string;
  value: number | null;
  standardError: number | null;
  unit: string;
}

const RATE_HEADER = "line";

/** The fitted parameters in the person's units, each with its standard error where the engine gives one. */
export function fitParameters({ response, order, kUnit, energyUnit }: FitExportInput): Parameter[] {
  const { arrhenius: a, modifiedArrhenius: m, eyring: e } = response.analysis;
  const k = (v: number | null) => (v === null ? null : fromCanonicalRateConstant(v, kUnit, order));
  const E = (v: number | null) => (v === null ? null : convertEnergy(v, "J mol-1", energyUnit));
  const out: Parameter[] = [
    { name: "arrhenius.A", value: k(a.params.A), standardError: null, unit: kUnit },
    // ln A in the person's unit without forming A (which may overflow): ln A + ln(unit factor).
    { name: "arrhenius.lnA", value: a.params.lnA + Math.log(k(1) ?? NaN), standardError: a.se.lnA, unit: `ln(${kUnit})` },
    { name: "arrhenius.Ea", value: E(a.params.Ea), standardError: E(a.se.Ea), unit: energyUnit },
  ];
  if (m) {
    out.push(
      { name: "modified_arrhenius.A", value: k(m.params.A), standardError: null, unit: kUnit },
      { name: "modified_arrhenius.n", value: m.params.n, standardError: m.se.n, unit: "1" },
      { name: "modified_arrhenius.Ea", value: E(m.params.Ea), standardError: E(m.se.Ea), unit: energyUnit },
      { name: "modified_arrhenius.T0", value: m.params.T0, standardError: null, unit: "K" },
    );
  }
  if (e) {
    out.push(
      { name: "eyring.dH", value: E(e.params.dH), standardError: E(e.se.dH), unit: energyUnit },
      { name: "eyring.dS", value: e.params.dS, standardError: e.se.dS, unit: "J mol-1 K-1" },
    );
  }
  return out;
}

/** One row per pasted point: the point as pasted, the fitted k of each model (same unit) and the ln k residual. */
export function fitPointRows(input: FitExportInput): Record<string, number | string | null>[] {
  const { response, points, lines, order, kUnit, TUnit } = input;
  const { arrhenius: a, modifiedArrhenius: m } = response.analysis;
  const outliers = new Set(response.analysis.flags.filter((f) => f.code === "outlier").flatMap((f) => f.points ?? []));
  const fromLn = (lnk: number) => fromCanonicalRateConstant(Math.exp(lnk), kUnit, order);
  return points.map((p, i) => ({
    [RATE_HEADER]: lines[i],
    T: p.T,
    k: p.k,
    sigma_ln_k: p.sigmaLnK ?? null,
    arrhenius_fitted_k: fromLn(a.fitted[i]),
    arrhenius_residual_ln_k: a.residuals[i],
    ...(m ? { modified_arrhenius_fitted_k: fromLn(m.fitted[i]), modified_arrhenius_residual_ln_k: m.residuals[i] } : {}),
    flagged_outlier: outliers.has(i) ? "yes" : "",
    // The residuals are in ln k, so they do not depend on the unit k is shown in; T goes as pasted.
    ...(TUnit === "K" ? {} : { T_K: toKelvin(p.T, TUnit) }),
  }));
}

/** One CSV field (RFC 4180): empty for null and non-finite numbers, quoted when it holds a quote, comma, newline or `#`. */
export const csvCell = (v: unknown) => {
  if (v === null || v === undefined) return "";
  const s = typeof v === "number" ? (Number.isFinite(v) ? String(v) : "") : String(v);
  return /[",\r\n#]/.test(s) ? `"${s.replace(/"/g, '""')}"` : s;
};

/**
 * The fit as CSV: `#` comment lines with the caution sentence, the units and the parameters, then
 * one row per point (line, T, k, σ(ln k), fitted k and ln k residual per model, outlier flag).
 */
export function buildFitCsv(input: FitExportInput): string {
  const { response, kUnit, TUnit, energyUnit } = input;
  const head = [
    `# ${response.caution}`,
    `# units: T in ${TUnit}; k and fitted k in ${kUnit}; energies in ${energyUnit}; residuals are ln k − fitted ln k`,
    `# n = ${response.analysis.n}${response.analysis.weighted ? ", weighted by the stated σ(ln k)" : ""}`,
    ...fitParameters(input).map(
      (p) =>
        `# ${p.name} = ${csvCell(p.value)}${p.standardError === null ? "" : ` ± ${csvCell(p.standardError)} (standard error)`} ${p.unit}`,
    ),
  ];
  const rows = fitPointRows(input);
  const columns = rows.length ? Object.keys(rows[0]) : [RATE_HEADER];
  const body = rows.map((r) => columns.map((c) => csvCell(r[c])).join(","));
  return [...head, columns.join(","), ...body].join("\n") + "\n";
}

/** The fit as JSON: the caution as a field, the units, the parameters with units, one object per point. */
export function buildFitJson(input: FitExportInput): string {
  const { response, kUnit, TUnit, energyUnit } = input;
  return JSON.stringify(
    {
      caution: response.caution,
      units: { T: TUnit, k: kUnit, energy: energyUnit, residual: "ln k − fitted ln k" },
      n: response.analysis.n,
      weighted: response.analysis.weighted,
      preferredModel: response.analysis.band.model,
      parameters: fitParameters(input),
      flags: response.analysis.flags.map((f) => ({ code: f.code, severity: f.severity, message: f.message, points: f.points })),
      points: fitPointRows(input),
    },
    null,
    1,
  );
}
