/**
 * The unit systems of mechanism files and their conversion to the canonical units of lib/kinetics
 * (molecule, cm, s; J mol⁻¹). Constants come from lib/kinetics (CODATA 2018).
 */
import { AVOGADRO } from "@/lib/kinetics/constants";
import { toJoulesPerMole } from "@/lib/kinetics/units";

/** The units one mechanism's numbers are written in. */
export interface MechanismUnits {
  /** Length unit in cm (cm = 1, m = 100). */
  lengthCm: number;
  /** Quantity unit in molecules (molecule = 1, mol = N_A, kmol = 1000 N_A). */
  quantityMolecules: number;
  /** Time unit in s. */
  timeS: number;
  /** Activation energy unit in J mol⁻¹ (per mol of reaction; K means Ea/R). */
  energyJPerMol: number;
  /** The same, in words for the report. */
  words: { rateConstant: string; energy: string };
  /**
   * Cantera YAML only: the `energy` unit in force ("" = J) and whether an `activation-energy` unit was set
   * explicitly. A nested `units` block inherits both: an explicit one stays, a derived one follows the new
   * energy and quantity (Cantera's UnitSystem rule).
   */
  yamlEnergy?: string;
  activationExplicit?: boolean;
}

/** A modified Arrhenius A of a reaction of the given order, from the mechanism's units to cm, molecule, s. */
export function canonicalPreExponential(A: number, order: number, units: MechanismUnits): number {
  const volumePerQuantity = units.lengthCm ** 3 / units.quantityMolecules;
  return (A * volumePerQuantity ** (order - 1)) / units.timeS;
}

/** Activation energy in J mol⁻¹. */
export function canonicalActivationEnergy(Ea: number, units: MechanismUnits): number {
  return Ea * units.energyJPerMol;
}

// ---------------------------------------------------------------- plain-text keywords

/** Energy keywords of the REACTIONS line (case does not matter) → lib/kinetics energy unit id. */
export const PLAIN_ENERGY_KEYWORDS: Record<string, string> = {
  "CAL/MOLE": "cal mol-1",
  "KCAL/MOLE": "kcal mol-1",
  "JOULES/MOLE": "J mol-1",
  "KJOULES/MOLE": "kJ mol-1",
  "KJ/MOLE": "kJ mol-1",
  KELVINS: "K",
  EVOLTS: "eV",
};

/** Quantity keywords of the REACTIONS line → molecules per unit. */
export const PLAIN_QUANTITY_KEYWORDS: Record<string, number> = { MOLES: AVOGADRO, MOLECULES: 1 };

/** The classic layout's defaults: cal/mol and cm³/mol/s. */
export function plainTextUnits(energy = "CAL/MOLE", quantity = "MOLES"): MechanismUnits {
  return {
    lengthCm: 1,
    quantityMolecules: PLAIN_QUANTITY_KEYWORDS[quantity],
    timeS: 1,
    energyJPerMol: toJoulesPerMole(1, PLAIN_ENERGY_KEYWORDS[energy]),
    words: {
      rateConstant: quantity === "MOLES" ? "cm, mol, s" : "cm, molecule, s",
      energy: energy.toLowerCase(),
    },
  };
}

// ---------------------------------------------------------------- Cantera YAML `units`

export const YAML_LENGTH: Record<string, number> = { m: 100, cm: 1, mm: 0.1, dm: 10, km: 1e5 };
export const YAML_QUANTITY: Record<string, number> = {
  mol: AVOGADRO,
  kmol: 1000 * AVOGADRO,
  molec: 1,
  molecule: 1,
  molecules: 1,
};
export const YAML_TIME: Record<string, number> = { s: 1, ms: 1e-3, min: 60, h: 3600, hr: 3600 };
/** Energy units per quantity unit (the `energy` key, joined with `quantity` when `activation-energy` is absent). */
export const YAML_ENERGY: Record<string, number> = {
  J: 1,
  kJ: 1000,
  cal: 4.184,
  kcal: 4184,
  eV: toJoulesPerMole(1, "eV") / AVOGADRO,
};

/** Activation-energy units Cantera accepts (energy per quantity, K, eV). */
export function yamlActivationEnergyUnit(text: string): number | null {
  const t = text.replace(/\s+/g, "");
  if (t === "K") return toJoulesPerMole(1, "K");
  if (t === "eV") return toJoulesPerMole(1, "eV");
  const m = /^([A-Za-z]+)\/([A-Za-z]+)$/.exec(t);
  if (!m) return null;
  const energy = YAML_ENERGY[m[1]];
  const quantity = YAML_QUANTITY[m[2]];
  if (energy === undefined || quantity === undefined) return null;
  // J per quantity unit → J per mol.
  return (energy / quantity) * AVOGADRO;
}

/** Cantera's defaults when a file says nothing: m, kmol, s, J/kmol (SI with kmol; from Cantera's documentation of its YAML format). */
export const YAML_DEFAULT_UNITS = { length: "m", quantity: "kmol", time: "s", "activation-energy": "J/kmol" } as const;
