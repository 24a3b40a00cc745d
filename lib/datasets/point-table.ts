/**
 * The rows of a published version's data table, shared by its page and its downloads: each point
 * as deposited (number and unit) and in canonical units, its uncertainty, pressure and bath gas,
 * its residual against the re-fit the page draws, and the findings that name it (outlier,
 * influential) with their reason in words. Pure: no database, no React.
 */
import type { AnalysisResult, Flag } from "@/lib/kinetics/types";
import type { DepositDocument, PointUncertainty } from "@/lib/deposits/types";
import { CONFIDENCE_LEVELS } from "@/lib/deposits/vocabulary";
import { formatNumber, formatSignificant } from "@/lib/format";

/** How many rows a version's page shows; the downloads carry every point. */
export const POINT_TABLE_ROWS = 1000;

/** One stored point (lib/datasets/queries.ts getVersionPointRows): T in K, k canonical, pressure in Pa. */
export interface StoredPointRow {
  T: number;
  k: number;
  /** Standard uncertainty of ln k (dimensionless); null when none is stated. */
  sigmaLnK: number | null;
  pressurePa: number | null;
  bathGas: string | null;
  note: string | null;
  original: Record<string, unknown>;
}

/** A finding that names one point, with its reason in words. */
export interface PointMark {
  code: "outlier" | "influential_point";
  /** "outlier" or "influential". */
  word: string;
  reason: string;
}

/** A stored point (canonical numbers) with what was deposited, its residual and its findings. */
export interface PointRow extends Omit<StoredPointRow, "original"> {
  /** Row number as the deposit counts its points, from 1. */
  row: number;
  deposited: {
    T: number;
    TUnit: string;
    k: number;
    kUnit: string;
    uncertainty: PointUncertainty | null;
    pressure: number | null;
    pressureUnit: string | null;
  };
  /** ln k − fitted ln k of the re-fit drawn on the page (band.model); null when the stored analysis has no residuals. */
  residualLnK: number | null;
  /** The residual in units of the point's stated σ(ln k): only on weighted fits. */
  residualInSigma: number | null;
  marks: PointMark[];
}

/** Which fit the residuals are of: the one whose band the page draws. */
export function residualModel(analysis: AnalysisResult | null): "arrhenius" | "modified_arrhenius" {
  return analysis?.band.model === "modified_arrhenius" && analysis.modifiedArrhenius ? "modified_arrhenius" : "arrhenius";
}

const fmt = (v: number | undefined, digits = 3) => formatSignificant(v, digits);

/** The reason a flag names point `i`, from the per-point diagnostics when they were stored. */
function reasonFor(flag: Flag, i: number, analysis: AnalysisResult): string {
  const d = analysis.diagnostics;
  const q = flag.quantities ?? {};
  const t = d?.externallyStudentized?.[i];
  if (flag.code === "outlier" && t !== undefined && q.bound) {
    return `${fmt(Math.abs(t))} times the typical scatter away from the line through the other points; the limit for any point of this set is ${fmt(q.bound.value)}`;
  }
  const cook = d?.cooksDistance?.[i];
  if (flag.code === "influential_point" && cook !== undefined && t !== undefined && q.bound && q.residualBound) {
    return `this point pulls the fit more than any other should: without it the fitted parameters would change noticeably, and it lies ${fmt(Math.abs(t))} times the typical scatter away from the line through the other points (beyond ${fmt(q.residualBound.value)})`;
  }
  return flag.message;
}

/** Every point of a version as a table row, in deposit order. */
export function buildPointRows(doc: DepositDocument, points: readonly StoredPointRow[], analysis: AnalysisResult | null): PointRow[] {
  const fit = analysis ? (residualModel(analysis) === "modified_arrhenius" ? analysis.modifiedArrhenius : analysis.arrhenius) : null;
  const marks = new Map<number, PointMark[]>();
  for (const flag of analysis?.flags ?? []) {
    if (flag.code !== "outlier" && flag.code !== "influential_point") continue;
    for (const i of flag.points ?? []) {
      const list = marks.get(i) ?? [];
      list.push({ code: flag.code, word: flag.code === "outlier" ? "outlier" : "influential", reason: reasonFor(flag, i, analysis!) });
      marks.set(i, list);
    }
  }
  return points.map((p, i) => {
    const given = doc.points?.[i];
    const o = p.original as { T?: number; k?: number; unitT?: string; unitK?: string };
    const pressure = given?.pressure ?? doc.conditions?.pressure?.value ?? null;
    const residual = fit?.residuals?.[i];
    const residualLnK = residual !== undefined && Number.isFinite(residual) ? residual : null;
    return {
      row: i + 1,
      deposited: {
        T: o.T ?? given?.T ?? p.T,
        TUnit: o.unitT ?? doc.units.T,
        k: o.k ?? given?.k ?? p.k,
        kUnit: o.unitK ?? doc.units.k,
        uncertainty: given?.uncertainty ?? null,
        pressure,
        pressureUnit: pressure === null ? null : (doc.units.pressure ?? null),
      },
      T: p.T,
      k: p.k,
      sigmaLnK: p.sigmaLnK,
      pressurePa: p.pressurePa,
      bathGas: p.bathGas,
      note: p.note,
      residualLnK,
      residualInSigma: analysis?.weighted && residualLnK !== null && p.sigmaLnK ? residualLnK / p.sigmaLnK : null,
      marks: marks.get(i) ?? [],
    };
  });
}

/**
 * A deposited uncertainty in words: "± 10 % (2σ)", "± 1.2e−12 cm3 molecule-1 s-1 (1σ)", "×/÷ 1.5 (1σ)".
 * @example uncertaintyText({ kind: "relative", value: 10, confidence: "2sigma" }, "s-1") // "± 10 % (2σ)"
 */
export function uncertaintyText(u: PointUncertainty | null, kUnit: string): string {
  if (!u) return "";
  const level = (CONFIDENCE_LEVELS.find((c) => c.id === (u.confidence ?? "1sigma"))?.label ?? "1σ").split(" ")[0];
  const value = formatNumber(u.value, 4);
  const stated = u.kind === "relative" ? `± ${value} %` : u.kind === "factor" ? `×/÷ ${value}` : `± ${value} ${kUnit}`;
  return `${stated} (${level})`;
}
