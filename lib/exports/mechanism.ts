/**
 * Mechanism-ready parameters: a fit (a version's re-fits, or a reaction's consensus) as A, n and Ea
 * in the units a modeller chooses, with T0, the valid temperature range, the reaction in species
 * names, the identifier and the caution — as an aligned plain-text table, and as a YAML block in
 * the layout Cantera reads for an elementary reaction (`equation`, `rate-constant: {A, b, Ea}` under
 * a `units` block). Pure.
 *
 * Our expression is k = A (T/T0)^n exp(−Ea/RT); Cantera's is k = A′ T^b exp(−Ea/RT) with no T0, so
 * A′ = A / T0^n and b = n (for the two-parameter Arrhenius fit n = 0 and A′ = A).
 * Cantera's units block (its YAML documentation, "General Structure → Units"): `length` (cm, dm, m),
 * `quantity` (mol or molec), `time` (s) and `activation-energy` (J/mol, kJ/mol, cal/mol, kcal/mol or K);
 * A′ is read in (length³/quantity)^(order−1)/time.
 */
import { Document } from "yaml";
import { oneLineText } from "@/lib/text/clean";
import type { ReactionOrder } from "@/lib/kinetics/types";
import {
  convertEnergy,
  convertRateConstant,
  getCanonicalRateConstantUnit,
  parseEnergyUnit,
  parseRateConstantUnit,
} from "@/lib/kinetics/units";
import { MECHANISM_ENERGY_UNITS } from "./mechanism-units";
import { mechanismSpeciesNames, type NamedSpecies, type SpeciesNaming } from "./species-names";

export { DEFAULT_MECHANISM_ENERGY, MECHANISM_ENERGY_UNITS, mechanismRateUnits } from "./mechanism-units";

export type MechanismModel = "arrhenius" | "modified_arrhenius";

/** One fit in canonical units: ln A (of k in the canonical unit of the order), n, Ea in J mol⁻¹, T0 in K. */
export interface MechanismFit {
  model: MechanismModel;
  lnA: number;
  n: number;
  /** J mol⁻¹. */
  Ea: number;
  /** K; the reference temperature of (T/T0)^n (298.15 K unless the deposit states another). */
  T0: number;
}

/** What the parameters are of: one version's re-fits, or a reaction's consensus. */
export interface MechanismSubject {
  kind: "version" | "consensus";
  title: string;
  /** The reaction in display names ("OH + CH4 → H2O + CH3"). */
  equation: string;
  /** `name` is the display name (the table's equation); the YAML names species by formula or by `depositedName`. */
  participants: (NamedSpecies & { side: "reactant" | "product"; name: string; coefficient: number })[];
  order: ReactionOrder;
  /** The version identifier (a version), null for a consensus. */
  identifier: string | null;
  /** A consensus: the version identifiers of the datasets that shaped it. */
  sources: string[];
  landingPage: string;
  citation: string | null;
  /** The temperatures the fit rests on, K. */
  range: { Tmin: number; Tmax: number };
  fits: MechanismFit[];
  preferred: MechanismModel;
  engineVersion: string | null;
  retraction: string | null;
  caution: string;
}

/** Cantera's length and quantity for a rate-constant unit: (length³/quantity)^(order−1) s⁻¹. */
export function canteraUnitsOf(kUnit: string, order: ReactionOrder): { length: "cm" | "dm" | "m"; quantity: "mol" | "molec" } {
  const u = parseRateConstantUnit(kUnit, order);
  if (order === 1) return { length: "cm", quantity: "mol" };
  // exp10 is the power of ten of the volume per (order − 1) factor of cm³: 0 → cm, 3 → dm (L), 6 → m.
  const perVolume = u.exp10 / (order - 1);
  const length = perVolume === 0 ? "cm" : perVolume === 3 ? "dm" : "m";
  return { length, quantity: u.expAvogadro === 0 ? "molec" : "mol" };
}

/** The chosen units, each checked; an unknown or wrong-order unit throws lib/kinetics' UnitError. */
export interface MechanismUnits {
  kUnit: string;
  energyUnit: string;
}

/** One fit in the chosen units. */
export interface ConvertedFit {
  model: MechanismModel;
  preferred: boolean;
  /** A of k = A (T/T0)^n exp(−Ea/RT), in kUnit. */
  A: number;
  n: number;
  /** In energyUnit (Ea/R when the unit is K). */
  Ea: number;
  T0: number;
  /** Cantera's A′ = A / T0^n, in kUnit · K^−n. */
  canteraA: number;
}

/**
 * Every fit in the chosen units, the preferred first. A and A′ are taken through their logarithms
 * (ln A + ln of the unit factor − n ln T0), so no intermediate leaves the range of a double.
 */
export function convertMechanismFits(subject: MechanismSubject, units: MechanismUnits): ConvertedFit[] {
  const canonical = getCanonicalRateConstantUnit(subject.order);
  const lnFactor = Math.log(convertRateConstant(1, canonical, units.kUnit, subject.order));
  const fits = [...subject.fits].sort((a, b) => Number(b.model === subject.preferred) - Number(a.model === subject.preferred));
  return fits.map((f) => ({
    model: f.model,
    preferred: f.model === subject.preferred,
    A: Math.exp(f.lnA + lnFactor),
    n: f.n,
    Ea: convertEnergy(f.Ea, "J mol-1", units.energyUnit),
    T0: f.T0,
    canteraA: Math.exp(f.lnA + lnFactor - f.n * Math.log(f.T0)),
  }));
}

const MODEL_WORDS: Record<MechanismModel, string> = { arrhenius: "Arrhenius", modified_arrhenius: "modified Arrhenius" };

/** Seven significant digits, trailing zeros dropped, an exponent ("2.45e-12") outside 0.001 … 10⁶ (a plain-text file a person reads and copies). */
function num(v: number): string {
  if (!Number.isFinite(v)) return "—";
  if (v === 0 || (Math.abs(v) >= 1e-3 && Math.abs(v) < 1e6)) return String(Number(v.toPrecision(7)));
  const [mantissa, exponent] = v.toExponential(6).split("e");
  return `${mantissa.replace(/\.?0+$/, "")}e${exponent.replace(/^\+/, "")}`;
}

/** The energy column's head: "Ea (kcal mol-1)", or "Ea/R (K)". */
const energyHead = (unitId: string) => (parseEnergyUnit(unitId).id === "K" ? "Ea/R (K)" : `Ea (${unitId})`);

/** What the subject is, in lines shared by the table's header and the YAML's description. */
function aboutLines(subject: MechanismSubject): [string, string][] {
  const lines: [string, string][] = [
    ["reaction", subject.equation],
    [subject.kind === "version" ? "dataset" : "consensus of", subject.title],
  ];
  if (subject.identifier) lines.push(["version identifier", `doi:${subject.identifier}`]);
  if (subject.sources.length) lines.push(["datasets", subject.sources.map((s) => `doi:${s}`).join(", ")]);
  if (subject.retraction) lines.push(["retracted", subject.retraction]);
  lines.push(
    [
      "valid range",
      `${num(subject.range.Tmin)} K to ${num(subject.range.Tmax)} K (the temperatures of the data; outside them an extrapolation)`,
    ],
    ["page", subject.landingPage],
  );
  if (subject.citation) lines.push(["cite as", subject.citation]);
  if (subject.engineVersion) lines.push(["fitted by", `Arrhenia kinetics engine ${subject.engineVersion}`]);
  lines.push(["caution", subject.caution]);
  // One line each, whatever the deposit holds: a YAML 1.1 reader breaks lines at U+0085/U+2028/U+2029 too.
  return lines.map(([label, text]) => [label, oneLineText(text)]);
}

/** Pads each column to its widest cell (two spaces between columns). */
function aligned(rows: string[][]): string[] {
  const widths = rows[0].map((_, c) => Math.max(...rows.map((r) => r[c].length)));
  return rows.map((r) =>
    r
      .map((cell, c) => (c === r.length - 1 ? cell : cell.padEnd(widths[c])))
      .join("  ")
      .trimEnd(),
  );
}

/**
 * The plain-text table: the subject, the expression with T0, one row per fit (the preferred one
 * marked), and Cantera's A′ = A/T0^n beside A.
 */
export function buildMechanismTable(subject: MechanismSubject, units: MechanismUnits): string {
  const fits = convertMechanismFits(subject, units);
  const T0 = fits.find((f) => f.model === "modified_arrhenius")?.T0 ?? fits[0]?.T0 ?? 298.15;
  const head = aboutLines(subject).map(([label, text]) => `${label}: ${text.replace(/[\r\n]+/g, " ")}`);
  const table = aligned([
    ["fit", "preferred", `A (${units.kUnit})`, "n", energyHead(units.energyUnit), "T0 (K)", `A/T0^n (${units.kUnit} K^-n)`],
    ...fits.map((f) => [MODEL_WORDS[f.model], f.preferred ? "yes" : "", num(f.A), num(f.n), num(f.Ea), num(f.T0), num(f.canteraA)]),
  ]);
  return (
    [
      `Mechanism parameters (${subject.kind === "version" ? "one dataset version" : "the reaction's consensus"})`,
      ...head,
      "",
      `k(T) = A (T/T0)^n exp(-Ea/(R T)), T0 = ${num(T0)} K, R = 8.31446261815324 J mol-1 K-1 (CODATA 2018); Arrhenius: n = 0.`,
      "Without T0 (as Cantera writes it): k(T) = A' T^n exp(-Ea/(R T)) with A' = A/T0^n.",
      "",
      ...table,
    ].join("\n") + "\n"
  );
}

/** The reaction as Cantera's `equation` reads it: the file's species names (lib/exports/species-names.ts), " => " (irreversible). */
export function canteraEquation(participants: MechanismSubject["participants"], names: Map<string, string>): string {
  const side = (s: "reactant" | "product") =>
    participants
      .filter((p) => p.side === s)
      .map((p) => `${p.coefficient !== 1 ? `${p.coefficient} ` : ""}${names.get(p.inchiKey)}`)
      .join(" + ");
  return `${side("reactant")} => ${side("product") || "products"}`;
}

/**
 * The comment block that ties each name in the file to its InChIKey and the depositor's name, one
 * species a line, aligned: "  OH      HGYJMFUXWPBSGN-UHFFFAOYSA-N  hydroxyl".
 */
function speciesNameComment(participants: MechanismSubject["participants"], names: Map<string, string>, naming: SpeciesNaming): string[] {
  const rows = [...new Map(participants.map((p) => [p.inchiKey, p])).values()].map((p) => [
    names.get(p.inchiKey)!,
    p.inchiKey,
    oneLineText(p.depositedName),
  ]);
  const width = (c: number) => Math.max(...rows.map((r) => r[c].length), c === 0 ? "name".length : "InChIKey".length);
  return [
    naming === "formula"
      ? " Species are named by formula (names=deposited names them by the depositor's words); isomers get part of their InChIKey."
      : " Species are named by the depositor's words (names=formula names them by formula).",
    ` ${"name".padEnd(width(0))}  ${"InChIKey".padEnd(width(1))}  name given by the depositor`,
    ...rows.map(([name, key, deposited]) => ` ${name.padEnd(width(0))}  ${key.padEnd(width(1))}  ${deposited}`),
  ];
}

/**
 * The YAML block (built with the `yaml` package): a `description`, the `units` Cantera reads the
 * numbers in, `species-identities` (each name with its InChIKey and the depositor's name), and `reactions` with the chosen fit (the preferred one by default) as an elementary
 * reaction: `rate-constant: {A: A/T0^n, b: n, Ea}`. The subject and caution are comments above and
 * the `description` text; a `note` on the reaction names the fit and its T0.
 */
export function buildCanteraYaml(
  subject: MechanismSubject,
  units: MechanismUnits,
  model: MechanismModel | "preferred" = "preferred",
  naming: SpeciesNaming = "formula",
): string {
  const fits = convertMechanismFits(subject, units);
  const wanted = model === "preferred" ? subject.preferred : model;
  const fit = fits.find((f) => f.model === wanted);
  if (!fit) throw new RangeError(`no ${MODEL_WORDS[wanted]} fit`);
  const { length, quantity } = canteraUnitsOf(units.kUnit, subject.order);
  const energy = MECHANISM_ENERGY_UNITS.find((u) => u.id === parseEnergyUnit(units.energyUnit).id)?.cantera;
  if (!energy) throw new RangeError(`no Cantera unit for ${units.energyUnit}`);
  const about = aboutLines(subject);
  const names = mechanismSpeciesNames(subject.participants, naming);
  const doc = new Document({
    description: about.map(([label, text]) => `${label}: ${text}`).join("\n"),
    units: { length, quantity, time: "s", "activation-energy": energy },
    // The same map as the comment block, as data a script reads; Cantera leaves top-level sections no
    // phase names alone (its YAML format, from memory: only sections a phase refers to are read).
    "species-identities": [...new Map(subject.participants.map((p) => [p.inchiKey, p])).values()].map((p) => ({
      name: names.get(p.inchiKey)!,
      InChIKey: p.inchiKey,
      "deposited-name": oneLineText(p.depositedName),
    })),
    reactions: [
      {
        equation: canteraEquation(subject.participants, names),
        "rate-constant": { A: fit.canteraA, b: fit.n, Ea: fit.Ea },
        note: `${MODEL_WORDS[fit.model]} fit${fit.preferred ? " (preferred)" : ""}: A = ${num(fit.A)} ${units.kUnit} at T0 = ${num(fit.T0)} K, so A/T0^n = ${num(fit.canteraA)}; valid ${num(subject.range.Tmin)}–${num(subject.range.Tmax)} K`,
      },
    ],
  });
  doc.commentBefore = [
    ` Arrhenia mechanism parameters: ${oneLineText(subject.equation)}`,
    ...(subject.identifier ? [` doi:${oneLineText(subject.identifier)}`] : []),
    ` ${oneLineText(subject.caution)}`,
    "",
    ...speciesNameComment(subject.participants, names, naming),
  ].join("\n");
  // Numbers as JavaScript writes them (shortest text that reads back to the same double), never folded lines.
  return doc.toString({ lineWidth: 0 });
}

/** The file name of a download: "<code>-parameters.txt|yaml". */
export function mechanismFileName(base: string, format: "table" | "cantera-yaml"): string {
  return `${base.replace(/[^A-Za-z0-9.-]+/g, "-")}-parameters.${format === "table" ? "txt" : "yaml"}`;
}
