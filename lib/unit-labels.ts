/**
 * Column and row labels of quantities in the unit a reader chose: the one place a symbol and its
 * unit are put together, so "Ea (K (E/R))" or an entropy left in joules beside energies in
 * calories cannot happen on one page and not another.
 */
import {
  convertEnergy,
  parseEnergyUnit,
  parsePressureUnit,
  parseRateConstantUnit,
  parseTemperatureUnit,
  UnitError,
} from "@/lib/kinetics/units";

export type UnitKind = "rateConstant" | "temperature" | "pressure" | "energy";

const PARSERS: Record<UnitKind, (text: string) => { id: string; label: string }> = {
  rateConstant: (t) => parseRateConstantUnit(t),
  temperature: parseTemperatureUnit,
  pressure: parsePressureUnit,
  energy: parseEnergyUnit,
};

/**
 * THE way a page writes a unit: its display label with true superscripts, whatever spelling was
 * stored ("cm3 molecule-1 s-1" and "cm3/molecule/s" → "cm³ molecule⁻¹ s⁻¹", "degC" → "°C"). Files
 * (the CSV, JSON and YAML downloads, the API) write `unitText`'s plain ids; pages never show them. A unit the kinetics module
 * does not know is shown as given.
 * @example unitLabel("rateConstant", "cm3 molecule-1 s-1") // "cm³ molecule⁻¹ s⁻¹"
 */
export function unitLabel(kind: UnitKind, unit: string | null | undefined): string {
  if (!unit) return "";
  try {
    return PARSERS[kind](unit).label;
  } catch (err) {
    if (err instanceof UnitError) return unit;
    throw err;
  }
}

/**
 * THE way a file meant for scripts writes a unit (CSV, JSON, YAML downloads and API answers): its
 * plain ASCII id, whatever spelling was stored ("cm³ molecule⁻¹ s⁻¹" and "cm3/molecule/s" →
 * "cm3 molecule-1 s-1", "°C" → "degC"), so one unit has one spelling in every file and a script can
 * compare it as text. Pages use `unitLabel`. A unit the kinetics module does not know is given back
 * as it is.
 * @example unitText("rateConstant", "cm³ molecule⁻¹ s⁻¹") // "cm3 molecule-1 s-1"
 */
export function unitText(kind: UnitKind, unit: string | null | undefined): string | null {
  if (!unit) return unit ?? null;
  try {
    return PARSERS[kind](unit).id;
  } catch (err) {
    if (err instanceof UnitError) return unit;
    throw err;
  }
}

/**
 * "T as deposited (°C)": a quantity and its unit in the one form of a column header.
 * @example quantityLabel("k", "rateConstant", "s-1") // "k (s⁻¹)"
 */
export function quantityLabel(quantity: string, kind: UnitKind, unit: string | null | undefined): string {
  const label = unitLabel(kind, unit);
  return label ? `${quantity} (${label})` : quantity;
}

/** The energy unit that is a temperature (E/R). */
const isTemperatureEnergy = (unitId: string) => parseEnergyUnit(unitId).id === "K";

/**
 * "Ea (kcal mol⁻¹)", or "Ea/R (K)" when energies are shown as temperatures.
 * @example energyQuantityLabel("ΔH‡", "K") // "ΔH‡/R (K)"
 */
export function energyQuantityLabel(symbol: string, unitId: string): string {
  if (isTemperatureEnergy(unitId)) return `${symbol}/R (K)`;
  if (parseEnergyUnit(unitId).id === "eV") return `${symbol} (eV, per molecule)`;
  return `${symbol} (${parseEnergyUnit(unitId).label})`;
}

/**
 * An entropy (or heat capacity) label in the chosen energy unit per kelvin: "ΔS‡ (cal mol⁻¹ K⁻¹)",
 * "ΔS‡ (eV K⁻¹, per molecule)", or "ΔS‡/R" (a pure number) when energies are shown as temperatures.
 */
export function entropyQuantityLabel(symbol: string, unitId: string): string {
  const u = parseEnergyUnit(entropyEnergyUnit(unitId));
  if (u.id === "K") return `${symbol}/R`;
  if (u.id === "eV") return `${symbol} (eV K⁻¹, per molecule)`;
  return `${symbol} (${u.label} K⁻¹)`;
}

/**
 * The energy unit entropies are written in beside energies in `unitId`: an entropy is about a
 * thousandth of an enthalpy, so J beside kJ and cal beside kcal ("−49.04 J mol⁻¹ K⁻¹", not
 * "−0.04904 kJ mol⁻¹ K⁻¹"); any other unit as it is.
 */
export function entropyEnergyUnit(unitId: string): string {
  const id = parseEnergyUnit(unitId).id;
  return id === "kJ mol-1" ? "J mol-1" : id === "kcal mol-1" ? "cal mol-1" : id;
}

/** An entropy in J mol⁻¹ K⁻¹ in the chosen energy unit per kelvin (ΔS/R when the unit is K). */
export function convertEntropy(joulesPerMoleKelvin: number, unitId: string): number {
  // Per kelvin, an entropy converts as an energy does; "K" as energy divides by R, giving ΔS/R.
  return convertEnergy(joulesPerMoleKelvin, "J mol-1", entropyEnergyUnit(unitId));
}
