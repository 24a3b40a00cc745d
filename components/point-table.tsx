"use client";

import { useId } from "react";
import type { PointMark, PointRow } from "@/lib/datasets/point-table";
import { uncertaintyText } from "@/lib/datasets/point-table";
import { formatNumber, formatSignificant } from "@/lib/format";
import { quantityLabel, unitLabel } from "@/lib/unit-labels";
import { ScrollRegion } from "./scroll-region";
import { StatisticTerm } from "@/components/statistic-term";

/** "outlier" or "influential", with its reason on hover and keyboard focus, and always in text for screen readers. */
function Mark({ mark }: { mark: PointMark }) {
  const tipId = useId();
  return (
    <span className="group relative inline-block">
      <span
        tabIndex={0}
        aria-describedby={tipId}
        className={`cursor-help rounded-sm border px-1 text-xs font-semibold focus-visible:outline-2 focus-visible:outline-link ${
          mark.code === "outlier" ? "border-error/50 text-error" : "border-warn/50 text-warn"
        }`}
      >
        {mark.code === "outlier" ? "× " : "◆ "}
        {mark.word}
      </span>
      <span id={tipId} className="sr-only">
        : {mark.reason}
      </span>
      {/* The visible reason; screen readers have it above already. */}
      <span
        aria-hidden="true"
        className="pointer-events-none absolute right-0 top-full z-10 mt-1 hidden w-72 whitespace-normal rounded-md border border-line bg-panel p-2 text-xs font-normal text-ink shadow-md group-hover:block group-focus-within:block"
      >
        {mark.reason}
      </span>
    </span>
  );
}

/**
 * Every point of a version: T and k as deposited and k in the reader's unit, the stated
 * uncertainty, pressure, bath gas, residual of the re-fit and the findings that name the point.
 * Cells never wrap or cut a number: the table scrolls sideways inside its region instead.
 */
export function PointTable({
  rows,
  totalRows,
  kUnitLabel,
  convertK,
  weighted,
  residualModelName,
  id,
  downloadsHref,
}: {
  rows: readonly PointRow[];
  /** All points of the version (rows may hold only the first POINT_TABLE_ROWS). */
  totalRows: number;
  kUnitLabel: string;
  /** Canonical k → the reader's unit. */
  convertK: (k: number) => number;
  weighted: boolean;
  /** "Arrhenius" or "modified Arrhenius": whose residuals these are; null when the analysis stored none. */
  residualModelName: string | null;
  id: string;
  downloadsHref: string;
}) {
  const first = rows[0];
  const tUnit = first?.deposited.TUnit ?? "K";
  const kUnit = first?.deposited.kUnit ?? "";
  const showKelvin = rows.some((r) => r.deposited.TUnit !== "K");
  const hasUncertainty = rows.some((r) => r.deposited.uncertainty);
  const pressureUnit = rows.find((r) => r.deposited.pressureUnit)?.deposited.pressureUnit ?? null;
  const hasPressure = rows.some((r) => r.deposited.pressure !== null);
  const hasBathGas = rows.some((r) => r.bathGas);
  const hasResidual = residualModelName !== null && rows.some((r) => r.residualLnK !== null);
  const hasScaled = hasResidual && weighted && rows.some((r) => r.residualInSigma !== null);
  const hasNotes = rows.some((r) => r.note);
  const marked = rows.filter((r) => r.marks.length).length;
  const num = (v: number | null | undefined) => formatNumber(v, 10);
  return (
    <section className="card space-y-3" aria-labelledby={`${id}-heading`} id={id}>
      <h3 id={`${id}-heading`} className="text-lg font-semibold">
        The data
      </h3>
      <p className="text-sm text-muted">
        {totalRows} point{totalRows === 1 ? "" : "s"}, as deposited and with k in the unit chosen above.
        {hasResidual &&
          ` “Off the fitted line” (the residual) is ln k − fitted ln k of the ${residualModelName} re-fit${hasScaled ? "; “in stated uncertainties” divides it by the point’s stated σ(ln k)" : ""}.`}
        {marked > 0 && " Marked points carry their reason: hover over the mark or focus it."}
        {totalRows > rows.length && (
          <>
            {" "}
            The first {rows.length.toLocaleString("en")} of {totalRows.toLocaleString("en")} rows are shown;{" "}
            <a href={downloadsHref}>the downloads</a> hold every one.
          </>
        )}
      </p>
      <ScrollRegion label="The data (scrollable table)" scrollClassName="max-h-[36rem] overflow-auto">
        <table className="table [&_td]:whitespace-nowrap [&_th]:min-w-16">
          <caption className="sr-only">
            Every point of this version: temperature and rate constant as deposited and in the chosen unit, uncertainty, conditions,
            residual of the re-fit and findings
          </caption>
          <thead className="sticky top-0 bg-panel">
            <tr>
              <th scope="col">#</th>
              <th scope="col" data-testid="deposited-t-header">
                {quantityLabel("T as deposited", "temperature", tUnit)}
              </th>
              {showKelvin && <th scope="col">{quantityLabel("T", "temperature", "K")}</th>}
              <th scope="col" data-testid="deposited-k-header">
                {quantityLabel("k as deposited", "rateConstant", kUnit)}
              </th>
              <th scope="col" data-testid="chosen-k-header">
                {quantityLabel("k", "rateConstant", kUnitLabel)}
              </th>
              {hasUncertainty && <th scope="col">Uncertainty, as stated</th>}
              {hasUncertainty && (
                <th scope="col">
                  <StatisticTerm id="sigmaLnK" />
                </th>
              )}
              {hasPressure && <th scope="col">{quantityLabel("Pressure", "pressure", pressureUnit)}</th>}
              {hasBathGas && <th scope="col">Bath gas</th>}
              {hasResidual && (
                <th scope="col">
                  <StatisticTerm id="residual" />
                </th>
              )}
              {hasScaled && (
                <th scope="col">
                  <StatisticTerm id="residualInSigma" />
                </th>
              )}
              <th scope="col">Findings</th>
              {hasNotes && <th scope="col">Note</th>}
            </tr>
          </thead>
          <tbody>
            {rows.map((r) => (
              <tr key={r.row}>
                <td>{r.row}</td>
                <td>{num(r.deposited.T)}</td>
                {showKelvin && <td>{formatSignificant(r.T, 6)}</td>}
                <td>{num(r.deposited.k)}</td>
                <td>{formatSignificant(convertK(r.k), 4)}</td>
                {hasUncertainty && <td>{uncertaintyText(r.deposited.uncertainty, unitLabel("rateConstant", r.deposited.kUnit))}</td>}
                {hasUncertainty && <td>{formatSignificant(r.sigmaLnK, 3)}</td>}
                {hasPressure && <td>{num(r.deposited.pressure)}</td>}
                {hasBathGas && <td>{r.bathGas}</td>}
                {hasResidual && <td>{formatSignificant(r.residualLnK, 3)}</td>}
                {hasScaled && <td>{formatSignificant(r.residualInSigma, 3)}</td>}
                <td>
                  {r.marks.length ? (
                    <span className="inline-flex gap-1">
                      {r.marks.map((m) => (
                        <Mark key={m.code} mark={m} />
                      ))}
                    </span>
                  ) : (
                    <span className="text-muted">
                      —<span className="sr-only">none</span>
                    </span>
                  )}
                </td>
                {hasNotes && <td className="min-w-48 whitespace-normal!">{r.note}</td>}
              </tr>
            ))}
          </tbody>
        </table>
      </ScrollRegion>
    </section>
  );
}
