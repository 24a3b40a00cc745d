import type { DepositDocument } from "@/lib/deposits/types";
import { SUPPORTED_UNITS } from "@/lib/kinetics/units";

/** Up to five significant digits, as the authors' numbers are shown beside our own. */
const show = (x: number) =>
  Math.abs(x) >= 1e5 || (x !== 0 && Math.abs(x) < 1e-3) ? x.toExponential(4).replace(/\.?0+e/, "e") : String(+x.toPrecision(5));

/**
 * The expression the authors report, in our layout: the formula once, then its parameters as a
 * small table in the document's own units, with the reference temperature T0 always stated.
 */
export function ReportedExpression({ doc }: { doc: DepositDocument }) {
  const r = doc.reportedFit;
  if (!r) return null;
  const modified = r.model === "modified_arrhenius";
  const kUnit = SUPPORTED_UNITS.rateConstant[doc.reaction.order].find((u) => u.id === doc.units.k)?.label ?? doc.units.k;
  const TUnit = SUPPORTED_UNITS.temperature.find((u) => u.id === doc.units.T)?.label ?? doc.units.T;
  const EUnit = SUPPORTED_UNITS.energy.find((u) => u.id === r.EaUnit)?.label ?? r.EaUnit;
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
            <td className="font-mono">{show(r.A)}</td>
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
            <td className="font-mono">{show(r.Ea)}</td>
            <td className="pl-2 text-muted">{EUnit}</td>
          </tr>
          {(r.Tmin !== undefined || r.Tmax !== undefined) && (
            <tr>
              <th scope="row" className="pr-4 font-medium">
                Valid
              </th>
              <td className="font-mono">
                {r.Tmin !== undefined ? show(r.Tmin) : "…"}–{r.Tmax !== undefined ? show(r.Tmax) : "…"}
              </td>
              <td className="pl-2 text-muted">{TUnit}</td>
            </tr>
          )}
        </tbody>
      </table>
    </div>
  );
}
