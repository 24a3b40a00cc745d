"use client";

import { useState } from "react";
import { UnitPickers } from "@/components/unit-pickers";
import type { AnalysisResult, ReactionOrder } from "@/lib/kinetics/types";
import { SUPPORTED_UNITS, convertEnergy, displayConversion, fromCanonicalRateConstant } from "@/lib/kinetics/units";
import { ArrheniusPlot } from "./arrhenius-plot";
import { ReportedExpression, type ReportedExpressionSource } from "./reported-expression";
import { ResultTables } from "./result-tables";

/** A stored version's fit: plot, parameters in units the reader picks, and the checks. */
export function VersionFit({
  analysis,
  order,
  points,
  reported,
}: {
  analysis: AnalysisResult;
  order: ReactionOrder;
  points: { T: number; k: number }[];
  /** The authors' own expression, shown in the units chosen here so it can be read beside the fit. */
  reported?: ReportedExpressionSource;
}) {
  const kUnits = SUPPORTED_UNITS.rateConstant[order];
  const [kUnit, setKUnit] = useState<string>(kUnits[0].id);
  const [energyUnit, setEnergyUnit] = useState("kJ mol-1");
  const outliers = new Set(analysis.flags.filter((f) => f.code === "outlier").flatMap((f) => f.points ?? []));
  return (
    <div className="space-y-4">
      <UnitPickers order={order} kUnit={kUnit} onKUnit={setKUnit} energyUnit={energyUnit} onEnergyUnit={setEnergyUnit} />
      {reported?.reportedFit && (
        <section className="card space-y-2" aria-labelledby="reported-heading">
          <h3 id="reported-heading" className="font-semibold">
            Expression the authors report, in the units chosen above
          </h3>
          <ReportedExpression doc={reported} kUnit={kUnit} energyUnit={energyUnit} />
        </section>
      )}
      <div className="card">
        <ArrheniusPlot
          kUnitLabel={kUnits[0].label}
          band={analysis.band}
          points={points.map((p, i) => ({ T: p.T, lnk: Math.log(p.k), outlier: outliers.has(i) }))}
        />
      </div>
      <ResultTables
        analysis={analysis}
        order={order}
        kUnit={kUnit}
        kLabel={kUnits.find((u) => u.id === kUnit)?.label ?? kUnit}
        energyUnit={energyUnit}
        convertK={(k) => displayConversion(() => fromCanonicalRateConstant(k, kUnit, order))}
        convertE={(e) => displayConversion(() => convertEnergy(e, "J mol-1", energyUnit))}
        lineOf={(i) => i + 1}
        pointWord="Point"
      />
    </div>
  );
}
