"use client";

import { useId, useState } from "react";
import { useSearchParams } from "next/navigation";
import { DEFAULT_MECHANISM_ENERGY, MECHANISM_ENERGY_UNITS, mechanismRateUnits } from "@/lib/exports/mechanism-units";
import type { ReactionOrder } from "@/lib/kinetics/types";
import { parseEnergyUnit, parseRateConstantUnit } from "@/lib/kinetics/units";
import { unitsFromQuery } from "@/lib/unit-choice";

/**
 * "Parameters for a mechanism": the units (k, Ea), the layout (plain table or Cantera YAML) and, for
 * the YAML, the fit it carries; the download link is the parameters endpoint with that choice.
 * Starts from the units the page shows (an energy unit the endpoint does not offer falls back to kJ mol⁻¹),
 * and follows them when the reader switches them (the pickers write them into the address).
 */
export function MechanismDownload({
  endpoint,
  order,
  initialKUnit,
  initialEnergyUnit,
  fits,
  extraQuery = "",
}: {
  /** The parameters endpoint, absolute path, without a query. */
  endpoint: string;
  order: ReactionOrder;
  initialKUnit: string;
  initialEnergyUnit: string;
  /** The fits made (the YAML's choice of fit). */
  fits: ("arrhenius" | "modified_arrhenius")[];
  /** Query parameters to keep (the reaction page's consensus choice). */
  extraQuery?: string;
}) {
  const id = useId();
  const kUnits = mechanismRateUnits(order);
  const energyIds = MECHANISM_ENERGY_UNITS.map((u) => u.id) as readonly string[];
  const offeredK = (u: string) => (kUnits.includes(u) ? u : kUnits[0]);
  const offeredEnergy = (u: string) => (energyIds.includes(u) ? u : DEFAULT_MECHANISM_ENERGY);
  const [kUnit, setKUnit] = useState(offeredK(initialKUnit));
  const [energy, setEnergy] = useState(offeredEnergy(initialEnergyUnit));
  // The page's unit pickers keep their choice in the address (components/version-fit.tsx): a change
  // there is followed here (set while rendering, as React advises for state that follows a value).
  // (No address outside Next's router, e.g. a page rendered by a test: the page's own units then.)
  const address = useSearchParams() as URLSearchParams | null;
  const shown = address ? unitsFromQuery(order, Object.fromEntries(address)) : { kUnit: initialKUnit, energyUnit: initialEnergyUnit };
  const [followed, setFollowed] = useState(shown);
  if (followed.kUnit !== shown.kUnit || followed.energyUnit !== shown.energyUnit) {
    setFollowed(shown);
    if (followed.kUnit !== shown.kUnit) setKUnit(offeredK(shown.kUnit));
    if (followed.energyUnit !== shown.energyUnit) setEnergy(offeredEnergy(shown.energyUnit));
  }
  const [fit, setFit] = useState<"preferred" | "arrhenius" | "modified_arrhenius">("preferred");
  const href = (format: "table" | "cantera-yaml") => {
    const q = new URLSearchParams(extraQuery);
    q.set("format", format);
    q.set("k", kUnit);
    q.set("energy", energy);
    if (format === "cantera-yaml" && fit !== "preferred") q.set("fit", fit);
    return `${endpoint}?${q.toString()}`;
  };
  return (
    <div className="space-y-3" data-testid="mechanism-download">
      <div className="flex flex-wrap gap-4">
        <label className="space-y-1 text-sm" htmlFor={`${id}-k`}>
          <span className="block font-medium">A in</span>
          <select id={`${id}-k`} value={kUnit} onChange={(e) => setKUnit(e.target.value)} className="field-input">
            {kUnits.map((u) => (
              <option key={u} value={u}>
                {parseRateConstantUnit(u, order).label}
              </option>
            ))}
          </select>
        </label>
        <label className="space-y-1 text-sm" htmlFor={`${id}-energy`}>
          <span className="block font-medium">Ea in</span>
          <select id={`${id}-energy`} value={energy} onChange={(e) => setEnergy(e.target.value)} className="field-input">
            {energyIds.map((u) => (
              <option key={u} value={u}>
                {parseEnergyUnit(u).label}
              </option>
            ))}
          </select>
        </label>
        {fits.length > 1 && (
          <label className="space-y-1 text-sm" htmlFor={`${id}-fit`}>
            <span className="block font-medium">Fit in the YAML</span>
            <select id={`${id}-fit`} value={fit} onChange={(e) => setFit(e.target.value as typeof fit)} className="field-input">
              <option value="preferred">the preferred fit</option>
              {fits.includes("arrhenius") && <option value="arrhenius">Arrhenius</option>}
              {fits.includes("modified_arrhenius") && <option value="modified_arrhenius">modified Arrhenius</option>}
            </select>
          </label>
        )}
      </div>
      <ul className="flex flex-wrap gap-3 text-sm">
        <li>
          <a className="btn-secondary" href={href("table")} download>
            Parameters as a table (text)
          </a>
        </li>
        <li>
          <a className="btn-secondary" href={href("cantera-yaml")} download>
            Parameters as Cantera YAML
          </a>
        </li>
      </ul>
    </div>
  );
}
