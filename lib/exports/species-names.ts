/**
 * The names species carry in a mechanism file. Modellers name species by formula (OH, CH4, HO2),
 * not by the words a depositor chose ("hydroxyl"), so by default a species is named by its formula
 * from the species record: the Hill formula the InChI main layer gives (carbon first, then hydrogen,
 * then the other elements alphabetically; without carbon, alphabetical), except the few small
 * inorganic species whose usual formula differs from Hill order (HO → OH, H3N → NH3, ClH → HCl…;
 * common practice), with the charge written after it (OH-, H3O+). `deposited` names them by the
 * version's own words instead (spaces made "_", as an equation cannot hold them). A species whose
 * name marks an excited state (O(1D)) keeps that name under either naming: its formula would name
 * the ground state, which mechanisms write as "O" (lib/chem/excited-state.ts).
 *
 * Two different species (InChIKeys) never share a name in one file: isomers with one formula (or
 * two species a depositor gave one word) each get "-" and the first letters of their InChIKey's
 * skeleton block, as many as it takes to tell them apart (C3H7-KDYF, C3H7-XXXX). Pure.
 */
import { marksExcitedState } from "@/lib/chem/excited-state";
import { oneLineText } from "@/lib/text/clean";

export type SpeciesNaming = "formula" | "deposited";

export const SPECIES_NAMINGS = ["formula", "deposited"] as const satisfies readonly SpeciesNaming[];

/** A species as the exports know it. */
export interface NamedSpecies {
  inchiKey: string;
  /** Hill formula of the neutral skeleton, as the species record stores it ("HO", "CH4"). */
  formula: string;
  charge: number;
  /** The name the depositor gave it in this version (or the species' display name for a consensus). */
  depositedName: string;
}

/**
 * Hill formulas of small inorganic hydrides whose usual written formula puts the elements in
 * another order (common practice in kinetics and in mechanism files; the list is from memory).
 * Only formulas with one structure are listed: a formula shared by isomers (HNO2: HONO or HNO2)
 * keeps its Hill form, so no mapping can name the wrong one.
 */
const USUAL_FORMULAS: Record<string, string> = {
  HO: "OH",
  HS: "SH",
  H2N: "NH2",
  H3N: "NH3",
  H4N: "NH4",
  HN: "NH",
  H3P: "PH3",
  BrH: "HBr",
  ClH: "HCl",
  FH: "HF",
};

/** The formula a modeller writes for a species: the usual formula or the Hill one, then its charge (+, 2+, -, 2-). */
export function formulaName(formula: string, charge: number): string {
  const base = USUAL_FORMULAS[formula] ?? formula;
  if (!charge) return base;
  const sign = charge > 0 ? "+" : "-";
  return `${base}${Math.abs(charge) === 1 ? "" : Math.abs(charge)}${sign}`;
}

/** A depositor's word as an equation can hold it: one line, no spaces. */
const depositedToken = (name: string) => oneLineText(name).trim().replace(/\s+/g, "_") || "species";

/**
 * Each species' name in the file, by InChIKey: the formula (or the depositor's word), made distinct
 * between different species with an InChIKey suffix. The same InChIKey always gets the same name.
 */
export function mechanismSpeciesNames(species: readonly NamedSpecies[], naming: SpeciesNaming = "formula"): Map<string, string> {
  const unique = [...new Map(species.map((s) => [s.inchiKey, s])).values()];
  const base = new Map(
    unique.map((s) => [
      s.inchiKey,
      naming === "formula" && !marksExcitedState(s.depositedName) ? formulaName(s.formula, s.charge) : depositedToken(s.depositedName),
    ]),
  );
  const byName = new Map<string, NamedSpecies[]>();
  for (const s of unique) byName.set(base.get(s.inchiKey)!, [...(byName.get(base.get(s.inchiKey)!) ?? []), s]);
  const names = new Map<string, string>();
  for (const [name, group] of byName) {
    if (group.length === 1) {
      names.set(group[0].inchiKey, name);
      continue;
    }
    // Isomers: the shortest prefix of the skeleton block (14 letters) that tells each from the others.
    const skeleton = (s: NamedSpecies) => s.inchiKey.replace(/-.*/, "");
    let length = 4;
    while (length < 14 && new Set(group.map((s) => skeleton(s).slice(0, length))).size < group.length) length++;
    const suffix = (s: NamedSpecies) => (length < 14 ? skeleton(s).slice(0, length) : s.inchiKey);
    for (const s of group) names.set(s.inchiKey, `${name}-${suffix(s)}`);
  }
  // A suffixed name could meet another species' plain name (a depositor wrote "C3H7-KDYF"): never merge, add the whole key.
  const seen = new Map<string, string>();
  for (const s of unique) {
    const name = names.get(s.inchiKey)!;
    if (seen.has(name) && seen.get(name) !== s.inchiKey) names.set(s.inchiKey, `${name}-${s.inchiKey}`);
    seen.set(names.get(s.inchiKey)!, s.inchiKey);
  }
  return names;
}
