/**
 * Cantera's YAML input format (an open, documented format of the open-source Cantera library):
 * top-level `units`, a `species` list with `composition`, and reaction lists (`reactions`, or any
 * other top-level list of entries with an `equation`). Entries without `type` or with
 * `type: elementary` carry `rate-constant: {A, b, Ea}` and are checked; every other type
 * (three-body, falloff, chemically-activated, pressure-dependent-Arrhenius, Chebyshev, …) is listed
 * as not checked yet. Values may carry their own units ("1.0e13 cm^3/mol/s", "10 kcal/mol").
 */
import { Alias, isAlias, isMap, isScalar, isSeq, LineCounter, parseDocument, visit, type Document, type Node, type YAMLMap } from "yaml";
import { MAX_MECHANISM_REACTIONS } from "./limits";

/** The most YAML aliases a mechanism file may use. */
export const MAX_YAML_ALIASES = 100;
import { readEquation, sideOrder } from "./equation";
import {
  canonicalActivationEnergy,
  canonicalPreExponential,
  YAML_DEFAULT_UNITS,
  YAML_LENGTH,
  YAML_QUANTITY,
  YAML_TIME,
  yamlActivationEnergyUnit,
  type MechanismUnits,
} from "./units";
import type { MechanismProblem, MechanismRateType, MechanismReaction, MechanismSpecies, ParsedMechanism } from "./types";
import { RATE_TYPE_WORDS } from "./read-plain-text";

const RATE_TYPES: Record<string, MechanismRateType> = {
  elementary: "elementary",
  "three-body": "three-body",
  falloff: "falloff",
  "chemically-activated": "chemically-activated",
  "pressure-dependent-Arrhenius": "pressure-table",
  Chebyshev: "chebyshev",
};

type UnitKey = "length" | "quantity" | "time" | "activation-energy" | "energy";

export function readCanteraYamlMechanism(text: string): ParsedMechanism {
  const lineCounter = new LineCounter();
  const problems: MechanismProblem[] = [];
  const doc = parseDocument(text, { lineCounter, prettyErrors: false, uniqueKeys: true });
  const place = (node: Node | null | undefined) => {
    const offset = node?.range?.[0] ?? 0;
    const p = lineCounter.linePos(offset);
    return { line: p.line, column: p.col };
  };
  const report = (node: Node | null | undefined, message: string) => {
    const p = place(node);
    problems.push({ ...p, message: `Line ${p.line}, column ${p.column}: ${message}` });
  };
  for (const e of doc.errors) {
    const p = lineCounter.linePos(e.pos[0]);
    problems.push({ line: p.line, column: p.col, message: `Line ${p.line}, column ${p.col}: ${e.message.split("\n")[0]}` });
  }
  const species: MechanismSpecies[] = [];
  const reactions: MechanismReaction[] = [];
  const root = doc.contents;
  // Aliases (*name) repeat a node without its text: thousands of them stall the reader (each resolves by walking the
  // document) or multiply a list into millions of reactions. Mechanism files have no use for many; beyond
  // MAX_YAML_ALIASES nothing is read.
  let aliases = 0;
  let firstAlias: Node | null = null;
  visit(doc, {
    Alias(_key, node) {
      aliases += 1;
      firstAlias ??= node as unknown as Node;
      return aliases > MAX_YAML_ALIASES ? visit.BREAK : undefined;
    },
  });
  if (aliases > MAX_YAML_ALIASES) {
    report(
      firstAlias,
      `more than ${MAX_YAML_ALIASES} YAML aliases (*name) in the file; a mechanism is read only with at most ${MAX_YAML_ALIASES} (write the entries out in full).`,
    );
    return finish();
  }
  if (!isMap(root)) {
    if (problems.length === 0) report(root, "the file is not a YAML mapping with `units`, `species` and `reactions`.");
    return finish();
  }
  const fileUnits = readUnits(root.get("units", true) as Node | undefined, baseUnits(), report, doc);

  const speciesNode = resolve(root.get("species", true) as Node | undefined, doc);
  if (isSeq(speciesNode)) {
    for (const item of speciesNode.items) {
      const entry = resolve(item as Node, doc);
      if (!isMap(entry)) continue;
      const name = scalarText(entry.get("name", true) as Node | undefined, doc);
      if (!name) {
        report(entry, "a species without a `name`.");
        continue;
      }
      species.push({ name, composition: readComposition(entry, doc, report), line: place(entry).line });
    }
  }

  for (const pair of root.items) {
    const key = isScalar(pair.key) ? String(pair.key.value) : "";
    const list = resolve(pair.value as Node | null, doc);
    if (!isSeq(list) || key === "species" || key === "phases") continue;
    const entries = list.items.map((i) => resolve(i as Node, doc));
    if (!entries.some((e) => isMap(e) && e.has("equation"))) continue;
    for (const entry of entries) {
      // Beyond the limit the check is refused anyway (read-mechanism.ts): no need to read the rest.
      if (reactions.length > MAX_MECHANISM_REACTIONS) break;
      if (!isMap(entry)) {
        report(entry, `an entry of \`${key}\` that is not a reaction mapping.`);
        continue;
      }
      readReaction(entry, fileUnits);
    }
  }
  return finish();

  function readReaction(entry: YAMLMap, fileUnits: MechanismUnits) {
    const equationNode = entry.get("equation", true) as Node | undefined;
    const equation = scalarText(equationNode, doc);
    if (!equation) {
      report(entry, "a reaction without an `equation`.");
      return;
    }
    const read = readEquation(equation);
    if (!read.ok) {
      report(equationNode, read.message);
      return;
    }
    const typeNode = entry.get("type", true) as Node | undefined;
    const typeText = scalarText(typeNode, doc) ?? "elementary";
    let rateType: MechanismRateType = RATE_TYPES[typeText] ?? "other";
    // Without `type`, Cantera infers it from the equation: "+ M" three-body, "(+M)" falloff.
    if (!typeNode) rateType = read.value.falloffCollider ? "falloff" : read.value.thirdBody ? "three-body" : "elementary";
    const units = readUnits(entry.get("units", true) as Node | undefined, fileUnits, report, doc);
    const order = sideOrder(read.value.reactants) + (read.value.thirdBody ? 1 : 0);
    const reaction: MechanismReaction = {
      index: reactions.length + 1,
      line: place(entry).line,
      equation,
      reactants: read.value.reactants,
      products: read.value.products,
      reversible: read.value.reversible,
      rateType,
      order,
      rate: null,
      duplicate: scalarValue(entry.get("duplicate", true) as Node | undefined, doc) === true,
      notChecked: null,
    };
    if (rateType !== "elementary") {
      reaction.notChecked = `${rateType === "other" ? `type "${typeText}"` : RATE_TYPE_WORDS[rateType]}: not checked yet`;
    } else if (entry.has("orders")) {
      reaction.notChecked = "explicit reaction orders (`orders`): not checked yet";
    } else {
      const rateNode = resolve(entry.get("rate-constant", true) as Node | undefined, doc);
      if (!isMap(rateNode)) {
        report(rateNode ?? entry, "an elementary reaction needs `rate-constant: {A, b, Ea}`.");
        reaction.notChecked = "A, b or Ea could not be read";
      } else {
        const A = readQuantity(rateNode, "A", doc, report, (unit) => rateUnitFactor(unit, order));
        const b = readQuantity(rateNode, "b", doc, report, () => null);
        const Ea = readQuantity(rateNode, "Ea", doc, report, (unit) => yamlActivationEnergyUnit(unit));
        if (A === null || b === null || Ea === null) reaction.notChecked = "A, b or Ea could not be read";
        else {
          reaction.rate = {
            A: A.factor === null ? canonicalPreExponential(A.value, order, units) : A.value * A.factor,
            b: b.value,
            Ea: Ea.factor === null ? canonicalActivationEnergy(Ea.value, units) : Ea.value * Ea.factor,
          };
        }
      }
    }
    reactions.push(reaction);
  }

  function finish(): ParsedMechanism {
    return {
      format: "cantera-yaml",
      species,
      reactions,
      problems: problems.sort((a, b) => a.line - b.line || a.column - b.column),
      units: isMap(root) ? readUnits(root.get("units", true) as Node | undefined, baseUnits(), () => {}, doc).words : baseUnits().words,
    };
  }
}

function resolve(node: Node | null | undefined, doc: Document): Node | null | undefined {
  return isAlias(node) ? ((node as Alias).resolve(doc) as Node | undefined) : node;
}

function scalarValue(node: Node | null | undefined, doc: Document): unknown {
  const n = resolve(node, doc);
  return isScalar(n) ? n.value : undefined;
}

function scalarText(node: Node | null | undefined, doc: Document): string | null {
  const v = scalarValue(node, doc);
  return typeof v === "string" || typeof v === "number" ? String(v).trim() : null;
}

function baseUnits(): MechanismUnits {
  return unitsFrom({ ...YAML_DEFAULT_UNITS, energy: "" });
}

function unitsFrom(u: Record<UnitKey, string>, activationExplicit = false): MechanismUnits {
  const energy = yamlActivationEnergyUnit(u["activation-energy"]) as number;
  return {
    yamlEnergy: u.energy,
    activationExplicit,
    lengthCm: YAML_LENGTH[u.length],
    quantityMolecules: YAML_QUANTITY[u.quantity],
    timeS: YAML_TIME[u.time],
    energyJPerMol: energy,
    words: { rateConstant: `${u.length}, ${u.quantity}, ${u.time}`, energy: u["activation-energy"] },
  };
}

type Report = (node: Node | null | undefined, message: string) => void;

const ALLOWED: Record<Exclude<UnitKey, "activation-energy" | "energy">, Record<string, number>> = {
  length: YAML_LENGTH,
  quantity: YAML_QUANTITY,
  time: YAML_TIME,
};

/** A `units` mapping over the units in force; unknown units are reported with the allowed ones and leave the unit unchanged. */
function readUnits(node: Node | null | undefined, outer: MechanismUnits, report: Report, doc: Document): MechanismUnits {
  const map = resolve(node, doc);
  if (!map) return outer;
  if (!isMap(map)) {
    report(map, "`units` must be a mapping such as {length: cm, quantity: mol, activation-energy: cal/mol}.");
    return outer;
  }
  const current: Record<UnitKey, string> = {
    length: Object.keys(YAML_LENGTH).find((k) => YAML_LENGTH[k] === outer.lengthCm) ?? "m",
    quantity: Object.keys(YAML_QUANTITY).find((k) => YAML_QUANTITY[k] === outer.quantityMolecules) ?? "kmol",
    time: Object.keys(YAML_TIME).find((k) => YAML_TIME[k] === outer.timeS) ?? "s",
    "activation-energy": outer.words.energy,
    energy: outer.yamlEnergy ?? "",
  };
  let energyGiven: string | null = null;
  let activationGiven = false;
  const explicitBefore = outer.activationExplicit ?? false;
  for (const pair of map.items) {
    const key = isScalar(pair.key) ? String(pair.key.value) : "";
    const valueNode = pair.value as Node | null;
    const value = scalarText(valueNode, doc) ?? "";
    if (key in ALLOWED) {
      const table = ALLOWED[key as keyof typeof ALLOWED];
      if (value in table) current[key as UnitKey] = value;
      else report(valueNode, `unknown ${key} unit "${value}"; allowed: ${Object.keys(table).join(", ")}.`);
    } else if (key === "activation-energy") {
      if (yamlActivationEnergyUnit(value) !== null) {
        current["activation-energy"] = value.replace(/\s+/g, "");
        activationGiven = true;
      } else
        report(
          valueNode,
          `unknown activation-energy unit "${value}"; allowed: K, eV, or an energy (J, kJ, cal, kcal) per quantity (mol, kmol, molecule), e.g. kcal/mol.`,
        );
    } else if (key === "energy") {
      if (value in { J: 1, kJ: 1, cal: 1, kcal: 1, eV: 1 }) energyGiven = value;
      else report(valueNode, `unknown energy unit "${value}"; allowed: J, kJ, cal, kcal, eV.`);
    } else if (key === "pressure" || key === "mass") {
      // Not needed for elementary rates.
    } else
      report(
        pair.key as Node,
        `unknown key "${key}" in \`units\`; allowed: length, quantity, time, energy, activation-energy, pressure, mass.`,
      );
  }
  if (energyGiven) current.energy = energyGiven;
  // Cantera: without an explicit activation-energy (here or in an enclosing block), Ea is in energy per quantity.
  const explicit = activationGiven || explicitBefore;
  if (!explicit && (energyGiven || map.has("quantity"))) {
    const energy = current.energy || "J";
    current["activation-energy"] = energy === "eV" ? "eV" : `${energy}/${current.quantity}`;
  }
  return unitsFrom(current, explicit);
}

function readComposition(entry: YAMLMap, doc: Document, report: Report): Record<string, number> | null {
  const node = resolve(entry.get("composition", true) as Node | undefined, doc);
  if (!node) return null;
  if (!isMap(node)) {
    report(node, "`composition` must be a mapping of elements to counts, e.g. {H: 2, O: 1}.");
    return null;
  }
  const out: Record<string, number> = {};
  for (const pair of node.items) {
    const element = isScalar(pair.key) ? String(pair.key.value) : "";
    const count = scalarValue(pair.value as Node, doc);
    if (typeof count !== "number" || !(count >= 0)) {
      report(pair.value as Node, `the count of ${element} in \`composition\` must be a number.`);
      return null;
    }
    if (count > 0) out[element] = count;
  }
  return out;
}

/** A number, or a number followed by its unit; factor = the unit's conversion to canonical, null when the number has no unit. */
function readQuantity(
  map: YAMLMap,
  key: string,
  doc: Document,
  report: Report,
  unitFactor: (unit: string) => number | null,
): { value: number; factor: number | null } | null {
  const node = resolve(map.get(key, true) as Node | undefined, doc);
  const raw = scalarValue(node, doc);
  if (typeof raw === "number" && Number.isFinite(raw)) return { value: raw, factor: null };
  if (typeof raw === "string") {
    const m = /^\s*([+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?)\s+(\S.*)$/.exec(raw);
    if (m) {
      const factor = unitFactor(m[2].trim());
      if (factor !== null) return { value: Number(m[1]), factor };
      report(node, `\`${key}: ${raw}\`: the unit "${m[2].trim()}" is not one this check reads for ${key}.`);
      return null;
    }
  }
  report(
    node ?? map,
    raw === undefined ? `\`${key}\` is missing from \`rate-constant\`.` : `\`${key}\` must be a number (got ${JSON.stringify(raw)}).`,
  );
  return null;
}

/** A rate-constant unit such as "cm^3/mol/s" → factor to cm³ molecule⁻¹ s⁻¹ (for the order), or null when unknown or of another order. */
export function rateUnitFactor(unit: string, order: number): number | null {
  const parts = unit.replace(/\s+/g, "").split("/");
  let length = 0;
  let quantity = 0;
  let time = 0;
  let factor = 1;
  for (let i = 0; i < parts.length; i++) {
    for (const term of parts[i].split("*")) {
      if (term === "" || term === "1") continue;
      const m = /^([A-Za-z]+)(?:\^?(-?\d+))?$/.exec(term);
      if (!m) return null;
      const exp = (m[2] ? Number(m[2]) : 1) * (i === 0 ? 1 : -1);
      if (m[1] in YAML_LENGTH) {
        length += exp;
        factor *= YAML_LENGTH[m[1]] ** exp;
      } else if (m[1] in YAML_QUANTITY) {
        quantity += exp;
        factor *= YAML_QUANTITY[m[1]] ** exp;
      } else if (m[1] in YAML_TIME) {
        time += exp;
        factor *= YAML_TIME[m[1]] ** exp;
      } else return null;
    }
  }
  if (length !== 3 * (order - 1) || quantity !== -(order - 1) || time !== -1) return null;
  return factor;
}
