/**
 * A mechanism check's report as CSV: the caution and the window as header lines, one row per
 * reaction. Cells go through the point exports' textCell (no cell a spreadsheet runs as a formula).
 */
import { csvCommentLine, textCell } from "@/lib/datasets/point-export";
import type { MechanismReport } from "./run-check";

const num = (x: number | null | undefined) => (x === null || x === undefined || !Number.isFinite(x) ? "" : String(x));

export function mechanismReportCsv(report: MechanismReport, name: string): string {
  const lines = [
    csvCommentLine("mechanism check", name),
    csvCommentLine("caution", report.about.caution),
    csvCommentLine("use window", `${report.about.window.Tmin}–${report.about.window.Tmax} K`),
    csvCommentLine("units", report.about.units_of_rates),
    [
      "index",
      "line",
      "equation",
      "rate_type",
      "verdict",
      "extrapolated_K",
      "ratio_low_end",
      "T_low_K",
      "ratio_high_end",
      "T_high_K",
      "ratio_worst",
      "T_worst_K",
      "f_worst",
      "basis",
      "datasets",
      "reaction_key",
      "reverse_reaction_key",
      "A",
      "b",
      "Ea_J_per_mol",
      "note",
    ].join(","),
  ];
  for (const r of report.reactions) {
    const c = r.comparison;
    lines.push(
      [
        String(r.index),
        String(r.line),
        textCell(r.equation),
        r.rateType,
        r.verdict,
        textCell(r.extrapolated.map((g) => `${Math.round(g.Tmin)}-${Math.round(g.Tmax)}`).join(" ")),
        num(c?.low.ratio),
        num(c?.low.T),
        num(c?.high.ratio),
        num(c?.high.T),
        num(c?.worst.ratio),
        num(c?.worst.T),
        num(c?.worst.f),
        c?.basis ?? "",
        String(r.datasets),
        textCell(r.reaction?.key ?? ""),
        textCell(r.reverse?.key ?? ""),
        num(r.rate?.A),
        num(r.rate?.b),
        num(r.rate?.Ea),
        textCell(r.note),
      ].join(","),
    );
  }
  return lines.join("\r\n") + "\r\n";
}
