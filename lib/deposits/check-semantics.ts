/**
 * Checks of a deposit document that JSON Schema cannot express: unit strings parse (and k's unit
 * fits the reaction order), temperatures lie above absolute zero and at most 100 000 K after conversion, ORCID check
 * digits, pressure ranges, and the sanity of the reported fit. Written defensively: it runs on
 * documents that may also have failed the schema, and looks only at values of the right type.
 */
import { orcidChecksumValid } from "@/lib/auth/orcid";
import type { FieldError } from "@/lib/errors";
import {
  UnitError,
  convertRateConstantBetween,
  getCanonicalRateConstantUnit,
  parseEnergyUnit,
  parsePressureUnit,
  parseRateConstantUnit,
  parseTemperatureUnit,
  toPascal,
  type LinearUnit,
  type RateConstantUnit,
  type ReactionOrder,
} from "@/lib/kinetics";
import { aboveAbsoluteZeroWords, formatValue, sentenceAt, sentenceWithPrefix } from "./messages";
import { sigmaLnKOf } from "./normalise";
import type { PointUncertainty } from "./types";

/**
 * Highest temperature accepted, K (the schema's description says so). Measured and computed rate
 * constants stop well below it (shock tubes and flames reach a few thousand kelvin); beyond it a
 * value is a typing or unit mistake, and a fit in 1/T would only see it as 1/T ≈ 0.
 */
export const MAX_TEMPERATURE_K = 100_000;

/**
 * Lowest temperature accepted, K: one nanokelvin, below the coldest gases whose rate constants are
 * measured (ultracold molecules, some hundred nanokelvin; from memory). Below it a value is a
 * typing or unit mistake, and 1/T leaves the range a fit can hold.
 */
export const MIN_TEMPERATURE_K = 1e-9;

/**
 * Smallest standard uncertainty of ln k a point may carry (a relative uncertainty of 1e-7 %): no
 * measurement or calculation of k is that precise, and the fit weighs a point by 1/σ², which
 * must stay a number.
 */
export const MIN_SIGMA_LN_K = 1e-9;

/** An absolute uncertainty above this multiple of k is a relative uncertainty over 1000 % (the schema's bound). */
export const MAX_ABSOLUTE_UNCERTAINTY_RATIO = 10;

/** |Ea| above this (J mol⁻¹) is taken as a unit mistake rather than chemistry. */
export const MAX_PLAUSIBLE_EA = 1e6;

type Report = (error: FieldError) => void;

function isRecord(v: unknown): v is Record<string, unknown> {
  return typeof v === "object" && v !== null && !Array.isArray(v);
}

function isFiniteNumber(v: unknown): v is number {
  return typeof v === "number" && Number.isFinite(v);
}

/** The check character an ORCID iD's first 15 digits call for (ISO 7064 MOD 11-2). */
function expectedOrcidCheck(id: string): string {
  for (const c of "0123456789X") if (orcidChecksumValid(id.slice(0, -1) + c)) return c;
  return "?";
}

/** Parse a unit, reporting a UnitError at `pointer`; undefined when absent or unusable. */
function parseUnitAt<U>(report: Report, pointer: string, text: unknown, parse: (t: string) => U): U | undefined {
  // A blank string is a unit nobody can read: reported like any unknown unit.
  if (typeof text !== "string") return undefined;
  try {
    return parse(text);
  } catch (e) {
    if (!(e instanceof UnitError)) throw e;
    report({ pointer, message: e.message, value: text });
    return undefined;
  }
}

/** Kelvin for a finite value in a parsed temperature unit (no range check). */
function kelvinOf(value: number, unit: LinearUnit): number {
  return value * unit.factor + (unit.offset ?? 0);
}

/**
 * Report a temperature that is not above 0 K, in the one wording of lib/deposits/messages.ts
 * (aboveAbsoluteZeroWords): the value as written, and in °C its kelvin value too — a minus sign, or
 * K typed as °C, are the mistakes people actually make.
 */
function checkTemperature(report: Report, pointer: string, value: unknown, unit: LinearUnit | undefined): number | undefined {
  if (!isFiniteNumber(value) || !unit) return undefined;
  const kelvin = kelvinOf(value, unit);
  if (kelvin > MAX_TEMPERATURE_K) {
    const converted = Number.isFinite(kelvin) ? `${formatValue(Number(kelvin.toPrecision(4)))} K` : "beyond any number of kelvin";
    report({
      pointer,
      value,
      message: sentenceAt(
        pointer,
        `is out of range: ${formatValue(value)} ${unit.label} is ${converted}; a temperature must be above 0 K and at most ${MAX_TEMPERATURE_K.toLocaleString("en-GB").replace(/,/g, " ")} K`,
      ),
    });
    return undefined;
  }
  if (kelvin > 0 && kelvin < MIN_TEMPERATURE_K) {
    report({
      pointer,
      value,
      message: sentenceAt(
        pointer,
        `is out of range: ${formatValue(value)} ${unit.label}${kelvin === value ? "" : ` is ${formatValue(Number(kelvin.toPrecision(4)))} K`}; a temperature must be at least ${MIN_TEMPERATURE_K} K (one nanokelvin); check the value and its unit`,
      ),
    });
    return undefined;
  }
  if (kelvin > 0) return kelvin;
  report({ pointer, value, message: sentenceAt(pointer, aboveAbsoluteZeroWords(String(value), unit, kelvin)) });
  return undefined;
}

/** Run every semantic check on `doc`, calling `report` for each problem found. */
export function checkDepositSemantics(doc: unknown, report: Report): void {
  if (!isRecord(doc)) return;
  const reaction = isRecord(doc.reaction) ? doc.reaction : {};
  const order = [1, 2, 3].includes(reaction.order as number) ? (reaction.order as ReactionOrder) : undefined;
  const units = isRecord(doc.units) ? doc.units : {};
  const points = Array.isArray(doc.points) ? doc.points : [];
  const conditions = isRecord(doc.conditions) ? doc.conditions : {};

  // Units. k is checked against the order only when the order itself is valid.
  const unitT = parseUnitAt(report, "/units/T", units.T, parseTemperatureUnit);
  const unitK = parseUnitAt(report, "/units/k", units.k, (t) => parseRateConstantUnit(t, order));
  const unitP = parseUnitAt(report, "/units/pressure", units.pressure, parsePressureUnit);

  const pressureGiven = isRecord(conditions.pressure) || points.some((p) => isRecord(p) && p.pressure !== undefined);
  if (pressureGiven && units.pressure === undefined) {
    report({
      pointer: "/units/pressure",
      message: "Pressure unit is required because the document gives pressures (under conditions or on points).",
    });
  }
  if (unitP && isRecord(conditions.pressure)) {
    const { min, max } = conditions.pressure;
    if (isFiniteNumber(min) && isFiniteNumber(max) && min > max) {
      report({
        pointer: "/conditions/pressure/max",
        value: max,
        message: `Highest pressure (${max}) must not be below the lowest pressure (${min}).`,
      });
    }
  }

  // Points: temperatures above absolute zero (k > 0 is in the schema), k representable once converted.
  const canonicalK = unitK && order ? parseRateConstantUnit(getCanonicalRateConstantUnit(order), order) : undefined;
  for (let i = 0; i < points.length; i++) {
    const p = points[i];
    if (!isRecord(p)) continue;
    checkTemperature(report, `/points/${i}/T`, p.T, unitT);
    checkAbsoluteUncertainty(report, `/points/${i}/uncertainty/value`, p);
    checkUsableUncertainty(report, `/points/${i}/uncertainty/value`, p);
    if (unitK && canonicalK) checkRateConstantRange(report, `/points/${i}/k`, p.k, unitK, canonicalK);
    if (unitP) checkPressureRange(report, `/points/${i}/pressure`, p.pressure, unitP);
  }
  if (unitP && isRecord(conditions.pressure)) {
    for (const key of ["value", "min", "max"]) checkPressureRange(report, `/conditions/pressure/${key}`, conditions.pressure[key], unitP);
  }

  // Creators: ORCID check digits (the form is in the schema).
  if (Array.isArray(doc.creators)) {
    doc.creators.forEach((c, i) => {
      if (!isRecord(c) || typeof c.orcid !== "string" || !/^\d{4}-\d{4}-\d{4}-\d{3}[\dX]$/.test(c.orcid)) return;
      if (!orcidChecksumValid(c.orcid)) {
        report({
          pointer: `/creators/${i}/orcid`,
          value: c.orcid,
          message: sentenceAt(
            `/creators/${i}/orcid`,
            `${c.orcid} has a wrong check digit (the first 15 digits call for ${expectedOrcidCheck(c.orcid)}); check it for a typing mistake`,
          ),
        });
      }
    });
  }

  // Phase-specific fields given for another phase are probably a slip.
  if (reaction.solvent !== undefined && reaction.phase !== undefined && reaction.phase !== "liquid") {
    report({
      pointer: "/reaction/solvent",
      message: `A solvent is only for liquid-phase reactions (phase is ${formatValue(reaction.phase)}).`,
    });
  }
  if (reaction.surface !== undefined && reaction.phase !== undefined && reaction.phase !== "surface") {
    report({
      pointer: "/reaction/surface",
      value: reaction.surface as unknown,
      message: `A surface is only for surface reactions (phase is ${formatValue(reaction.phase)}).`,
    });
  }

  // Source: a DOI given twice must agree.
  if (isRecord(doc.source) && isRecord(doc.source.reference)) {
    const { doi } = doc.source;
    const refDoi = doc.source.reference.DOI;
    if (typeof doi === "string" && typeof refDoi === "string" && doi.toLowerCase() !== refDoi.toLowerCase()) {
      report({
        pointer: "/source/reference/DOI",
        value: refDoi,
        message: `The reference's DOI (${refDoi}) differs from the publication DOI (${doi}); give one DOI or make them agree.`,
      });
    }
  }

  if (isRecord(doc.reportedFit)) {
    checkReportedFit(report, doc.reportedFit, unitT);
    if (unitK && canonicalK) checkRateConstantRange(report, "/reportedFit/A", doc.reportedFit.A, unitK, canonicalK);
  }
}

/** Report an absolute uncertainty larger than the schema allows a relative one (1000 % of k). */
function checkAbsoluteUncertainty(report: Report, pointer: string, point: Record<string, unknown>): void {
  const u = point.uncertainty;
  if (!isRecord(u) || u.kind !== "absolute" || !isFiniteNumber(u.value) || !isFiniteNumber(point.k) || point.k <= 0) return;
  if (u.value / point.k <= MAX_ABSOLUTE_UNCERTAINTY_RATIO) return;
  report({
    pointer,
    value: u.value,
    message: sentenceWithPrefix(
      pointer,
      `an absolute uncertainty of ${formatValue(u.value)} is more than ${MAX_ABSOLUTE_UNCERTAINTY_RATIO} times k (${formatValue(point.k)}), i.e. over 1000 %; check the value and its unit`,
    ),
  });
}

/**
 * Report an uncertainty so small that, as the standard uncertainty of ln k the fit weighs points
 * by, it is below MIN_SIGMA_LN_K (e.g. 5e-324, or a factor of 1 + 1e-17): said at the value given.
 */
function checkUsableUncertainty(report: Report, pointer: string, point: Record<string, unknown>): void {
  const u = point.uncertainty;
  if (!isRecord(u) || !isFiniteNumber(u.value) || !isFiniteNumber(point.k) || point.k <= 0) return;
  if (!["absolute", "relative", "factor"].includes(u.kind as string)) return;
  if (u.kind === "factor" ? u.value <= 1 : u.value <= 0) return; // the schema's own bounds say so
  const sigma = sigmaLnKOf({ k: point.k, uncertainty: u as unknown as PointUncertainty });
  if (sigma !== undefined && Number.isFinite(sigma) && sigma >= MIN_SIGMA_LN_K) return;
  report({
    pointer,
    value: u.value,
    message: sentenceWithPrefix(
      pointer,
      `an uncertainty of ${formatValue(u.value)} (${String(u.kind)}) is too small: as a standard uncertainty of ln k it is ${formatValue(Number((sigma ?? 0).toPrecision(2)))}, below ${MIN_SIGMA_LN_K} (no k is known that precisely); check the value and its kind, or leave it out`,
    ),
  });
}

/** Report a pressure whose value in Pa would overflow or underflow a double (negative ones are the schema's). */
function checkPressureRange(report: Report, pointer: string, value: unknown, unit: LinearUnit): void {
  if (!isFiniteNumber(value) || value <= 0) return;
  try {
    toPascal(value, unit.id);
  } catch (e) {
    if (!(e instanceof UnitError)) throw e;
    report({ pointer, message: e.message, value });
  }
}

/** Report a rate constant whose value in canonical units would overflow or underflow a double. */
function checkRateConstantRange(report: Report, pointer: string, value: unknown, from: RateConstantUnit, to: RateConstantUnit): void {
  if (!isFiniteNumber(value) || value <= 0) return;
  try {
    convertRateConstantBetween(value, from, to);
  } catch (e) {
    if (!(e instanceof UnitError)) throw e;
    report({ pointer, message: e.message, value });
  }
}

function checkReportedFit(report: Report, fit: Record<string, unknown>, unitT: LinearUnit | undefined): void {
  const eaUnit = parseUnitAt(report, "/reportedFit/EaUnit", fit.EaUnit, parseEnergyUnit);
  if (fit.model === "arrhenius" && isFiniteNumber(fit.n) && fit.n !== 0) {
    report({
      pointer: "/reportedFit/n",
      value: fit.n,
      message: "An Arrhenius expression has no temperature exponent: choose modified_arrhenius, or leave n out.",
    });
  }
  if (eaUnit && isFiniteNumber(fit.Ea) && Math.abs(fit.Ea * eaUnit.factor) > MAX_PLAUSIBLE_EA) {
    report({
      pointer: "/reportedFit/Ea",
      value: fit.Ea,
      message: `Activation energy ${fit.Ea} ${eaUnit.label} is ${(Math.abs(fit.Ea * eaUnit.factor) / 1000).toFixed(0)} kJ mol⁻¹ in size, more than any chemical barrier; check the value and its unit.`,
    });
  }
  checkTemperature(report, "/reportedFit/T0", fit.T0, unitT);
  // The range has its own unit (papers give it in K even when the data are in °C); units.T when left out.
  const rangeUnit =
    fit.rangeUnit === undefined ? unitT : parseUnitAt(report, "/reportedFit/rangeUnit", fit.rangeUnit, parseTemperatureUnit);
  const tMin = checkTemperature(report, "/reportedFit/Tmin", fit.Tmin, rangeUnit);
  const tMax = checkTemperature(report, "/reportedFit/Tmax", fit.Tmax, rangeUnit);
  if (tMin !== undefined && tMax !== undefined && tMin >= tMax) {
    report({
      pointer: "/reportedFit/Tmax",
      value: fit.Tmax,
      message: `Highest valid temperature (${String(fit.Tmax)}) must be above the lowest (${String(fit.Tmin)}).`,
    });
  }
}
