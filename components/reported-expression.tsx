import type { DepositDocument } from "@/lib/deposits/types";
import { convertEnergy, convertRateConstant, displayConversion } from "@/lib/kinetics/units";
import { unitLabel } from "@/lib/unit-labels";

import { formatNumber, formatRange } from "@/lib/format";

/** Up to five significant digits, written as our own numbers are (true minus, "e−11"). */
const show = (x: number) => formatNumber(x, 5);

/** The validity range: both ends alike ("−23.2 to 126.9"), "…" for an end not stated. */
const validRange = (lo: number | undefined, hi: number | undefined) =>
  lo !== undefined && hi !== undefined
    ? formatRange(lo, hi, "")
    : `${lo !== undefined ? show(lo) : "…"} to ${hi !== undefined ? show(hi) : "…"}`;

/** What the authors' expression needs of a deposit document (small enough to hand to a client component). */
export type ReportedExpressionSource = Pick<DepositDocument, "reportedFit" | "units"> & {
  reaction: Pick<DepositDocument["reaction"], "order">;
};

/**
 * The expression the authors report, in our layout: the formula once, then its parameters as a
 * small table in the document's own units, with the reference temperature T0 always stated.
 */
export function ReportedExpression({
  doc,
  kUnit: kShown,
  energyUnit,
}: {
  doc: ReportedExpressionSource;
  /** Unit id to show A in (the document's own when not given). */
  kUnit?: string;
  /** Unit id to show Ea in, as the reader chose for the fitted parameters (the reported unit when not given). */
  energyUnit?: string;
}) {
  const r = doc.reportedFit;
  if (!r) return null;
  const modified = r.model === "modified_arrhenius";
  const order = doc.reaction.order;
  const kId = kShown ?? doc.units.k;
  const kUnit = unitLabel("rateConstant", kId);
  const TUnit = unitLabel("temperature", doc.units.T);
  const rangeUnit = unitLabel("temperature", r.rangeUnit ?? doc.units.T);
  const EUnit = unitLabel("energy", energyUnit ?? r.EaUnit);
  const A = kShown ? displayConversion(() => convertRateConstant(r.A, doc.units.k, kShown, order)) : r.A;
  const Ea = energyUnit ? displayConversion(() => convertEnergy(r.Ea, r.EaUnit, energyUnit)) : r.Ea;
  const T0 = r.T0 !== undefined ? `${show(r.T0)} ${TUnit}` : "298.15 K";
  return (
    <div className="space-y-2 text-sm">
      <p className="font-mono">{modified ? "k(T) = A · (T / T0)ⁿ · exp(−Ea / RT)" : "k(T) = A · exp(−Ea / RT)"}</p>
      <table className="text-left">
        <caption className="sr-only">Parameters the authors report</caption>
        <tbody>
          <tr>
            <th scope="row" className="pr-4 font-medium">
              A
            </th>
            <td className="font-mono">{show(A)}</td>
            <td className="pl-2 text-muted">{kUnit}</td>
          </tr>
          {modified && (
            <tr>
              <th scope="row" className="pr-4 font-medium">
                n
              </th>
              <td className="font-mono">{r.n !== undefined ? show(r.n) : "—"}</td>
              <td className="pl-2 text-muted">with T0 = {T0}</td>
            </tr>
          )}
          <tr>
            <th scope="row" className="pr-4 font-medium">
              Ea
            </th>
            <td className="font-mono">{show(Ea)}</td>
            <td className="pl-2 text-muted">{EUnit}</td>
          </tr>
          {(r.Tmin !== undefined || r.Tmax !== undefined) && (
            <tr>
              <th scope="row" className="pr-4 font-medium">
                Valid
              </th>
              <td className="font-mono">{validRange(r.Tmin, r.Tmax)}</td>
              <td className="pl-2 text-muted">{rangeUnit}</td>
            </tr>
          )}
        </tbody>
      </table>
    </div>
  );
}
