/**
 * Units of rate constants, energies, temperatures and pressures, and uncertainty conversions.
 *
 * Unit strings are parsed strictly: after a light normalisation (Unicode superscripts ³ ⁻ ¹ → 3 - 1,
 * "^" dropped, "·" or "*" read as a space, runs of spaces collapsed) the text must equal one of the
 * spellings listed in {@link SUPPORTED_UNITS}. Anything else raises a {@link UnitError} that lists
 * what is accepted. Case matters ("M" is molar, "m" is metre).
 *
 * Canonical units: k in s⁻¹ (order 1), cm³ molecule⁻¹ s⁻¹ (2), cm⁶ molecule⁻² s⁻¹ (3);
 * energy J mol⁻¹; temperature K; pressure Pa.
 */
import { AVOGADRO, CALORIE, CELSIUS_ZERO, ELEMENTARY_CHARGE, GAS_CONSTANT, PLANCK, SPEED_OF_LIGHT, STANDARD_ATMOSPHERE } from "./constants";
import type { ReactionOrder } from "./types";

/** Stable codes of {@link UnitError}. */
export type UnitErrorCode =
  | "unknown_unit"
  | "order_mismatch"
  | "below_absolute_zero"
  | "negative_pressure"
  | "invalid_value"
  | "invalid_uncertainty"
  | "out_of_range";

/** A unit string or value that cannot be used; `accepted` lists valid spellings where relevant. */
export class UnitError extends Error {
  readonly code: UnitErrorCode;
  readonly accepted?: readonly string[];

  constructor(code: UnitErrorCode, message: string, accepted?: readonly string[]) {
    super(message);
    this.name = "UnitError";
    this.code = code;
    if (accepted) this.accepted = accepted;
  }
}

export type UnitKind = "rate_constant" | "energy" | "temperature" | "pressure";

/** One supported unit: its id (the preferred ASCII spelling), a display label and the other spellings accepted. */
export interface UnitDefinition {
  id: string;
  label: string;
  aliases: readonly string[];
}

/** A rate-constant unit: k_canonical = k · 10^exp10 · N_A^expAvogadro. */
export interface RateConstantUnit extends UnitDefinition {
  order: ReactionOrder;
  exp10: number;
  expAvogadro: number;
}

/** A linear unit: value_canonical = value · factor (+ offset for temperatures). */
export interface LinearUnit extends UnitDefinition {
  factor: number;
  offset?: number;
}

const RATE_UNITS: readonly RateConstantUnit[] = [
  { id: "s-1", label: "s⁻¹", order: 1, exp10: 0, expAvogadro: 0, aliases: ["1/s", "/s"] },
  {
    id: "cm3 molecule-1 s-1",
    label: "cm³ molecule⁻¹ s⁻¹",
    order: 2,
    exp10: 0,
    expAvogadro: 0,
    aliases: ["cm3/molecule/s", "cm3/(molecule s)", "cm3 molec-1 s-1", "cm3 s-1 molecule-1", "cm3 molecule-1 sec-1"],
  },
  { id: "cm3 mol-1 s-1", label: "cm³ mol⁻¹ s⁻¹", order: 2, exp10: 0, expAvogadro: -1, aliases: ["cm3/mol/s", "cm3/(mol s)"] },
  {
    id: "L mol-1 s-1",
    label: "L mol⁻¹ s⁻¹",
    order: 2,
    exp10: 3,
    expAvogadro: -1,
    aliases: ["l mol-1 s-1", "L/mol/s", "L/(mol s)", "dm3 mol-1 s-1", "dm3/mol/s", "M-1 s-1", "1/(M s)", "M-1s-1"],
  },
  { id: "m3 mol-1 s-1", label: "m³ mol⁻¹ s⁻¹", order: 2, exp10: 6, expAvogadro: -1, aliases: ["m3/mol/s", "m3/(mol s)"] },
  {
    id: "m3 molecule-1 s-1",
    label: "m³ molecule⁻¹ s⁻¹",
    order: 2,
    exp10: 6,
    expAvogadro: 0,
    aliases: ["m3/molecule/s", "m3/(molecule s)"],
  },
  {
    id: "cm6 molecule-2 s-1",
    label: "cm⁶ molecule⁻² s⁻¹",
    order: 3,
    exp10: 0,
    expAvogadro: 0,
    aliases: ["cm6/molecule2/s", "cm6/(molecule2 s)", "cm6 molec-2 s-1", "cm6 s-1 molecule-2"],
  },
  { id: "cm6 mol-2 s-1", label: "cm⁶ mol⁻² s⁻¹", order: 3, exp10: 0, expAvogadro: -2, aliases: ["cm6/mol2/s", "cm6/(mol2 s)"] },
  {
    id: "L2 mol-2 s-1",
    label: "L² mol⁻² s⁻¹",
    order: 3,
    exp10: 6,
    expAvogadro: -2,
    aliases: ["l2 mol-2 s-1", "L2/mol2/s", "L2/(mol2 s)", "dm6 mol-2 s-1", "dm6/mol2/s", "M-2 s-1", "M-2s-1"],
  },
  { id: "m6 mol-2 s-1", label: "m⁶ mol⁻² s⁻¹", order: 3, exp10: 12, expAvogadro: -2, aliases: ["m6/mol2/s", "m6/(mol2 s)"] },
  { id: "m6 molecule-2 s-1", label: "m⁶ molecule⁻² s⁻¹", order: 3, exp10: 12, expAvogadro: 0, aliases: ["m6/molecule2/s"] },
];

const ENERGY_UNITS: readonly LinearUnit[] = [
  { id: "J mol-1", label: "J mol⁻¹", factor: 1, aliases: ["J/mol"] },
  { id: "kJ mol-1", label: "kJ mol⁻¹", factor: 1000, aliases: ["kJ/mol"] },
  // Thermochemical calorie, 4.184 J exactly.
  { id: "cal mol-1", label: "cal mol⁻¹", factor: CALORIE, aliases: ["cal/mol"] },
  { id: "kcal mol-1", label: "kcal mol⁻¹", factor: 1000 * CALORIE, aliases: ["kcal/mol"] },
  // Per molecule: 1 eV ↦ e·N_A J mol⁻¹.
  { id: "eV", label: "eV (per molecule)", factor: ELEMENTARY_CHARGE * AVOGADRO, aliases: ["eV/molecule", "eV molecule-1"] },
  // Wavenumber: E = h·c·ν̃·N_A with ν̃ in m⁻¹ = 100 × cm⁻¹.
  { id: "cm-1", label: "cm⁻¹", factor: PLANCK * SPEED_OF_LIGHT * 100 * AVOGADRO, aliases: ["1/cm", "wavenumber"] },
  // Energy as a temperature, E/R.
  { id: "K", label: "K (E/R)", factor: GAS_CONSTANT, aliases: ["K (E/R)", "E/R K"] },
];

const TEMPERATURE_UNITS: readonly LinearUnit[] = [
  { id: "K", label: "K", factor: 1, aliases: ["kelvin"] },
  { id: "degC", label: "°C", factor: 1, offset: CELSIUS_ZERO, aliases: ["°C", "℃", "deg C", "Celsius"] },
];

const PRESSURE_UNITS: readonly LinearUnit[] = [
  { id: "Pa", label: "Pa", factor: 1, aliases: [] },
  { id: "kPa", label: "kPa", factor: 1000, aliases: [] },
  { id: "bar", label: "bar", factor: 1e5, aliases: [] },
  { id: "mbar", label: "mbar", factor: 100, aliases: [] },
  { id: "atm", label: "atm", factor: STANDARD_ATMOSPHERE, aliases: [] },
  // 1 Torr = 101325/760 Pa exactly.
  { id: "Torr", label: "Torr", factor: STANDARD_ATMOSPHERE / 760, aliases: ["torr"] },
];

/** Supported units per kind (and per reaction order for rate constants), for pickers and docs. */
export const SUPPORTED_UNITS = {
  rateConstant: {
    1: RATE_UNITS.filter((u) => u.order === 1),
    2: RATE_UNITS.filter((u) => u.order === 2),
    3: RATE_UNITS.filter((u) => u.order === 3),
  },
  energy: ENERGY_UNITS,
  temperature: TEMPERATURE_UNITS,
  pressure: PRESSURE_UNITS,
} as const;

/** Canonical rate-constant unit id for a reaction order. */
export function getCanonicalRateConstantUnit(order: ReactionOrder): string {
  return order === 1 ? "s-1" : order === 2 ? "cm3 molecule-1 s-1" : "cm6 molecule-2 s-1";
}

const SUPERSCRIPTS: Record<string, string> = {
  "⁰": "0",
  "¹": "1",
  "²": "2",
  "³": "3",
  "⁴": "4",
  "⁵": "5",
  "⁶": "6",
  "⁷": "7",
  "⁸": "8",
  "⁹": "9",
  "⁻": "-",
  "−": "-",
};

/** Normalise spelling variants of a unit string (superscripts, carets, multiplication dots, spaces). */
export function normaliseUnitText(text: string): string {
  return text
    .replace(/[⁰¹²³⁴⁵⁶⁷⁸⁹⁻−]/g, (c) => SUPERSCRIPTS[c])
    .replace(/\^/g, "")
    .replace(/[·⋅*]/g, " ")
    .replace(/\s+/g, " ")
    .trim();
}

function buildIndex<U extends UnitDefinition>(units: readonly U[]): Map<string, U> {
  const index = new Map<string, U>();
  for (const u of units) {
    for (const spelling of [u.id, u.label, ...u.aliases]) index.set(normaliseUnitText(spelling), u);
  }
  return index;
}

const RATE_INDEX = buildIndex(RATE_UNITS);
const ENERGY_INDEX = buildIndex(ENERGY_UNITS);
const TEMPERATURE_INDEX = buildIndex(TEMPERATURE_UNITS);
const PRESSURE_INDEX = buildIndex(PRESSURE_UNITS);

const ORDER_WORDS: Record<ReactionOrder, string> = { 1: "first", 2: "second", 3: "third" };

function listSpellings(units: readonly UnitDefinition[]): string[] {
  return units.map((u) => (u.aliases.length ? `${u.id} (also ${u.aliases.join(", ")})` : u.id));
}

function lookup<U extends UnitDefinition>(text: unknown, index: Map<string, U>, units: readonly U[], what: string): U {
  if (typeof text !== "string")
    throw new UnitError(
      "unknown_unit",
      `A ${what} unit must be a string (got ${String(text)}).`,
      units.map((u) => u.id),
    );
  const unit = index.get(normaliseUnitText(text));
  if (!unit) {
    throw new UnitError(
      "unknown_unit",
      `Unknown ${what} unit "${text}". Accepted: ${listSpellings(units).join("; ")}. Exponents may be written 3, ^3 or ³.`,
      units.map((u) => u.id),
    );
  }
  return unit;
}

/**
 * Parse a rate-constant unit; when `order` is given the unit must belong to that order.
 *
 * @example parseRateConstantUnit("cm³ molecule⁻¹ s⁻¹", 2).id // "cm3 molecule-1 s-1"
 */
export function parseRateConstantUnit(text: string, order?: ReactionOrder): RateConstantUnit {
  const candidates = order ? RATE_UNITS.filter((u) => u.order === order) : RATE_UNITS;
  const unit = lookup(text, RATE_INDEX, candidates, order ? `${ORDER_WORDS[order]}-order rate-constant` : "rate-constant");
  if (order !== undefined && unit.order !== order) {
    throw new UnitError(
      "order_mismatch",
      `"${text}" is a ${ORDER_WORDS[unit.order]}-order unit, but this reaction is ${ORDER_WORDS[order]} order. Use one of: ${candidates.map((u) => u.id).join(", ")}.`,
      candidates.map((u) => u.id),
    );
  }
  return unit;
}

/** Parse an energy unit (J mol⁻¹, kJ mol⁻¹, cal mol⁻¹, kcal mol⁻¹, eV, cm⁻¹, K as E/R). */
export function parseEnergyUnit(text: string): LinearUnit {
  return lookup(text, ENERGY_INDEX, ENERGY_UNITS, "energy");
}

/** Parse a temperature unit (K, °C). */
export function parseTemperatureUnit(text: string): LinearUnit {
  return lookup(text, TEMPERATURE_INDEX, TEMPERATURE_UNITS, "temperature");
}

/** Parse a pressure unit (Pa, kPa, bar, mbar, atm, Torr). */
export function parsePressureUnit(text: string): LinearUnit {
  return lookup(text, PRESSURE_INDEX, PRESSURE_UNITS, "pressure");
}

function assertFinite(value: number, what: string): void {
  if (typeof value !== "number" || !Number.isFinite(value)) {
    throw new UnitError("invalid_value", `The ${what} must be a finite number (got ${String(value)}).`);
  }
}

/** Smallest positive double held to full precision (2^−1022); below it digits are lost. */
const MIN_NORMAL = 2.2250738585072014e-308;

/**
 * The converted value, or a {@link UnitError} when it left the range of a double: beyond
 * ±1.8e308 (it would be Infinity) or, from a non-zero value, below 2.2e-308 (digits lost or 0).
 */
function inRange(converted: number, value: number, from: string, to: string, what: string): number {
  if (Number.isFinite(converted) && (value === 0 || Math.abs(converted) >= MIN_NORMAL)) return converted;
  const direction = Number.isFinite(converted)
    ? "below 2.2e-308, the smallest number held to full precision"
    : "beyond 1.8e308, the largest representable number";
  throw new UnitError(
    "out_of_range",
    `The ${what} ${value} ${from} is ${direction}, once converted to ${to}; check the value and its unit.`,
  );
}

/** Multiply by 10^e10 · N_A^eNA with at most one rounding per factor (divisions for negative powers). */
function scaleRate(value: number, e10: number, eNA: number): number {
  let v = value;
  for (let i = 0; i < Math.abs(eNA); i++) v = eNA > 0 ? v * AVOGADRO : v / AVOGADRO;
  return e10 >= 0 ? v * 10 ** e10 : v / 10 ** -e10;
}

/**
 * Convert between two parsed rate-constant units of the same order; throws a {@link UnitError}
 * ("out_of_range") when the result does not fit a double.
 */
export function convertRateConstantBetween(value: number, f: RateConstantUnit, t: RateConstantUnit): number {
  return inRange(scaleRate(value, f.exp10 - t.exp10, f.expAvogadro - t.expAvogadro), value, f.label, t.label, "rate constant");
}

/**
 * Convert a rate constant (or pre-exponential factor) between units of the same order.
 *
 * @example convertRateConstant(6.3e-15, "cm3 molecule-1 s-1", "L mol-1 s-1") // 3.7939e6
 */
export function convertRateConstant(value: number, from: string, to: string, order?: ReactionOrder): number {
  assertFinite(value, "rate constant");
  const f = parseRateConstantUnit(from, order);
  const t = parseRateConstantUnit(to, order);
  if (f.order !== t.order) {
    throw new UnitError(
      "order_mismatch",
      `Cannot convert ${f.id} (${ORDER_WORDS[f.order]} order) to ${t.id} (${ORDER_WORDS[t.order]} order): rate constants of different reaction orders are different quantities.`,
      RATE_UNITS.filter((u) => u.order === f.order).map((u) => u.id),
    );
  }
  return convertRateConstantBetween(value, f, t);
}

/**
 * For tables: the conversion's result, or NaN (shown as "—") when it leaves the range of a double,
 * so a page never fails on a value it cannot display.
 *
 * @example displayConversion(() => convertRateConstant(1e300, "cm3 molecule-1 s-1", "L mol-1 s-1")) // NaN
 */
export function displayConversion(convert: () => number): number {
  try {
    return convert();
  } catch (e) {
    if (e instanceof UnitError && e.code === "out_of_range") return Number.NaN;
    throw e;
  }
}

/** Rate constant in the canonical unit of `order` (s⁻¹, cm³ molecule⁻¹ s⁻¹, cm⁶ molecule⁻² s⁻¹). */
export function toCanonicalRateConstant(value: number, unit: string, order: ReactionOrder): number {
  return convertRateConstant(value, unit, getCanonicalRateConstantUnit(order), order);
}

/** Rate constant from the canonical unit of `order` into `unit`. */
export function fromCanonicalRateConstant(value: number, unit: string, order: ReactionOrder): number {
  return convertRateConstant(value, getCanonicalRateConstantUnit(order), unit, order);
}

/**
 * Convert an energy per mole (or per molecule for eV, or E/R for K).
 *
 * @example convertEnergy(1, "kcal/mol", "kJ mol-1") // 4.184
 */
export function convertEnergy(value: number, from: string, to: string): number {
  assertFinite(value, "energy");
  const f = parseEnergyUnit(from);
  const t = parseEnergyUnit(to);
  if (f === t) return value;
  return inRange((value * f.factor) / t.factor, value, f.label, t.label, "energy");
}

/** Energy in J mol⁻¹. */
export function toJoulesPerMole(value: number, unit: string): number {
  return convertEnergy(value, unit, "J mol-1");
}

/**
 * Temperature in K; throws a {@link UnitError} below absolute zero.
 *
 * @example toKelvin(25, "°C") // 298.15
 */
export function toKelvin(value: number, unit: string): number {
  assertFinite(value, "temperature");
  const u = parseTemperatureUnit(unit);
  const kelvin = value * u.factor + (u.offset ?? 0);
  if (kelvin < 0) {
    throw new UnitError("below_absolute_zero", `${value} ${u.label} is below absolute zero (${kelvin.toFixed(2)} K).`);
  }
  return kelvin;
}

/** Convert a temperature between K and °C; throws below absolute zero. */
export function convertTemperature(value: number, from: string, to: string): number {
  const kelvin = toKelvin(value, from);
  const t = parseTemperatureUnit(to);
  return (kelvin - (t.offset ?? 0)) / t.factor;
}

/** Pressure in Pa; throws a {@link UnitError} for a negative pressure. */
export function toPascal(value: number, unit: string): number {
  assertFinite(value, "pressure");
  const u = parsePressureUnit(unit);
  if (value < 0) throw new UnitError("negative_pressure", `A pressure cannot be negative (got ${value} ${u.label}).`);
  return inRange(value * u.factor, value, u.label, "Pa", "pressure");
}

/** Convert a pressure between Pa, kPa, bar, mbar, atm and Torr. */
export function convertPressure(value: number, from: string, to: string): number {
  const pa = toPascal(value, from);
  const t = parsePressureUnit(to);
  return t.factor === 1 ? pa : inRange(pa / t.factor, value, parsePressureUnit(from).label, t.label, "pressure");
}

/**
 * σ(ln k) from an absolute standard uncertainty of k in the same unit: σ_k/k
 * (first-order propagation, GUM JCGM 100:2008 §5.1.2).
 */
export function sigmaLnKFromAbsolute(k: number, sigmaK: number): number {
  if (!(k > 0) || !Number.isFinite(k)) throw new UnitError("invalid_uncertainty", `k must be positive and finite (got ${k}).`);
  if (!(sigmaK > 0) || !Number.isFinite(sigmaK)) {
    throw new UnitError("invalid_uncertainty", `The uncertainty of k must be positive and finite (got ${sigmaK}).`);
  }
  return sigmaK / k;
}

/** σ(ln k) from a relative standard uncertainty in percent: percent/100. */
export function sigmaLnKFromRelative(percent: number): number {
  if (!(percent > 0) || !Number.isFinite(percent)) {
    throw new UnitError("invalid_uncertainty", `A relative uncertainty must be a positive percentage (got ${percent}).`);
  }
  return percent / 100;
}

/**
 * σ(ln k) from an uncertainty factor f (k/f … k·f) that covers `coverage` standard deviations:
 * ln(f)/coverage, so 1σ → ln f and 2σ (≈ 95 %) → ln f / 2.
 *
 * @example sigmaLnKFromFactor(1.1, 1) // 0.0953…
 */
export function sigmaLnKFromFactor(f: number, coverage: number = 1): number {
  if (!(f > 1) || !Number.isFinite(f)) {
    throw new UnitError("invalid_uncertainty", `An uncertainty factor must be a finite number greater than 1 (got ${f}).`);
  }
  if (!(coverage > 0) || !Number.isFinite(coverage)) {
    throw new UnitError("invalid_uncertainty", `The coverage (number of standard deviations) must be positive (got ${coverage}).`);
  }
  return Math.log(f) / coverage;
}
