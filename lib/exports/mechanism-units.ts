/**
 * The units the mechanism-parameter downloads offer (pages' choosers and the endpoints share them).
 * Pure and small: client components import it without the YAML writer.
 */
import type { ReactionOrder } from "@/lib/kinetics/types";
import { SUPPORTED_UNITS } from "@/lib/kinetics/units";

/** The Ea units on offer (ids of lib/kinetics/units) and how Cantera's units block names each. */
export const MECHANISM_ENERGY_UNITS = [
  { id: "kJ mol-1", cantera: "kJ/mol" },
  { id: "kcal mol-1", cantera: "kcal/mol" },
  { id: "J mol-1", cantera: "J/mol" },
  { id: "cal mol-1", cantera: "cal/mol" },
  { id: "K", cantera: "K" },
] as const;

export const DEFAULT_MECHANISM_ENERGY = "kJ mol-1";

/** Rate-constant units on offer for an order: every supported unit of that order (lib/kinetics/units). */
export const mechanismRateUnits = (order: ReactionOrder) => SUPPORTED_UNITS.rateConstant[order].map((u) => u.id);
