/**
 * The points of a published version as CSV and JSON downloads: every point as deposited and in
 * canonical units, its uncertainty, pressure, bath gas, residual against the re-fit and the
 * findings that name it, under a header (CSV `#` lines, JSON "about") with the version
 * identifier, title, licence, citation line and the caution sentence. Pure.
 */
import { csvCell } from "@/lib/analyses/fit-export";
import { OTHER_CONDITIONS_LABEL } from "@/lib/deposits/field-labels";
import type { PointRow } from "./point-table";

/** What the header of a download says about the version. */
export interface PointsAbout {
  versionIdentifier: string | null;
  title: string;
  versionNumber: number;
  state: string;
  retraction: { at: string | null; notice: string | null } | null;
  licence: string;
  citation: string;
  /** The version's public page, absolute. */
  landingPage: string;
  caution: string;
  /** The deposit's free-text conditions (`conditions.notes`), under OTHER_CONDITIONS_LABEL; absent when none. */
  otherConditions?: string | null;
  canonicalUnits: { T: string; k: string; pressure: string };
  /** The fit the residuals are measured from, and whether it is weighted by the stated uncertainties. */
  residuals: { model: "arrhenius" | "modified_arrhenius"; weighted: boolean; engineVersion: string | null } | null;
}

const MODEL_WORDS = { arrhenius: "Arrhenius", modified_arrhenius: "modified Arrhenius" } as const;

/** A text field a spreadsheet would read as a formula (= + − @) starts with an apostrophe (OWASP "CSV injection"). */
export const textCell = (v: string | null) => csvCell(v !== null && /^[=+\-@\t\r]/.test(v) ? `'${v}` : v);

/**
 * A `# label: text` comment line of a CSV header: never broken (newlines become spaces) and always
 * ONE cell, written by `textCell` as every data cell is: it holds a `#`, so it is quoted whole with
 * its quotes doubled, and a comma or quote in the text can never open a cell of its own (a reader
 * splitting the line by RFC 4180 gets the whole line, starting with `#`, never a formula).
 */
export const csvCommentLine = (label: string, text: string) => textCell(`# ${label}: ${text}`.replace(/[\r\n]+/g, " "));

/** The CSV columns, in order, with the value of each for one row. */
function csvColumns(about: PointsAbout): [string, (r: PointRow) => string][] {
  const u = about.canonicalUnits;
  return [
    ["row", (r) => csvCell(r.row)],
    ["T_deposited", (r) => csvCell(r.deposited.T)],
    ["T_deposited_unit", (r) => textCell(r.deposited.TUnit)],
    ["k_deposited", (r) => csvCell(r.deposited.k)],
    ["k_deposited_unit", (r) => textCell(r.deposited.kUnit)],
    ["uncertainty_kind", (r) => textCell(r.deposited.uncertainty?.kind ?? null)],
    ["uncertainty_value", (r) => csvCell(r.deposited.uncertainty?.value)],
    ["uncertainty_confidence", (r) => textCell(r.deposited.uncertainty ? (r.deposited.uncertainty.confidence ?? "1sigma") : null)],
    ["pressure_deposited", (r) => csvCell(r.deposited.pressure)],
    ["pressure_deposited_unit", (r) => textCell(r.deposited.pressureUnit)],
    [`T_${u.T}`, (r) => csvCell(r.T)],
    // Named by its unit, as T_K and pressure_Pa are ("k_cm3_molecule-1_s-1"); k_unit repeats it under a fixed name.
    [`k_${u.k.replace(/\s+/g, "_")}`, (r) => csvCell(r.k)],
    ["k_unit", () => textCell(u.k)],
    ["sigma_ln_k", (r) => csvCell(r.sigmaLnK)],
    [`pressure_${u.pressure}`, (r) => csvCell(r.pressurePa)],
    ["bath_gas", (r) => textCell(r.bathGas)],
    ["residual_ln_k", (r) => csvCell(r.residualLnK)],
    ["residual_in_sigma", (r) => csvCell(r.residualInSigma)],
    ["outlier", (r) => (r.marks.some((m) => m.code === "outlier") ? "yes" : "")],
    ["influential", (r) => (r.marks.some((m) => m.code === "influential_point") ? "yes" : "")],
    ["note", (r) => textCell(r.note)],
  ];
}

/** The header lines both formats share, as [label, text] pairs. */
function aboutLines(about: PointsAbout): [string, string][] {
  const lines: [string, string][] = [
    ["version identifier", about.versionIdentifier ? `doi:${about.versionIdentifier}` : "none"],
    ["title", about.title],
    ["version", `${about.versionNumber} (${about.state})`],
  ];
  if (about.retraction) {
    lines.push(["retracted", `${about.retraction.at ?? "date not recorded"}: ${about.retraction.notice ?? ""}`.trim()]);
  }
  if (about.otherConditions) lines.push([OTHER_CONDITIONS_LABEL.toLowerCase(), about.otherConditions]);
  lines.push(["licence", about.licence], ["cite as", about.citation], ["page", about.landingPage], ["caution", about.caution]);
  if (about.residuals) {
    const r = about.residuals;
    lines.push([
      "residuals",
      `ln k − fitted ln k of the ${MODEL_WORDS[r.model]} re-fit${r.engineVersion ? ` (engine ${r.engineVersion})` : ""}${
        r.weighted ? "; residual_in_sigma is that residual divided by the point's stated sigma_ln_k (the fit is weighted by them)" : ""
      }`,
    ]);
  }
  return lines;
}

/**
 * The CSV download: `#` comment lines (version identifier, title, licence, citation, caution,
 * what the residuals are), then a header row and one row per point.
 */
export function buildPointsCsv(about: PointsAbout, rows: readonly PointRow[]): string {
  const columns = csvColumns(about);
  // A comment line never breaks: newlines inside a deposited text become spaces.
  // A spreadsheet splits a comment line at its commas: a piece that would start a formula gets an apostrophe, as data cells do.
  const head = aboutLines(about).map(([label, text]) => csvCommentLine(label, text));
  const body = rows.map((r) => columns.map(([, value]) => value(r)).join(","));
  return [...head, columns.map(([name]) => name).join(","), ...body].join("\r\n") + "\r\n";
}

/** The JSON download: an "about" object (with the units of the converted values), then one object per point with its deposited and converted values. */
export function buildPointsJson(about: PointsAbout, rows: readonly PointRow[]) {
  return {
    about: {
      versionIdentifier: about.versionIdentifier,
      title: about.title,
      version: about.versionNumber,
      state: about.state,
      retraction: about.retraction,
      licence: about.licence,
      citation: about.citation,
      landingPage: about.landingPage,
      caution: about.caution,
      otherConditions: about.otherConditions ?? null,
      // The unit of each converted value, named (never "canonical").
      units: about.canonicalUnits,
      residuals: about.residuals && {
        ...about.residuals,
        definition: aboutLines(about).find(([label]) => label === "residuals")?.[1] ?? null,
      },
    },
    points: rows.map((r) => ({
      row: r.row,
      deposited: r.deposited,
      converted: { T: r.T, k: r.k, sigmaLnK: r.sigmaLnK, pressure: r.pressurePa },
      bathGas: r.bathGas,
      note: r.note,
      residualLnK: r.residualLnK,
      residualInSigma: r.residualInSigma,
      findings: r.marks.map((m) => ({ code: m.code, reason: m.reason })),
    })),
  };
}
