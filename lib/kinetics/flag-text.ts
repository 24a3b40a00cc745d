/**
 * The words of each analysis flag, written from its quantities in the units a reader chose. The
 * engine writes `message` with this function in the default units (kJ mol⁻¹, K), so the stored
 * message and what a page shows in other units cannot say different things.
 */
import { formatRange, formatSignificant, MINUS } from "../format";
import { parseEnergyUnit, parseTemperatureUnit, type LinearUnit } from "./units";
import type { Extrapolation, Flag, FlagCode, FlagQuantity } from "./types";
import { K298_INTERVAL_MAX_WIDTHS } from "./extrapolation";

/** Units a reader chose; ids or aliases as accepted by units.ts. */
export interface FlagUnits {
  /** Energy unit, e.g. "kJ mol-1", "kcal mol-1", "K" (E/R); default kJ mol⁻¹. */
  energy?: string;
  /** Temperature unit, "K" or "degC"; default K. */
  temperature?: string;
}

/** Quantities of one flag by name (SI units), as built by the engine. */
export type FlagQuantities = Record<string, FlagQuantity>;

/** A flag as the engine builds it before its message is written. */
export type FlagDraft = Omit<Flag, "message"> & { quantities: FlagQuantities };

/**
 * The message of a flag in the reader's units. A flag stored without quantities (older engines)
 * keeps its stored message, with "p = < 0.0001" written as "p < 0.0001".
 *
 * @example formatFlagMessage(flag, { energy: "kcal mol-1" }) // "… Ea(T) = Ea + nRT = 3.53 kcal mol⁻¹ at 300 K …"
 */
export function formatFlagMessage(flag: Pick<Flag, "code" | "message" | "points" | "quantities">, units: FlagUnits = {}): string {
  const q = flag.quantities;
  if (!q) return flag.message.replace(/p = < /g, "p < ");
  try {
    return TEMPLATES[flag.code](new Writer(q, units), flag.points ?? []);
  } catch {
    // A unit this module does not know, or quantities that do not fit their template (a record
    // from elsewhere): the stored words, which are always complete.
    return flag.message;
  }
}

// Parsed units by spelling: every analysis writes its messages, and parsing normalises text.
const energyUnits = new Map<string, LinearUnit>();
const temperatureUnits = new Map<string, LinearUnit>();

function cachedUnit(cache: Map<string, LinearUnit>, text: string, parse: (text: string) => LinearUnit): LinearUnit {
  let unit = cache.get(text);
  if (!unit) {
    unit = parse(text);
    if (cache.size < 64) cache.set(text, unit);
  }
  return unit;
}

class Writer {
  private readonly energyFactor: number;
  private readonly energyLabel: string;
  private readonly tFactor: number;
  private readonly tOffset: number;
  private readonly tLabel: string;

  constructor(
    private readonly q: FlagQuantities,
    units: FlagUnits,
  ) {
    const e = cachedUnit(energyUnits, units.energy ?? "kJ mol-1", parseEnergyUnit);
    this.energyFactor = e.factor;
    this.energyLabel = e.label;
    const t = cachedUnit(temperatureUnits, units.temperature ?? "K", parseTemperatureUnit);
    this.tFactor = t.factor;
    this.tOffset = t.offset ?? 0;
    this.tLabel = t.label;
  }

  has(name: string): boolean {
    return this.q[name] !== undefined;
  }

  /** The raw value (SI) of a quantity. */
  value(name: string): number {
    const v = this.q[name]?.value;
    if (typeof v !== "number" || !Number.isFinite(v)) throw new Error(`flag quantity ${name} is missing`);
    return v;
  }

  /** A quantity written with its unit, if it has one. */
  get(name: string): string {
    const v = this.value(name);
    switch (this.q[name].kind) {
      case "energy":
        return `${formatNumber(v / this.energyFactor)} ${this.energyLabel}`;
      case "temperature":
        return `${this.temperatureNumber(v)} ${this.tLabel}`;
      case "count":
        return String(Math.round(v));
      case "percent":
        return `${Math.round(v)} %`;
      case "probability":
        return formatNumber(v);
      default:
        // Statistics and ratios: three significant digits are all a reader can use.
        return formatNumber(v, 3);
    }
  }

  /** A temperature number without its unit (for ranges "a–b K"). */
  temperatureNumber(kelvin: number): string {
    return formatNumber((kelvin - this.tOffset) / this.tFactor).replace("-", MINUS);
  }

  private inUnit(kelvin: number): number {
    return (kelvin - this.tOffset) / this.tFactor;
  }

  /** "300–310 K", "−23.2 to 126.9 °C" from two temperature quantities (both ends written alike). */
  range(from: string, to: string): string {
    return formatRange(this.inUnit(this.value(from)), this.inUnit(this.value(to)), this.tLabel);
  }

  /** "between 220 and 400 K", or "at 220 K" when both ends are one temperature. */
  span(from: string, to: string): string {
    const a = this.value(from);
    const b = this.value(to);
    return a === b ? `at ${this.get(from)}` : `between ${this.temperatureNumber(a)} and ${this.temperatureNumber(b)} ${this.tLabel}`;
  }

  /** "p = 0.012" or "p < 0.0001". */
  p(name: string): string {
    return formatP(this.value(name));
  }
}

type Template = (w: Writer, points: number[]) => string;

const TEMPLATES: Record<FlagCode, Template> = {
  modified_fit_undetermined: (w) =>
    w.has("sine")
      ? `The modified Arrhenius expression cannot be determined from these data: over ${w.range("Tmin", "Tmax")}, ln T and 1/T are proportional to within ${formatSignificant(w.value("sine"), 2)}, so n and Ea cannot be told apart (the curvature test is skipped).`
      : w.has("points")
        ? `The modified Arrhenius expression cannot be determined from these data: its three coefficients pass exactly through the ${w.get("points")} points over ${w.range("Tmin", "Tmax")}, whatever their scatter, so n would be the scatter itself and has no standard error. At least 4 points at 3 or more temperatures are needed.`
        : `The modified Arrhenius expression cannot be determined from these data: over ${w.range("Tmin", "Tmax")} the temperature exponent comes out as n = ${w.get("n")} with a standard error of ${w.get("seN")}, above ${w.get("seNLimit")}, so the data do not fix n (the curvature test is skipped).`,

  uncertainties_ignored: (w) => `Only ${w.get("stated")} of ${w.get("n")} points state an uncertainty, so all fits are unweighted.`,

  too_few_points: (w) => {
    const skipped: string[] = [];
    if (w.has("outlierMinPoints"))
      skipped.push(`too few points to test for outliers (the test needs at least ${w.get("outlierMinPoints")}; there are ${w.get("n")})`);
    if (w.has("diagnosticsMinPoints"))
      skipped.push(`the influence and curvature checks need at least ${w.get("diagnosticsMinPoints")} points (there are ${w.get("n")})`);
    if (w.has("modifiedMinTemperatures"))
      skipped.push(
        `the modified Arrhenius fit needs at least ${w.get("modifiedMinTemperatures")} different temperatures (there are ${w.get("distinctT")})`,
      );
    return `Some checks were skipped: ${skipped.join("; ")}.`;
  },

  outlier: (w, points) =>
    `${listPoints(points)} ${points.length === 1 ? "lies" : "lie"} off the ${modelName(w)} fit: externally studentized residual beyond ±${w.value("bound").toFixed(2)} (Bonferroni-corrected Student t, α = ${w.get("alpha")}, ${w.get("dof")} dof).`,

  influential_point: (w, points) => {
    const one = points.length === 1;
    return `${listPoints(points)} ${one ? "weighs" : "weigh"} heavily on the ${modelName(w)} parameters and ${one ? "lies" : "lie"} off the line of the other points: Cook's distance ${one ? "" : "up to "}${w.get("largest")} is above ${w.get("bound")}, the median of F(${w.get("dfNum")}, ${w.get("dfDenom")}) (without ${one ? "this point" : "such a point"} the parameters would move beyond their 50 % confidence region), and the externally studentized residual is beyond ±${w.value("residualBound").toFixed(2)} (two-sided 95 % Student t, ${w.get("dof")} dof).`;
  },

  curvature: (w) => {
    const trend = w.value("eaHigh") >= w.value("eaLow") ? "rises" : "falls";
    const test = w.has("exact")
      ? "exactly, within the arithmetic: the modified Arrhenius expression reproduces every ln k to its rounding, so no F-test is needed (p below any printable bound)"
      : `F(${w.get("dfNum")}, ${w.get("dfDenom")}) = ${w.get("F")}, ${w.p("p")}`;
    return `The Arrhenius plot is curved (${test}): the apparent activation energy ${trend} with temperature, Ea(T) = Ea + nRT = ${w.get("eaLow")} at ${w.get("tLow")} and ${w.get("eaHigh")} at ${w.get("tHigh")}. The modified Arrhenius expression describes these data better.`;
  },

  narrow_range: (w) => {
    const why: string[] = [];
    if (w.has("ratio"))
      why.push(
        `the temperatures span only ${w.range("tMin", "tMax")} (Tmax/Tmin = ${w.value("ratio").toFixed(3)} in kelvin, below ${w.get("ratioLimit")})`,
      );
    if (w.has("relativeSE")) why.push(`the standard error of Ea is ${w.get("relativeSE")} of its value (${w.get("seEa")})`);
    return `The activation energy is poorly constrained: ${why.join(", and ")}. Extrapolation outside the measured range is unreliable.`;
  },

  negative_activation_energy: (w) =>
    `The fitted activation energy is negative (${w.get("Ea")}${w.has("upper") ? `, 95 % interval ${w.get("lower")} to ${w.get("upper")}` : ""}): k decreases as temperature rises. This is common for barrierless and association reactions; check that it is not a sign error.`,

  excess_scatter: (w) =>
    `The points scatter more than their stated uncertainties allow: χ²/dof = ${w.get("chi2Reduced")} on ${w.get("dof")} dof (${w.p("p")}), so the residuals are typically ${w.get("scaleFactor")} times the stated uncertainties. The uncertainties may be underestimated, or the Arrhenius form may not fit.`,

  reported_fit_disagrees: (w) => {
    const factor = w.value("factor");
    const bandWords = w.has("confidence")
      ? `outside the ${w.get("confidence")} confidence band of the refit`
      : `more than ${w.get("tolerance")} away from the refit (the refit has no spare degrees of freedom)`;
    const times = factor >= 1 ? factor : 1 / factor;
    const overlap = w.has("from")
      ? ` Compared only over ${w.range("from", "to")}, where the stated range of the expression (${statedRange(w)}) overlaps the data.`
      : "";
    return `The reported expression lies ${bandWords} ${w.span("outsideFrom", "outsideTo")}; the largest difference is a factor of ${formatSignificant(times, 3)} (${factor >= 1 ? "higher" : "lower"}) at ${w.get("at")}.${overlap}`;
  },

  reported_range_outside_data: (w) =>
    `The stated range of the reported expression (${statedRange(w)}) does not overlap the measured temperatures (${w.range("dataMin", "dataMax")}), so the expression cannot be compared with the data. This usually means the range was entered in the wrong unit (for example °C, or 1000/T, instead of K).`,
};

/**
 * An extrapolation in words, e.g. "extrapolated: 702 K below the lowest measured temperature,
 * 4.7 times the width of the measured range in 1/T".
 */
export function describeExtrapolation(x: Extrapolation): string {
  const end = x.side === "below" ? "lowest" : "highest";
  const far =
    x.inverseTWidths > K298_INTERVAL_MAX_WIDTHS
      ? `; no confidence interval is given beyond ${K298_INTERVAL_MAX_WIDTHS} width, as it would hold only if the expression held that far out`
      : "";
  return `extrapolated: ${formatNumber(x.kelvin, 3)} K ${x.side} the ${end} measured temperature, ${formatNumber(x.inverseTWidths, 2)} times the width of the measured range in 1/T${far}`;
}

/**
 * How a weighted fit's standard errors were made, in one sentence, from its scale factor
 * √(χ²/dof): the stated uncertainties are a floor, enlarged by the factor when the points scatter
 * more than they allow and never reduced (conventions.ts); null without a scale factor (dof = 0).
 *
 * @example describeWeightedErrors(1.83) // "The points scatter more than their stated uncertainties allow (√(χ²/dof) = 1.83); the standard errors are enlarged by that factor."
 */
export function describeWeightedErrors(scaleFactor: number | null): string | null {
  if (scaleFactor === null || !Number.isFinite(scaleFactor)) return null;
  // Three significant digits, as the √(χ²/dof) row beside it; a factor just above 1 keeps its digits.
  const s = scaleFactor > 1 && scaleFactor < 1.1 ? scaleFactor.toPrecision(3) : formatNumber(scaleFactor, 3);
  return scaleFactor > 1
    ? `The points scatter more than their stated uncertainties allow (√(χ²/dof) = ${s}); the standard errors are enlarged by that factor.`
    : `The points scatter less than their stated uncertainties allow (√(χ²/dof) = ${s}); the standard errors still use the uncertainties as stated.`;
}

/** The fit a point was judged on, from its number of coefficients (Arrhenius when not stated: older records). */
function modelName(w: Writer): string {
  return w.has("coefficients") && w.value("coefficients") === 3 ? "modified Arrhenius" : "Arrhenius";
}

/** The validity range the authors state: both ends, or the one they gave. */
function statedRange(w: Writer): string {
  if (w.has("reportedMin") && w.has("reportedMax")) return w.range("reportedMin", "reportedMax");
  return w.has("reportedMin") ? `from ${w.get("reportedMin")}` : `up to ${w.get("reportedMax")}`;
}

/** "Point 6" or "Points 1, 2 and 9" (numbered from 1). */
function listPoints(idx: number[]): string {
  const names = idx.map((i) => `${i + 1}`);
  if (names.length === 0) return "Some points";
  return names.length === 1 ? `Point ${names[0]}` : `Points ${names.slice(0, -1).join(", ")} and ${names[names.length - 1]}`;
}

/**
 * `digits` significant digits (default 4) without trailing zeros, exponent form outside
 * 0.01 … 100 000: what String(Number(x.toPrecision(digits))) gives, built from the rounded
 * integer, which is several times faster (every analysis writes its messages).
 *
 * @example formatNumber(14757.67) // "14760"; formatNumber(0.012345, 3) // "0.0123"
 */
export function formatNumber(x: number, digits = 4): string {
  const a = Math.abs(x);
  if (a === 0) return "0";
  if (a >= 1e5 || a < 1e-2) return x.toExponential(digits - 2);
  // x ≈ m·10^(−shift) with m an integer of `digits` digits (or 10^digits after rounding up).
  const shift = digits - 1 - Math.floor(Math.log10(a));
  const m = shift >= 0 ? Math.round(a * 10 ** shift) : Math.round(a / 10 ** -shift);
  let text = String(m);
  if (shift <= 0) {
    text += "0".repeat(-shift);
  } else {
    if (text.length <= shift) text = "0".repeat(shift - text.length + 1) + text;
    let end = text.length;
    while (end > text.length - shift && text.charCodeAt(end - 1) === 48) end--; // trailing "0"
    const point = text.length - shift;
    text = end > point ? `${text.slice(0, point)}.${text.slice(point, end)}` : text.slice(0, point);
  }
  return x < 0 ? `-${text}` : text;
}

/** A p-value as written in a message: "p = 0.012", or "p < 0.0001" below 0.0001. */
export function formatP(p: number): string {
  return p < 1e-4 ? "p < 0.0001" : `p = ${p.toPrecision(2)}`;
}
