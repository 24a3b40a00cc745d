"use client";

import { SUPPORTED_UNITS } from "@/lib/kinetics/units";
import type { ReactionOrder } from "@/lib/kinetics/types";

/** "Show k in" and "Show energies in": the reader's choice of units for a fit's plot and tables. */
export function UnitPickers({
  order,
  kUnit,
  onKUnit,
  energyUnit,
  onEnergyUnit,
}: {
  order: ReactionOrder;
  kUnit: string;
  onKUnit: (id: string) => void;
  energyUnit: string;
  onEnergyUnit: (id: string) => void;
}) {
  return (
    <div className="flex flex-wrap gap-4">
      <label className="space-y-1 text-sm">
        <span className="block font-medium">Show k in</span>
        <select value={kUnit} onChange={(e) => onKUnit(e.target.value)} className="field-input">
          {SUPPORTED_UNITS.rateConstant[order].map((u) => (
            <option key={u.id} value={u.id}>
              {u.label}
            </option>
          ))}
        </select>
      </label>
      <label className="space-y-1 text-sm">
        <span className="block font-medium">Show energies in</span>
        <select value={energyUnit} onChange={(e) => onEnergyUnit(e.target.value)} className="field-input">
          {SUPPORTED_UNITS.energy.map((u) => (
            <option key={u.id} value={u.id}>
              {u.label}
            </option>
          ))}
        </select>
      </label>
    </div>
  );
}
