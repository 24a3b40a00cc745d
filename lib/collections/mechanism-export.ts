/**
 * A collection's combined mechanism parameters: every member's preferred fit, as the plain-text
 * tables of lib/exports/mechanism.ts one after another, or as one Cantera YAML file whose reactions
 * each carry a comment naming their version's identifier. Pure.
 *
 * The YAML has one `units` block for every reaction (cm, mol, s and the chosen Ea unit): members of
 * different orders each get their A in (cm³/mol)^(order−1)/s, the units Cantera reads under that block
 * (its YAML documentation, "General Structure → Units"; from memory).
 */
import { Document, type YAMLMap, type YAMLSeq } from "yaml";
import { parseRateConstantUnit } from "@/lib/kinetics/units";
import type { ReactionOrder } from "@/lib/kinetics/types";
import { oneLineText } from "@/lib/text/clean";
import {
  buildMechanismTable,
  canteraEquation,
  convertMechanismFits,
  MECHANISM_ENERGY_UNITS,
  mechanismRateUnits,
  type MechanismSubject,
} from "@/lib/exports/mechanism";
import { mechanismSpeciesNames, type SpeciesNaming } from "@/lib/exports/species-names";
import { parseEnergyUnit } from "@/lib/kinetics/units";

/** What the file says of the collection itself. */
export interface CollectionExportHeader {
  title: string;
  versionNumber: number;
  identifier: string | null;
  landingPage: string;
  citation: string;
  caution: string;
  /** Members without a fit to export (named, never dropped silently). */
  skipped: { label: string; reason: string }[];
}

/** The cm–mol rate-constant unit of an order: s-1, cm3 mol-1 s-1, cm6 mol-2 s-1. */
export function cmMolUnit(order: ReactionOrder): string {
  const found = mechanismRateUnits(order).find((id) => {
    const u = parseRateConstantUnit(id, order);
    return u.exp10 === 0 && u.expAvogadro === -(order - 1);
  });
  if (!found) throw new RangeError(`no cm-mol unit of order ${order}`);
  return found;
}

function headerLines(h: CollectionExportHeader): string[] {
  return [
    `collection: ${oneLineText(h.title)} (version ${h.versionNumber})`,
    ...(h.identifier ? [`collection identifier: doi:${h.identifier}`] : []),
    `page: ${h.landingPage}`,
    `cite as: ${oneLineText(h.citation)}`,
    `caution: ${oneLineText(h.caution)}`,
    ...h.skipped.map((s) => `not included: ${oneLineText(s.label)} (${s.reason})`),
  ];
}

/** The plain-text file: the collection's header, then each member's table under a rule. */
export function buildCollectionTable(header: CollectionExportHeader, subjects: MechanismSubject[], energyUnit: string): string {
  const parts = subjects.map(
    (s, i) =>
      `${"=".repeat(72)}\nReaction ${i + 1} of ${subjects.length}\n${buildMechanismTable(s, { kUnit: cmMolUnit(s.order), energyUnit })}`,
  );
  return [
    `Mechanism parameters of a collection (${subjects.length} ${subjects.length === 1 ? "reaction" : "reactions"})`,
    ...headerLines(header),
    "",
    ...parts,
  ].join("\n");
}

/**
 * The Cantera YAML file: one units block, every species once, one elementary reaction a member (its preferred fit) —
 * except a second member of a reaction already written, which is a comment under it (one rate per reaction).
 */
export function buildCollectionCanteraYaml(
  header: CollectionExportHeader,
  subjects: MechanismSubject[],
  energyUnit: string,
  naming: SpeciesNaming = "formula",
): string {
  const energy = MECHANISM_ENERGY_UNITS.find((u) => u.id === parseEnergyUnit(energyUnit).id)?.cantera;
  if (!energy) throw new RangeError(`no Cantera unit for ${energyUnit}`);
  const participants = subjects.flatMap((s) => s.participants);
  // One naming over every member, so a species has one name in the whole file.
  const names = mechanismSpeciesNames(participants, naming);
  // A mechanism takes one rate per reaction: a second member of the same reaction (same species on each side) is not
  // a second term (that would be a DUPLICATE, summed), so it is written as a comment under the first one's entry.
  const sideKey = (s: MechanismSubject, side: "reactant" | "product") =>
    s.participants
      .filter((p) => p.side === side)
      .map((p) => `${p.coefficient}*${names.get(p.inchiKey)}`)
      .sort()
      .join("+");
  const keyOf = (s: MechanismSubject) => `${sideKey(s, "reactant")}=>${sideKey(s, "product")}|${s.order}`;
  const firstOf = new Map<string, number>();
  const alsoOf = new Map<number, number[]>();
  subjects.forEach((s, i) => {
    const first = firstOf.get(keyOf(s));
    if (first === undefined) firstOf.set(keyOf(s), i);
    else alsoOf.set(first, [...(alsoOf.get(first) ?? []), i]);
  });
  const kept = subjects.map((_, i) => i).filter((i) => firstOf.get(keyOf(subjects[i])) === i);
  const fitOf = (s: MechanismSubject) => {
    const kUnit = cmMolUnit(s.order);
    return { kUnit, fit: convertMechanismFits(s, { kUnit, energyUnit }).find((f) => f.preferred)! };
  };
  const reactions = kept.map((i) => {
    const s = subjects[i];
    const { kUnit, fit } = fitOf(s);
    return {
      equation: canteraEquation(s.participants, names),
      "rate-constant": { A: fit.canteraA, b: fit.n, Ea: fit.Ea },
      note: `${oneLineText(s.title)}; ${fit.model === "arrhenius" ? "Arrhenius" : "modified Arrhenius"} fit, A in ${kUnit} at T0 = ${fit.T0} K divided by T0^n; valid ${s.range.Tmin}–${s.range.Tmax} K`,
    };
  });
  const doc = new Document({
    description: headerLines(header).join("\n"),
    units: { length: "cm", quantity: "mol", time: "s", "activation-energy": energy },
    "species-identities": [...new Map(participants.map((p) => [p.inchiKey, p])).values()].map((p) => ({
      name: names.get(p.inchiKey)!,
      InChIKey: p.inchiKey,
      "deposited-name": oneLineText(p.depositedName),
    })),
    reactions,
  });
  const seq = doc.get("reactions") as YAMLSeq<YAMLMap>;
  const identifierText = (s: MechanismSubject) => (s.identifier ? `doi:${oneLineText(s.identifier)}` : "no identifier");
  seq.items.forEach((item, k) => {
    const i = kept[k];
    const s = subjects[i];
    const also = (alsoOf.get(i) ?? []).map((j) => {
      const other = subjects[j];
      const { fit } = fitOf(other);
      return ` also in this collection for the same reaction, not included (a mechanism takes one rate per reaction): ${identifierText(other)}${other.retraction ? " (RETRACTED)" : ""}, A: ${fit.canteraA}, b: ${fit.n}, Ea: ${fit.Ea}, valid ${other.range.Tmin}–${other.range.Tmax} K`;
    });
    item.commentBefore = [` ${identifierText(s)} — ${oneLineText(s.equation)}${s.retraction ? " — RETRACTED" : ""}`, ...also].join("\n");
  });
  doc.commentBefore = [
    ` Arrhenia collection: ${oneLineText(header.title)} (version ${header.versionNumber})`,
    ...(header.identifier ? [` doi:${oneLineText(header.identifier)}`] : []),
    ` ${oneLineText(header.caution)}`,
  ].join("\n");
  return doc.toString({ lineWidth: 0 });
}
