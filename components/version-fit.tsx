"use client";

import { useState } from "react";
import { UnitPickers } from "@/components/unit-pickers";
import type { PointRow } from "@/lib/datasets/point-table";
import type { AnalysisResult, ReactionOrder } from "@/lib/kinetics/types";
import { SUPPORTED_UNITS, convertEnergy, displayConversion, fromCanonicalRateConstant } from "@/lib/kinetics/units";
import { DEFAULT_ENERGY_UNIT, UNIT_PARAMS } from "@/lib/unit-choice";
import { unitLabel } from "@/lib/unit-labels";
import { ArrheniusPlot } from "./arrhenius-plot";
import { PointTable } from "./point-table";
import { ReportedExpression, type ReportedExpressionSource } from "./reported-expression";
import { ResultTables } from "./result-tables";

/**
 * Writes one unit choice into the address without a navigation, so a shared or reloaded link keeps
 * it. With no state of its own (null): Next then takes the new address into useSearchParams, which
 * the other pickers of the page follow (components/exports/mechanism-download.tsx).
 */
function keepInAddress(name: string, value: string, fallback: string) {
  const url = new URL(window.location.href);
  if (value === fallback) url.searchParams.delete(name);
  else url.searchParams.set(name, value);
  window.history.replaceState(null, "", url);
}

/**
 * A stored version's data and fit in units the reader picks (kept in the address): plot with
 * error bars and band, every point in a table, the parameters and the checks.
 */
export function VersionFit({
  analysis,
  order,
  points,
  rows,
  totalRows,
  reported,
  initialKUnit,
  initialEnergyUnit,
  downloadsHref,
}: {
  analysis: AnalysisResult | null;
  order: ReactionOrder;
  points: { T: number; k: number; sigmaLnK: number | null }[];
  rows: PointRow[];
  totalRows: number;
  /** The authors' own expression, shown in the units chosen here so it can be read beside the fit. */
  reported?: ReportedExpressionSource;
  initialKUnit: string;
  initialEnergyUnit: string;
  downloadsHref: string;
}) {
  const kUnits = SUPPORTED_UNITS.rateConstant[order];
  const [kUnit, setKUnit] = useState<string>(initialKUnit);
  const [energyUnit, setEnergyUnit] = useState(initialEnergyUnit);
  const kLabel = unitLabel("rateConstant", kUnit);
  // ln k in the chosen unit is ln k (canonical) + ln(unit factor): the plot moves with the choice.
  const lnFactor = Math.log(displayConversion(() => fromCanonicalRateConstant(1, kUnit, order)));
  const shift = (xs: number[] | null) => (xs ? xs.map((x) => x + lnFactor) : null);
  const outliers = new Set(analysis?.flags.filter((f) => f.code === "outlier").flatMap((f) => f.points ?? []));
  const convertK = (k: number) => displayConversion(() => fromCanonicalRateConstant(k, kUnit, order));
  const modelName = analysis ? (analysis.band.model === "modified_arrhenius" ? "modified Arrhenius" : "Arrhenius") : null;
  return (
    <div className="space-y-4">
      <UnitPickers
        order={order}
        kUnit={kUnit}
        onKUnit={(id) => {
          setKUnit(id);
          keepInAddress(UNIT_PARAMS.k, id, kUnits[0].id);
        }}
        energyUnit={energyUnit}
        onEnergyUnit={(id) => {
          setEnergyUnit(id);
          keepInAddress(UNIT_PARAMS.energy, id, DEFAULT_ENERGY_UNIT);
        }}
      />
      {reported?.reportedFit && (
        <section className="card space-y-2" aria-labelledby="reported-heading">
          <h3 id="reported-heading" className="font-semibold">
            Expression the authors report, in the units chosen above
          </h3>
          <ReportedExpression doc={reported} kUnit={kUnit} energyUnit={energyUnit} />
        </section>
      )}
      {analysis && (
        <div className="card">
          <ArrheniusPlot
            kUnitLabel={kLabel}
            band={{
              ...analysis.band,
              lnk: shift(analysis.band.lnk)!,
              lower: shift(analysis.band.lower),
              upper: shift(analysis.band.upper),
            }}
            points={points.map((p, i) => ({
              T: p.T,
              lnk: Math.log(p.k) + lnFactor,
              outlier: outliers.has(i),
              ...(p.sigmaLnK ? { sigmaLnK: p.sigmaLnK } : {}),
            }))}
            dataTableHref="#data-table"
          />
        </div>
      )}
      <PointTable
        id="data-table"
        rows={rows}
        totalRows={totalRows}
        kUnitLabel={kLabel}
        convertK={convertK}
        weighted={analysis?.weighted ?? false}
        residualModelName={modelName}
        downloadsHref={downloadsHref}
      />
      {analysis && (
        <ResultTables
          analysis={analysis}
          order={order}
          kUnit={kUnit}
          kLabel={kLabel}
          energyUnit={energyUnit}
          convertK={convertK}
          convertE={(e) => displayConversion(() => convertEnergy(e, "J mol-1", energyUnit))}
          lineOf={(i) => i + 1}
          pointWord="Point"
        />
      )}
    </div>
  );
}
