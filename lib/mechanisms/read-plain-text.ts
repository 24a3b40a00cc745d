/**
 * The classic plain-text mechanism layout: ELEMENTS / SPECIES / THERMO / REACTIONS blocks, each
 * closed by END; `!` starts a comment; a line ending in `&` continues on the next. A reaction line
 * is an equation followed by A, b and Ea; lines after it without "=" add to it (third-body
 * efficiencies, LOW, TROE, SRI, HIGH, PLOG, CHEB, REV, DUPLICATE, FORD…). Unit keywords on the
 * REACTIONS line set the energy and quantity units (default cal/mole and moles, cm, s).
 */
import { readEquation, sideOrder } from "./equation";
import {
  canonicalActivationEnergy,
  canonicalPreExponential,
  plainTextUnits,
  PLAIN_ENERGY_KEYWORDS,
  PLAIN_QUANTITY_KEYWORDS,
} from "./units";
import type { MechanismProblem, MechanismReaction, MechanismSpecies, ParsedMechanism } from "./types";

/** Auxiliary keywords and what each one makes of the reaction. */
const AUXILIARY: Record<string, "falloff-low" | "high" | "falloff-shape" | "plog" | "cheb" | "rev" | "duplicate" | "orders" | "other"> = {
  LOW: "falloff-low",
  HIGH: "high",
  TROE: "falloff-shape",
  SRI: "falloff-shape",
  PLOG: "plog",
  CHEB: "cheb",
  TCHEB: "cheb",
  PCHEB: "cheb",
  REV: "rev",
  DUPLICATE: "duplicate",
  DUP: "duplicate",
  FORD: "orders",
  RORD: "orders",
  UNITS: "other",
  LT: "other",
  RLT: "other",
  HV: "other",
  TDEP: "other",
  EXCI: "other",
  JAN: "other",
  FIT1: "other",
  MOME: "other",
  XSMI: "other",
  USRPROG: "other",
};
const AUXILIARY_WORDS = Object.keys(AUXILIARY).join(", ");

const SECTION_KEYWORDS: Record<string, "elements" | "species" | "thermo" | "reactions" | "transport"> = {
  ELEMENTS: "elements",
  ELEM: "elements",
  SPECIES: "species",
  SPEC: "species",
  THERMO: "thermo",
  REACTIONS: "reactions",
  REAC: "reactions",
  TRANSPORT: "transport",
};

interface Draft extends MechanismReaction {
  aux: Set<string>;
  efficiencies: boolean;
  falloffCollider: string | null;
  thirdBody: boolean;
  readable: boolean;
}

/** A number as mechanism files write it (Fortran's D exponent too), or null. */
export function readMechanismNumber(text: string): number | null {
  if (!/^[+-]?(\d+\.?\d*|\.\d+)([EeDd][+-]?\d+)?$/.test(text)) return null;
  const value = Number(text.replace(/[Dd]/, "e"));
  return Number.isFinite(value) ? value : null;
}

interface LogicalLine {
  line: number;
  text: string;
}

/** Lines with comments removed and `&` continuations joined (a joined line keeps its first line number). */
function logicalLines(text: string): LogicalLine[] {
  const out: LogicalLine[] = [];
  const raw = text.split("\n");
  let pending: LogicalLine | null = null;
  for (let i = 0; i < raw.length; i++) {
    let body = raw[i].replace(/\r$/, "");
    const bang = body.indexOf("!");
    if (bang >= 0) body = body.slice(0, bang);
    const continues = /&\s*$/.test(body);
    if (continues) body = body.replace(/&\s*$/, " ");
    if (pending) pending.text += " " + body.trimStart();
    else pending = { line: i + 1, text: body };
    if (!continues) {
      out.push(pending);
      pending = null;
    }
  }
  if (pending) out.push(pending);
  return out;
}

export function readPlainTextMechanism(text: string): ParsedMechanism {
  const problems: MechanismProblem[] = [];
  const species: MechanismSpecies[] = [];
  const speciesNames = new Set<string>();
  const elements: string[] = [];
  const reactions: Draft[] = [];
  let units = plainTextUnits();
  let section: "none" | "elements" | "species" | "thermo" | "reactions" | "transport" = "none";
  let sawReactions = false;
  let unitsUnknown = false;

  for (const { line, text: body } of logicalLines(text)) {
    const trimmed = body.trim();
    if (!trimmed) continue;
    const words = trimmed.split(/\s+/);
    const first = words[0].toUpperCase();
    const column = (offset: number) => body.search(/\S/) + 1 + offset;

    if (section !== "reactions" || !trimmed.includes("=")) {
      const keyword = SECTION_KEYWORDS[first];
      if (keyword) {
        section = keyword;
        let rest = words.slice(1);
        const endAt = rest.findIndex((w) => w.toUpperCase() === "END");
        const closes = endAt >= 0;
        if (closes) rest = rest.slice(0, endAt);
        if (keyword === "species") rest.forEach((name) => addSpecies(name, line));
        if (keyword === "elements") rest.forEach(addElement);
        if (keyword === "reactions") {
          sawReactions = true;
          const read = readUnitKeywords(rest, line, body, problems);
          units = read.units;
          unitsUnknown ||= !read.ok;
        }
        if (closes) section = "none";
        continue;
      }
    }
    if (first === "END") {
      section = "none";
      continue;
    }
    switch (section) {
      case "elements":
        for (const word of words) {
          if (word.toUpperCase() === "END") {
            section = "none";
            break;
          }
          addElement(word);
        }
        continue;
      case "thermo":
      case "transport":
        continue;
      case "species":
        for (const name of words) {
          if (name.toUpperCase() === "END") {
            section = "none";
            break;
          }
          addSpecies(name, line);
        }
        continue;
      case "none":
        problems.push({
          line,
          column: column(0),
          message: `Line ${line} lies outside every block (ELEMENTS, SPECIES, THERMO, REACTIONS): "${clip(trimmed)}".`,
        });
        continue;
      case "reactions":
        if (trimmed.includes("=")) readReactionLine(body, line);
        else readAuxiliaryLine(body, line);
    }
  }
  if (!sawReactions) problems.push({ line: 1, column: 1, message: "The file has no REACTIONS block." });

  // "CL", "Cl" → "Cl"; an isotope's mass ("D/2.014/") is not part of its symbol.
  function addElement(word: string) {
    const symbol = word.replace(/\/.*$/, "");
    if (!/^[A-Za-z]{1,2}$/.test(symbol)) return;
    const written = symbol.length === 2 ? symbol[0].toUpperCase() + symbol[1].toLowerCase() : symbol.toUpperCase();
    if (!elements.includes(written)) elements.push(written);
  }

  function addSpecies(name: string, line: number) {
    if (speciesNames.has(name)) return;
    speciesNames.add(name);
    species.push({ name, composition: null, line });
  }

  function readReactionLine(body: string, line: number) {
    const tokens = [...body.matchAll(/\S+/g)];
    const numbers = tokens.slice(-3);
    const values = numbers.map((t) => readMechanismNumber(t[0]));
    const equationEnd = tokens.length >= 4 ? numbers[0].index : body.length;
    const equation = body.slice(0, equationEnd).trim();
    const read = readEquation(equation.replace(/\s+/g, " "));
    const index = reactions.length + 1;
    if (!read.ok) {
      problems.push({ line, column: body.search(/\S/) + 1, message: `Line ${line}: ${read.message}` });
      return;
    }
    const draft: Draft = {
      index,
      line,
      equation,
      reactants: read.value.reactants,
      products: read.value.products,
      reversible: read.value.reversible,
      rateType: "elementary",
      order: sideOrder(read.value.reactants) + (read.value.thirdBody ? 1 : 0),
      rate: null,
      duplicate: false,
      notChecked: null,
      aux: new Set(),
      efficiencies: false,
      falloffCollider: read.value.falloffCollider,
      thirdBody: read.value.thirdBody,
      readable: true,
    };
    const bad = tokens.length < 4 ? -1 : values.findIndex((v) => v === null);
    if (bad !== -1) {
      const at = bad === -1 || tokens.length < 4 ? body.length : numbers[bad].index;
      const what = tokens.length < 4 ? "A, b and Ea are missing" : `"${numbers[bad][0]}" is not a number (${["A", "b", "Ea"][bad]})`;
      problems.push({ line, column: at + 1, message: `Line ${line}, column ${at + 1}: ${what}; the reaction is listed but not checked.` });
      draft.readable = false;
    } else if (tokens.length < 4) {
      problems.push({
        line,
        column: body.length + 1,
        message: `Line ${line}: A, b and Ea are missing after the equation; the reaction is listed but not checked.`,
      });
      draft.readable = false;
    } else {
      const [A, b, Ea] = values as number[];
      draft.rate = { A: canonicalPreExponential(A, draft.order, units), b, Ea: canonicalActivationEnergy(Ea, units) };
    }
    for (const p of [...draft.reactants, ...draft.products]) {
      if (speciesNames.size > 0 && !speciesNames.has(p.name)) {
        problems.push({ line, column: body.indexOf(p.name) + 1, message: `Line ${line}: "${p.name}" is not in the SPECIES block.` });
      }
    }
    reactions.push(draft);
  }

  function readAuxiliaryLine(body: string, line: number) {
    const target = reactions[reactions.length - 1];
    if (!target) {
      problems.push({
        line,
        column: body.search(/\S/) + 1,
        message: `Line ${line}: "${clip(body.trim())}" is neither a reaction (no "=") nor follows one.`,
      });
      return;
    }
    const pattern = /\s*([^\s/]+)\s*(?:\/([^/]*)\/)?/y;
    let at = 0;
    while (at < body.length && body.slice(at).trim() !== "") {
      pattern.lastIndex = at;
      const m = pattern.exec(body);
      if (!m) {
        problems.push({ line, column: at + 1, message: `Line ${line}, column ${at + 1}: cannot read "${clip(body.slice(at).trim())}".` });
        return;
      }
      const word = m[1];
      const wordColumn = body.indexOf(word, at) + 1;
      at = pattern.lastIndex;
      const keyword = AUXILIARY[word.toUpperCase()];
      if (keyword) {
        target.aux.add(keyword);
        if (keyword === "duplicate") target.duplicate = true;
        continue;
      }
      if (m[2] !== undefined) {
        // A third-body efficiency "H2O/6.0/".
        if (readMechanismNumber(m[2].trim()) === null) {
          problems.push({
            line,
            column: wordColumn,
            message: `Line ${line}, column ${wordColumn}: the efficiency of ${word} "/${m[2]}/" is not a number.`,
          });
        } else if (!target.thirdBody && !target.falloffCollider) {
          problems.push({
            line,
            column: wordColumn,
            message: `Line ${line}, column ${wordColumn}: an efficiency for ${word}, but the reaction on line ${target.line} has no third body (+M).`,
          });
        } else if (speciesNames.size > 0 && !speciesNames.has(word)) {
          problems.push({
            line,
            column: wordColumn,
            message: `Line ${line}, column ${wordColumn}: "${word}" is neither an auxiliary keyword (${AUXILIARY_WORDS}) nor a species of the SPECIES block.`,
          });
        }
        target.efficiencies = true;
        continue;
      }
      const message =
        wordColumn === body.search(/\S/) + 1
          ? `Line ${line}: "${clip(body.trim())}" is neither a reaction (no "=") nor an auxiliary line (${AUXILIARY_WORDS}, or SPECIES/efficiency/).`
          : `Line ${line}, column ${wordColumn}: unknown keyword "${word}"; known: ${AUXILIARY_WORDS}, or a species with its efficiency as SPECIES/value/.`;
      problems.push({ line, column: wordColumn, message });
      return; // one problem per line
    }
  }

  return {
    format: "plain-text",
    species,
    reactions: reactions.map((d) => finishReaction(d, unitsUnknown)),
    problems: problems.sort((a, b) => a.line - b.line || a.column - b.column),
    ...(elements.length ? { elements } : {}),
    units: units.words,
  };
}

/** The rate type from the equation and the auxiliary keywords, and whether it can be checked. */
function finishReaction(d: Draft, unitsUnknown: boolean): MechanismReaction {
  let rateType: MechanismReaction["rateType"] = "elementary";
  if (d.aux.has("plog")) rateType = "pressure-table";
  else if (d.aux.has("cheb")) rateType = "chebyshev";
  else if (d.falloffCollider) rateType = d.aux.has("high") ? "chemically-activated" : "falloff";
  else if (d.thirdBody) rateType = "three-body";
  else if (d.aux.has("falloff-low") || d.aux.has("high") || d.aux.has("falloff-shape")) rateType = "falloff";
  else if (d.aux.has("other")) rateType = "other";
  let notChecked: string | null = null;
  if (rateType !== "elementary") notChecked = `${RATE_TYPE_WORDS[rateType]}: not checked yet`;
  else if (d.aux.has("orders")) notChecked = "explicit reaction orders (FORD/RORD): not checked yet";
  else if (!d.readable) notChecked = "A, b or Ea could not be read";
  else if (unitsUnknown) notChecked = "the REACTIONS line names a unit keyword this check does not know";
  return {
    index: d.index,
    line: d.line,
    equation: d.equation,
    reactants: d.reactants,
    products: d.products,
    reversible: d.reversible,
    rateType,
    order: d.order,
    rate: notChecked ? null : d.rate,
    duplicate: d.duplicate,
    notChecked,
  };
}

export const RATE_TYPE_WORDS: Record<MechanismReaction["rateType"], string> = {
  elementary: "elementary (modified Arrhenius)",
  "three-body": "three-body reaction",
  falloff: "falloff (pressure-dependent)",
  "chemically-activated": "chemically activated (pressure-dependent)",
  "pressure-table": "rates at several pressures (PLOG)",
  chebyshev: "Chebyshev expression",
  other: "a rate type this check does not read",
};

function readUnitKeywords(words: string[], line: number, body: string, problems: MechanismProblem[]) {
  let energy = "CAL/MOLE";
  let quantity = "MOLES";
  let ok = true;
  let energyGiven: string | null = null;
  let quantityGiven: string | null = null;
  for (const word of words) {
    const upper = word.toUpperCase();
    const col = body.indexOf(word) + 1;
    // Two energy units (or two quantities) contradict each other: which one the file means cannot be known.
    const contradicts = (kind: string, earlier: string | null) => {
      if (earlier === null || earlier === upper) return false;
      ok = false;
      problems.push({
        line,
        column: col,
        message: `Line ${line}, column ${col}: the ${kind} unit is given twice, as ${earlier} and as ${upper}; give one. No reaction is checked until it is corrected.`,
      });
      return true;
    };
    if (upper in PLAIN_ENERGY_KEYWORDS) {
      if (!contradicts("energy", energyGiven)) energy = energyGiven = upper;
    } else if (upper in PLAIN_QUANTITY_KEYWORDS) {
      if (!contradicts("quantity", quantityGiven)) quantity = quantityGiven = upper;
    } else {
      ok = false;
      problems.push({
        line,
        column: col,
        message: `Line ${line}, column ${col}: unknown unit keyword "${word}"; allowed: ${[...Object.keys(PLAIN_ENERGY_KEYWORDS), ...Object.keys(PLAIN_QUANTITY_KEYWORDS)].join(", ")}. No reaction is checked until it is corrected.`,
      });
    }
  }
  return { units: plainTextUnits(energy, quantity), ok };
}

const clip = (s: string) => (s.length > 60 ? `${s.slice(0, 57)}…` : s);
