/**
 * The reader's choice of units on a public page, kept in the page's address (`?k=…&energy=…`) so a
 * shared or reloaded link shows the same numbers. Pure: server pages read it, client pickers write it.
 */
import type { ReactionOrder } from "@/lib/kinetics/types";
import { SUPPORTED_UNITS } from "@/lib/kinetics/units";

/** The query parameters that hold the choice. */
export const UNIT_PARAMS = { k: "k", energy: "energy" } as const;

export const DEFAULT_ENERGY_UNIT = "kJ mol-1";

/** The reader's units from the address, each checked against the units on offer (else the default). */
export function unitsFromQuery(order: ReactionOrder, query: Record<string, string | string[] | undefined>) {
  const one = (v: string | string[] | undefined) => (Array.isArray(v) ? v[0] : v);
  const k = one(query[UNIT_PARAMS.k]);
  const energy = one(query[UNIT_PARAMS.energy]);
  return {
    kUnit: SUPPORTED_UNITS.rateConstant[order].some((u) => u.id === k) ? k! : SUPPORTED_UNITS.rateConstant[order][0].id,
    energyUnit: SUPPORTED_UNITS.energy.some((u) => u.id === energy) ? energy! : DEFAULT_ENERGY_UNIT,
  };
}
