"use client";

import { useState } from "react";
import { UnitPickers } from "@/components/unit-pickers";
import { ArrheniusPlot } from "@/components/arrhenius-plot";
import { ScrollRegion } from "@/components/scroll-region";
import { formatNumber, formatRange, formatSignificant } from "@/lib/format";
import { describeExtrapolation } from "@/lib/kinetics/flag-text";
import { GAS_CONSTANT, REFERENCE_TEMPERATURE } from "@/lib/kinetics/constants";
import type { AnalysisResult, ReactionOrder } from "@/lib/kinetics/types";
import { SUPPORTED_UNITS, convertEnergy, displayConversion, fromCanonicalRateConstant } from "@/lib/kinetics/units";
import { energyQuantityLabel } from "@/lib/unit-labels";

/** The authors' expression in the storage units (A: s⁻¹, cm³ molecule⁻¹ s⁻¹ … by order), J mol⁻¹ (Ea) and K (T0, range), with the model they report. */
export interface ReportedCanonical {
  model: "arrhenius" | "modified_arrhenius";
  A: number;
  n: number;
  Ea: number;
  T0: number;
  Tmin?: number;
  Tmax?: number;
}

const sig = (v: number | null | undefined, digits = 4) => formatSignificant(v, digits);
const MODEL_WORDS = { arrhenius: "Arrhenius, k = A exp(−Ea/RT)", modified_arrhenius: "Modified Arrhenius, k = A (T/T0)ⁿ exp(−Ea/RT)" };

/** k(T) of a (modified) Arrhenius expression in the storage units. */
const kOf = (e: { A: number; n: number; Ea: number; T0: number }, T: number) =>
  e.A * Math.pow(T / e.T0, e.n) * Math.exp(-e.Ea / (GAS_CONSTANT * T));

/**
 * The review's plot and reported-versus-refitted table in the units the curator picks (the
 * document's own by default): data, re-fit and the authors' expression on one plot, and each
 * model's rows under that model's heading.
 */
export function ReviewFit({
  result,
  points,
  outliers,
  order,
  initialKUnit,
  reported,
}: {
  result: AnalysisResult;
  points: { T: number; k: number }[];
  outliers: number[];
  order: ReactionOrder;
  initialKUnit: string;
  reported?: ReportedCanonical;
}) {
  const kUnits = SUPPORTED_UNITS.rateConstant[order];
  const [kUnit, setKUnit] = useState(kUnits.some((u) => u.id === initialKUnit) ? initialKUnit : kUnits[0].id);
  const [energyUnit, setEnergyUnit] = useState("kJ mol-1");
  const kLabel = kUnits.find((u) => u.id === kUnit)?.label ?? kUnit;
  const factor = displayConversion(() => fromCanonicalRateConstant(1, kUnit, order));
  const lnFactor = Math.log(factor);
  const k = (v: number | null | undefined) => (v === null || v === undefined ? null : v * factor);
  const E = (v: number) => displayConversion(() => convertEnergy(v, "J mol-1", energyUnit));
  const ELabel = energyQuantityLabel("Ea", energyUnit);
  const outlierSet = new Set(outliers);
  const shift = (xs: number[] | null) => (xs ? xs.map((x) => x + lnFactor) : null);

  const TminData = result.band.T[0];
  const TmaxData = result.band.T[result.band.T.length - 1];
  const reportedRange: [number, number] = [reported?.Tmin ?? TminData, reported?.Tmax ?? TmaxData];
  const reportedCurve = reported
    ? Array.from({ length: 40 }, (_, i) => {
        const [lo, hi] = reportedRange;
        // Even steps in 1/T, as the plot's x axis.
        const T = 1 / (1 / lo + ((1 / hi - 1 / lo) * i) / 39);
        return { T, lnk: Math.log(kOf(reported, T)) + lnFactor };
      })
    : null;

  const a = result.arrhenius;
  const m = result.modifiedArrhenius;
  const mod = m ? { A: Math.exp(m.params.lnA), n: m.params.n, Ea: m.params.Ea, T0: m.params.T0 } : null;
  const Tmid = a.kMid.T;
  const rep = (model: ReportedCanonical["model"]) => (reported?.model === model ? reported : undefined);
  const notThisModel = reported ? `reported as ${reported.model === "arrhenius" ? "Arrhenius" : "modified Arrhenius"}` : "not reported";

  return (
    <div className="space-y-4">
      <UnitPickers order={order} kUnit={kUnit} onKUnit={setKUnit} energyUnit={energyUnit} onEnergyUnit={setEnergyUnit} />

      <ArrheniusPlot
        points={points.map((p, i) => ({ T: p.T, lnk: Math.log(p.k) + lnFactor, outlier: outlierSet.has(i) }))}
        band={{ ...result.band, lnk: shift(result.band.lnk)!, lower: shift(result.band.lower), upper: shift(result.band.upper) }}
        kUnitLabel={kLabel}
        reported={reportedCurve ? { T: reportedCurve.map((p) => p.T), lnk: reportedCurve.map((p) => p.lnk) } : undefined}
      />

      <h3 className="font-semibold">Reported versus re-fitted</h3>
      <p className="text-sm text-muted">
        k in {kLabel}; energies in {SUPPORTED_UNITS.energy.find((u) => u.id === energyUnit)?.label ?? energyUnit}. Temperatures in K.
      </p>
      <ScrollRegion label="Reported versus re-fitted parameters">
        <table className="table">
          <thead>
            <tr>
              <th scope="col">Parameter</th>
              <th scope="col">Reported by the authors</th>
              <th scope="col">Re-fitted here</th>
            </tr>
          </thead>
          <tbody>
            <tr>
              <th scope="row">Temperature range (K)</th>
              <td>
                {reported?.Tmin !== undefined && reported?.Tmax !== undefined
                  ? formatRange(reported.Tmin, reported.Tmax, "")
                  : reported?.Tmin !== undefined
                    ? `from ${formatNumber(reported.Tmin, 4)}`
                    : reported?.Tmax !== undefined
                      ? `up to ${formatNumber(reported.Tmax, 4)}`
                      : "not stated"}
              </td>
              <td>{formatRange(TminData, TmaxData, "")} (the data)</td>
            </tr>
          </tbody>
          <tbody>
            <tr>
              <th scope="colgroup" colSpan={3} className="bg-panel">
                {MODEL_WORDS.arrhenius}
              </th>
            </tr>
            <tr>
              <th scope="row">A ({kLabel})</th>
              <td>{rep("arrhenius") ? sig(k(rep("arrhenius")!.A)) : notThisModel}</td>
              <td>{sig(k(a.params.A))}</td>
            </tr>
            <tr>
              <th scope="row">{ELabel}</th>
              <td>{rep("arrhenius") ? sig(E(rep("arrhenius")!.Ea)) : "—"}</td>
              <td>{sig(E(a.params.Ea))}</td>
            </tr>
            <tr>
              <th scope="row">
                k({sig(Tmid)} K) ({kLabel}), middle of the data in 1/T
              </th>
              <td>{rep("arrhenius") ? sig(k(kOf(rep("arrhenius")!, Tmid))) : "—"}</td>
              <td>
                {sig(k(a.kMid.value))} (95 %: {sig(k(a.kMid.lower), 3)} … {sig(k(a.kMid.upper), 3)})
              </td>
            </tr>
            <tr>
              <th scope="row">
                k({REFERENCE_TEMPERATURE} K) ({kLabel})
              </th>
              <td>{rep("arrhenius") ? sig(k(kOf(rep("arrhenius")!, REFERENCE_TEMPERATURE))) : "—"}</td>
              <td>
                {sig(k(a.k298.value))} (95 %: {sig(k(a.k298.lower), 3)} … {sig(k(a.k298.upper), 3)})
                {a.k298.extrapolation && <span className="block text-xs text-warn">{describeExtrapolation(a.k298.extrapolation)}</span>}
              </td>
            </tr>
          </tbody>
          {(mod || rep("modified_arrhenius")) && (
            <tbody>
              <tr>
                <th scope="colgroup" colSpan={3} className="bg-panel">
                  {MODEL_WORDS.modified_arrhenius}
                </th>
              </tr>
              <tr>
                <th scope="row">A ({kLabel})</th>
                <td>{rep("modified_arrhenius") ? sig(k(rep("modified_arrhenius")!.A)) : notThisModel}</td>
                <td>{mod ? sig(k(mod.A)) : "not fitted"}</td>
              </tr>
              <tr>
                <th scope="row">n</th>
                <td>{rep("modified_arrhenius") ? sig(rep("modified_arrhenius")!.n) : "—"}</td>
                <td>{mod ? sig(mod.n) : "—"}</td>
              </tr>
              <tr>
                <th scope="row">{ELabel}</th>
                <td>{rep("modified_arrhenius") ? sig(E(rep("modified_arrhenius")!.Ea)) : "—"}</td>
                <td>{mod ? sig(E(mod.Ea)) : "—"}</td>
              </tr>
              <tr>
                <th scope="row">T0 (K)</th>
                <td>{rep("modified_arrhenius") ? sig(rep("modified_arrhenius")!.T0, 5) : "—"}</td>
                <td>{mod ? sig(mod.T0, 5) : "—"}</td>
              </tr>
              <tr>
                <th scope="row">
                  k({sig(Tmid)} K) ({kLabel})
                </th>
                <td>{rep("modified_arrhenius") ? sig(k(kOf(rep("modified_arrhenius")!, Tmid))) : "—"}</td>
                <td>{mod ? sig(k(kOf(mod, Tmid))) : "—"}</td>
              </tr>
            </tbody>
          )}
        </table>
      </ScrollRegion>
    </div>
  );
}
